import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { seedDemo } from "@/db/seeds/demo";
import { reconcile } from "@/lib/data/payments";
import { systemSchema, systemSections } from "@/lib/validation/system";
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

  it("stores system descriptions that the shared schema accepts, and one draft half done", async () => {
    const rows = await knex("projects").select("system", "status");
    const parse = (v: unknown) => (typeof v === "string" ? JSON.parse(v) : v);
    for (const row of rows.filter((r) => r.status === "ready"))
      expect(systemSchema.safeParse(parse(row.system)).success).toBe(true);
    const drafts = rows.filter((r) => r.status === "draft");
    expect(drafts).toHaveLength(1);
    expect(Object.keys(parse(drafts[0]!.system) as object)).toEqual(systemSections.slice(0, 3));
  });

  it("made everything through the app's own paths: snapshots, payments, ledger, e-mails, audit", async () => {
    // Every request carries the snapshot the reviewer and the report read.
    const missing = await knex("requests").whereNull("system_snapshot").count({ n: "*" });
    expect(Number(missing[0]?.n)).toBe(0);
    // Funded jobs were paid on the payment fake's checkout page, not given made-up references.
    const funded = await knex("jobs").whereNotNull("funded_at").select("payment_intent_id");
    expect(funded.length).toBe(7);
    for (const j of funded) expect(j.payment_intent_id).toMatch(/^pi_/);
    expect(funded.some((j) => String(j.payment_intent_id).startsWith("pi_demo_"))).toBe(false);
    // The ledger: a charge per funded job, one transfer for the release and each settlement.
    const ledger: { kind: string; n: number }[] = await knex("ledger_entries")
      .groupBy("kind")
      .select("kind", knex.raw("COUNT(*) AS n"));
    const byKind = Object.fromEntries(ledger.map((r) => [r.kind, Number(r.n)]));
    expect(byKind.charge).toBe(7);
    expect(byKind.refund).toBe(2);
    // …and it agrees with the payment service's own records to the minor unit.
    const admin = await knex("users").where({ role: "admin" }).first("id");
    const report = await reconcile(knex, { id: admin.id, role: "admin" });
    expect(report.checkedJobs).toBe(7);
    expect(report.differences).toEqual([]);
    // Acceptance declined the other reviewer's quote and told them; the admin's checks e-mailed.
    const templates = (await knex("email_outbox").distinct("template")).map((r) => r.template);
    expect(templates).toEqual(
      expect.arrayContaining([
        "new_quote",
        "quote_accepted",
        "quote_declined",
        "payment_received",
        "credential_verified",
      ]),
    );
    expect(templates).not.toContain("verify_email");
    const actions = (await knex("audit_log").distinct("action")).map((r) => r.action);
    expect(actions).toEqual(
      expect.arrayContaining(["user.signed_up", "request.posted", "job.fund", "job.release"]),
    );
  });
});
