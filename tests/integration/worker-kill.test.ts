/**
 * Kill the worker (SIGKILL, no clean-up) in the middle of a batch of e-mails and start it again:
 * every e-mail arrives, none twice except at most the ones in flight at the kill, which keep
 * their Message-ID (so a receiving system can drop the repeat), and every scheduled task still
 * runs. The claim timeout (2 minutes) is played by ageing the dead worker's claims and leases in
 * the database, as if that time had passed.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Knex } from "knex";
import { enqueueEmail } from "@/lib/data/outbox";
import { TASKS } from "@/lib/worker/schedule";
import { testKnex, truncateAll } from "../support/db";
import { mailFake } from "../support/mail";

const N = 150;

const started = new Set<ChildProcess>();

function startWorker(args: string[] = []): ChildProcess {
  const child = spawn(process.execPath, ["--import", "tsx", "lib/worker/main.ts", ...args], {
    env: {
      ...process.env,
      DB_TARGET: "test",
      DB_NAME: process.env.DB_TEST_NAME ?? "loopwright_test",
      SMTP_PORT: String(inject("smtpPort")),
    },
    stdio: ["ignore", "ignore", "inherit"],
  });
  started.add(child);
  return child;
}

describe("worker killed mid-batch", () => {
  let knex: Knex;
  const mail = mailFake();
  const tag = `kill-${Date.now()}`;
  const mine = async () => (await mail.messages()).filter((m) => m.to.some((t) => t.includes(tag)));

  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
  });
  afterAll(async () => {
    // A failed or timed-out test must not leave a worker sending from this database.
    for (const c of started) if (c.exitCode === null) c.kill("SIGKILL");
    await truncateAll(knex);
    await knex.destroy();
  });

  it("loses no e-mail, repeats only what was in flight (same Message-ID), skips no task", async () => {
    for (let i = 0; i < N; i++)
      await enqueueEmail(knex, {
        to: { address: `r${i}-${tag}@example.test` },
        template: "verify_email",
        payload: { name: `R${i}`, url: `http://127.0.0.1/verify?i=${i}` },
      });

    const first = startWorker();
    const exited = new Promise((r) => first.once("exit", r));
    // Kill once some, not all, have gone out.
    const until = Date.now() + 60_000;
    let seen = 0;
    while (Date.now() < until) {
      seen = (await mine()).length;
      if (seen >= 5) break;
      await new Promise((r) => setTimeout(r, 10));
    }
    first.kill("SIGKILL");
    await exited;
    const sentAtKill = Number(
      (await knex("email_outbox").where({ status: "sent" }).count({ n: "*" }))[0]!.n,
    );
    expect(sentAtKill, "killed before the batch was done").toBeLessThan(N);

    // Two minutes later, as far as the dead worker's claims and leases are concerned.
    await knex("email_outbox")
      .where({ status: "sending" })
      .update({ claimed_at: knex.raw("claimed_at - INTERVAL 3 MINUTE") });
    await knex("worker_schedule").update({
      lease_until: knex.raw("IF(lease_until IS NULL, NULL, lease_until - INTERVAL 1 DAY)"),
    });

    const second = startWorker();
    const until2 = Date.now() + 60_000;
    while (Date.now() < until2) {
      const left = await knex("email_outbox").whereNot({ status: "sent" }).count({ n: "*" });
      if (Number(left[0]!.n) === 0) break;
      await new Promise((r) => setTimeout(r, 200));
    }
    // Give the scheduled tasks their pass too, then stop cleanly.
    const until3 = Date.now() + 30_000;
    while (Date.now() < until3) {
      const ran = await knex("worker_schedule").whereNotNull("last_run_at").count({ n: "*" });
      if (Number(ran[0]!.n) >= TASKS.length) break;
      await new Promise((r) => setTimeout(r, 200));
    }
    const stopped = new Promise((r) => second.once("exit", r));
    second.kill("SIGTERM");
    await stopped;

    const rows = await knex("email_outbox").select("id", "status", "to_address");
    expect(rows.filter((r) => r.status !== "sent")).toEqual([]);
    const got = await mine();
    const byAddress = new Map<string, string[]>();
    for (const m of got) {
      const to = m.to.find((t) => t.includes(tag))!;
      byAddress.set(to, [...(byAddress.get(to) ?? []), m.messageId ?? ""]);
    }
    // Every row arrived.
    for (const r of rows) expect(byAddress.has(r.to_address), r.to_address).toBe(true);
    // Repeats: only rows in flight at the kill (the transport sends at most two at once), and
    // each repeat carries the first copy's Message-ID.
    const repeated = [...byAddress.entries()].filter(([, ids]) => ids.length > 1);
    expect(repeated.length).toBeLessThanOrEqual(2);
    for (const [, ids] of repeated) expect(new Set(ids).size).toBe(1);
    // No task was skipped: each ran after the kill.
    const schedule = await knex("worker_schedule").select("task", "last_run_at", "lease_owner");
    expect(schedule.map((s) => s.task).sort()).toEqual(TASKS.map((t) => t.name).sort());
    for (const s of schedule) expect(s.last_run_at, s.task).toBeTruthy();
    console.log(
      `worker kill: ${sentAtKill}/${N} sent at the kill, ${got.length} delivered, ${repeated.length} repeated`,
    );
  }, 180_000);
});
