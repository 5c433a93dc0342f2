/**
 * Scheduled tasks, shared by every worker process through the worker_schedule table: a worker
 * takes a task's lease with one conditional UPDATE, so a task runs in one place at a time, and
 * a crashed worker's lease simply runs out. Each task is idempotent on its own as well.
 */
import type { Knex } from "knex";
import { enqueueEmail } from "@/lib/mail/outbox";
import { credentialName } from "@/lib/credentials";

export interface TaskContext {
  knex: Knex;
  now: Date;
  appUrl: string;
}

export interface Task {
  name: string;
  everyMs: number;
  run(ctx: TaskContext): Promise<string>;
}

const LEASE_MS = 5 * 60_000;
const toSql = (d: Date) => d.toISOString().slice(0, 23).replace("T", " ");
const toDate = (d: Date) => d.toISOString().slice(0, 10);

/** Close open requests whose expiry has passed. */
export const expireRequests: Task = {
  name: "expire-requests",
  everyMs: 10 * 60_000,
  async run({ knex, now }) {
    const n = await knex("requests")
      .where({ status: "open" })
      .andWhere("expires_at", "<=", toSql(now))
      .update({ status: "expired" });
    return `${n} request(s) expired`;
  },
};

/**
 * Daily credential check: verified credentials past their date become `expired`; those that
 * expire within 30 days get one warning e-mail each (deduplicated by credential and date).
 */
export const credentialExpiry: Task = {
  name: "credential-expiry",
  everyMs: 24 * 60 * 60_000,
  async run({ knex, now, appUrl }) {
    const today = toDate(now);
    const expired = await knex.transaction(async (trx) => {
      const rows = await trx("credentials")
        .where({ status: "verified" })
        .andWhere("expires_on", "<", today)
        .forUpdate()
        .select("id", "reviewer_id");
      if (rows.length === 0) return 0;
      await trx("credentials")
        .whereIn(
          "id",
          rows.map((r) => r.id),
        )
        .update({ status: "expired" });
      await trx("audit_log").insert(
        rows.map((r) => ({
          actor_id: null,
          action: "credential.expired",
          entity_type: "credential",
          entity_id: r.id,
          detail: JSON.stringify({ on: today }),
        })),
      );
      return rows.length;
    });
    const horizon = toDate(new Date(now.getTime() + 30 * 86_400_000));
    const soon = await knex("credentials as c")
      .join("users as u", "u.id", "c.reviewer_id")
      .where("c.status", "verified")
      .andWhere("c.expires_on", ">=", today)
      .andWhere("c.expires_on", "<=", horizon)
      .whereNull("c.expiry_warned_at")
      .select("c.id", "c.kind", "c.expires_on", "u.id as user_id", "u.email", "u.display_name");
    let warned = 0;
    for (const c of soon) {
      await knex.transaction(async (trx) => {
        const result = await enqueueEmail(trx, {
          to: { address: c.email, userId: c.user_id },
          template: "credential_expiring",
          payload: {
            name: c.display_name,
            credential: credentialName(c.kind),
            expiresOn: String(c.expires_on),
            url: `${appUrl}/reviewer/credentials`,
          },
          dedupeKey: `credential-${c.id}-expiring-${c.expires_on}`,
        });
        await trx("credentials")
          .where({ id: c.id })
          .update({ expiry_warned_at: toSql(now) });
        if (result === "queued") warned += 1;
      });
    }
    return `${expired} credential(s) expired, ${warned} warning(s) queued`;
  },
};

export const TASKS: Task[] = [expireRequests, credentialExpiry];

/** Take the lease of a due task; true when this worker now owns it. */
async function takeLease(knex: Knex, task: Task, workerId: string, now: Date): Promise<boolean> {
  await knex.raw("INSERT IGNORE INTO worker_schedule (task, next_run_at) VALUES (?, ?)", [
    task.name,
    toSql(now),
  ]);
  const n = await knex("worker_schedule")
    .where({ task: task.name })
    .andWhere("next_run_at", "<=", toSql(now))
    .andWhere((q) => q.whereNull("lease_until").orWhere("lease_until", "<", toSql(now)))
    .update({ lease_owner: workerId, lease_until: toSql(new Date(now.getTime() + LEASE_MS)) });
  return n === 1;
}

/** Run every task that is due and whose lease this worker wins. */
export async function runDueTasks(
  ctx: TaskContext,
  workerId: string,
  tasks: Task[] = TASKS,
): Promise<Record<string, string>> {
  const done: Record<string, string> = {};
  for (const task of tasks) {
    if (!(await takeLease(ctx.knex, task, workerId, ctx.now))) continue;
    let error: string | null = null;
    try {
      done[task.name] = await task.run(ctx);
    } catch (err) {
      error = err instanceof Error ? err.message : String(err);
      done[task.name] = `failed: ${error}`;
    }
    await ctx
      .knex("worker_schedule")
      .where({ task: task.name, lease_owner: workerId })
      .update({
        lease_owner: null,
        lease_until: null,
        last_run_at: toSql(ctx.now),
        // A failed run is tried again in a minute rather than a whole period later.
        next_run_at: toSql(new Date(ctx.now.getTime() + (error ? 60_000 : task.everyMs))),
        last_error: error,
      });
  }
  return done;
}
