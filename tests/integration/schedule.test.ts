import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { seedDemo } from "@/db/seeds/demo";
import { credentialExpiry, expireRequests, runDueTasks, type Task } from "@/lib/worker/schedule";
import { testKnex, truncateAll } from "../support/db";

const sql = (d: Date) => d.toISOString().slice(0, 23).replace("T", " ");
const day = 86_400_000;

describe("scheduled tasks shared through MariaDB", () => {
  let knex: Knex;
  beforeAll(async () => {
    knex = testKnex();
  });
  beforeEach(async () => {
    await truncateAll(knex);
    await seedDemo(knex);
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  it("two workers racing for the same due task run it once", async () => {
    let runs = 0;
    const slow: Task = {
      name: "test-slow",
      everyMs: 60_000,
      run: async () => {
        runs += 1;
        await new Promise((r) => setTimeout(r, 200));
        return "done";
      },
    };
    const other = testKnex();
    try {
      const now = new Date();
      await Promise.all([
        runDueTasks({ db: knex, now, appUrl: "http://x" }, "w1", [slow]),
        runDueTasks({ db: other, now, appUrl: "http://x" }, "w2", [slow]),
      ]);
    } finally {
      await other.destroy();
    }
    expect(runs).toBe(1);
    const row = await knex("worker_schedule").where({ task: "test-slow" }).first();
    expect(row.lease_owner).toBeNull();
    expect(new Date(`${row.next_run_at}Z`).getTime()).toBeGreaterThan(Date.now() + 50_000);
    // Not due again until next_run_at.
    await runDueTasks({ db: knex, now: new Date(), appUrl: "http://x" }, "w1", [slow]);
    expect(runs).toBe(1);
  });

  it("expires open requests past their date, and only those", async () => {
    const open = await knex("requests").where({ status: "open" }).orderBy("id").select("id");
    await knex("requests")
      .where({ id: open[0]!.id })
      .update({ expires_at: sql(new Date(Date.now() - 1000)) });
    const out = await expireRequests.run({ db: knex, now: new Date(), appUrl: "http://x" });
    expect(out).toBe("1 request(s) expired");
    expect((await knex("requests").where({ id: open[0]!.id }).first("status")).status).toBe(
      "expired",
    );
    expect((await knex("requests").where({ id: open[1]!.id }).first("status")).status).toBe("open");
    expect(await expireRequests.run({ db: knex, now: new Date(), appUrl: "http://x" })).toBe(
      "0 request(s) expired",
    );
  });

  it("marks past-date credentials expired and warns 30 days ahead, once", async () => {
    const verified = await knex("credentials")
      .where({ status: "verified" })
      .orderBy("id")
      .select("id");
    const past = verified[0]!.id;
    const soon = verified[1]!.id;
    await knex("credentials")
      .where({ id: past })
      .update({ expires_on: sql(new Date(Date.now() - 2 * day)).slice(0, 10) });
    await knex("credentials")
      .where({ id: soon })
      .update({ expires_on: sql(new Date(Date.now() + 20 * day)).slice(0, 10) });
    const ctx = { db: knex, now: new Date(), appUrl: "http://app.test" };
    expect(await credentialExpiry.run(ctx)).toBe("1 credential(s) expired, 1 warning(s) queued");
    expect((await knex("credentials").where({ id: past }).first("status")).status).toBe("expired");
    const mail = await knex("email_outbox")
      .where({ template: "credential_expiring" })
      .select("to_user_id", "payload");
    expect(mail).toHaveLength(1);
    expect(
      await knex("audit_log")
        .where({ action: "credential.expired", entity_id: past })
        .count({ n: "*" }),
    ).toEqual([{ n: 1 }]);
    // A second run the same day changes nothing and sends nothing.
    expect(await credentialExpiry.run(ctx)).toBe("0 credential(s) expired, 0 warning(s) queued");
  });
});
