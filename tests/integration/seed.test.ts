import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { seedDemo } from "@/db/seeds/demo";
import { systemSchema } from "@/lib/validation/system";
import { testKnex, truncateAll } from "../support/db";

describe("demo seed against the real MariaDB", () => {
  let knex: Knex;
  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  const counts = async () => {
    const out: Record<string, number> = {};
    for (const t of [
      "users",
      "projects",
      "requests",
      "quotes",
      "jobs",
      "credentials",
      "ledger_entries",
    ]) {
      const [row] = await knex(t).count({ n: "*" });
      out[t] = Number(row?.n);
    }
    return out;
  };

  it("writes the scenario once, and a second run changes nothing", async () => {
    const first = await seedDemo(knex);
    expect(first.seeded).toBe(true);
    const after1 = await counts();
    const second = await seedDemo(knex);
    expect(second.seeded).toBe(false);
    expect(await counts()).toEqual(after1);
  });

  it("has a job in every state, reviewers verified, pending and expired, and only demo users", async () => {
    const states = (await knex("jobs").distinct("state")).map((r) => r.state).sort();
    expect(states).toEqual([
      "awaiting_payment",
      "cancelled",
      "delivered",
      "disputed",
      "funded",
      "in_review",
      "partially_refunded",
      "refunded",
      "released",
    ]);
    const credentialStatuses = (await knex("credentials").distinct("status"))
      .map((r) => r.status)
      .sort();
    expect(credentialStatuses).toEqual(["expired", "pending", "verified"]);
    const notDemo = await knex("users").where({ is_demo: false }).count({ n: "*" });
    expect(Number(notDemo[0]?.n)).toBe(0);
    const [openCount] = await knex("requests").where({ status: "open" }).count({ n: "*" });
    expect(Number(openCount?.n)).toBeGreaterThan(0);
  });

  it("stores system descriptions that the shared schema accepts", async () => {
    const rows = await knex("projects").select("system");
    for (const row of rows) {
      const system = typeof row.system === "string" ? JSON.parse(row.system) : row.system;
      expect(systemSchema.safeParse(system).success).toBe(true);
    }
  });
});
