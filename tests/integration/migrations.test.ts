import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { testKnex } from "../support/db";
import { parseEnv } from "@/lib/env";

// A scratch database of its own, so running every migration down does not disturb other tests.
const SCRATCH = `${parseEnv().DB_TEST_NAME}_migrations`;

describe("migrations against the real MariaDB", () => {
  let admin: Knex;
  let knex: Knex;

  beforeAll(async () => {
    admin = testKnex();
    await admin.raw("DROP DATABASE IF EXISTS ??", [SCRATCH]);
    await admin.raw("CREATE DATABASE ?? CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci", [
      SCRATCH,
    ]);
    knex = testKnex(SCRATCH);
  });

  afterAll(async () => {
    await knex?.destroy();
    await admin?.raw("DROP DATABASE IF EXISTS ??", [SCRATCH]);
    await admin?.destroy();
  });

  const tables = async () =>
    ((await knex.raw("SHOW TABLES"))[0] as Record<string, string>[])
      .map((r) => Object.values(r)[0]!)
      .filter((t) => !t.startsWith("knex_"))
      .sort();

  it("run up to the whole schema, down to nothing, and up again", async () => {
    await knex.migrate.latest();
    const up = await tables();
    for (const t of [
      "users",
      "reviewer_profiles",
      "credentials",
      "projects",
      "attachments",
      "requests",
      "quotes",
      "jobs",
      "checklist_answers",
      "reports",
      "messages",
      "ratings",
      "ledger_entries",
      "payment_events",
      "email_outbox",
      "audit_log",
      "first_fill_records",
      "disputes",
      "worker_schedule",
    ]) {
      expect(up, t).toContain(t);
    }
    await knex.migrate.rollback(undefined, true);
    expect(await tables()).toEqual([]);
    await knex.migrate.latest();
    expect(await tables()).toEqual(up);
  }, 120_000); // every migration up, down and up again: seconds on a quiet machine

  it("serves the board query from an index, not a table scan", async () => {
    const [plan] = (await knex.raw(
      "EXPLAIN SELECT id FROM requests WHERE status = 'open' AND kind = 'remote_check' AND region = 'wales' ORDER BY created_at DESC, id DESC LIMIT 20",
    )) as [{ key: string | null; type: string }[]];
    expect(plan[0]?.key).toMatch(/^requests_board/);
    expect(plan[0]?.type).not.toBe("ALL");
  });

  it("allows one live quote per reviewer per request, but any number of withdrawn ones", async () => {
    const [u] = await knex("users").insert({
      email: "h@example.test",
      password_hash: "x",
      role: "homeowner",
      display_name: "H",
    });
    const [r] = await knex("users").insert({
      email: "r@example.test",
      password_hash: "x",
      role: "reviewer",
      display_name: "R",
    });
    const [p] = await knex("projects").insert({ owner_id: u, title: "t", system: "{}" });
    const [req] = await knex("requests").insert({
      project_id: p,
      homeowner_id: u,
      kind: "remote_check",
      questions: "q",
      budget_min_minor: 1,
      budget_max_minor: 2,
      region: "wales",
      expires_at: "2030-01-01 00:00:00",
    });
    const quote = {
      request_id: req,
      reviewer_id: r,
      price_minor: 100,
      turnaround_days: 2,
      scope_md: "s",
    };
    await knex("quotes").insert({ ...quote, status: "withdrawn" });
    await knex("quotes").insert({ ...quote, status: "withdrawn" });
    await knex("quotes").insert({ ...quote, status: "live" });
    await expect(knex("quotes").insert({ ...quote, status: "live" })).rejects.toThrow(
      /Duplicate entry/,
    );
  });
});
