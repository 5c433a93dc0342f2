/**
 * Scheduled tasks, shared by every worker process through the worker_schedule table (see
 * lib/data/schedule.ts): a task runs in one place at a time, and each task is idempotent on its
 * own as well. Every task calls the same lib/data functions the app does.
 */
import type { Db } from "@/lib/data/db";
import { expireOpenRequests } from "@/lib/data/projects";
import { expireCredentials, warnExpiringCredentials } from "@/lib/data/reviewers";
import { finishTask, takeTaskLease } from "@/lib/data/schedule";
import { jobServices, releaseDueJobs } from "@/lib/data/jobs";

export interface TaskContext {
  db: Db;
  now: Date;
  appUrl: string;
}

export interface Task {
  name: string;
  everyMs: number;
  run(ctx: TaskContext): Promise<string>;
}

/** Close open requests whose expiry has passed. */
export const expireRequests: Task = {
  name: "expire-requests",
  everyMs: 10 * 60_000,
  async run({ db, now }) {
    return `${await expireOpenRequests(db, now)} request(s) expired`;
  },
};

/**
 * Daily credential check: verified credentials past their date become `expired`; those that
 * expire within 30 days get one warning e-mail each (deduplicated by credential and date).
 */
export const credentialExpiry: Task = {
  name: "credential-expiry",
  everyMs: 24 * 60 * 60_000,
  async run({ db, now, appUrl }) {
    const expired = await expireCredentials(db, now);
    const warned = await warnExpiringCredentials(db, appUrl, now);
    return `${expired} credential(s) expired, ${warned} warning(s) queued`;
  },
};

/**
 * Release held payments whose dispute window has closed with no dispute, through the same
 * lib/data function the homeowner's "release" button uses (one transfer, exactly once).
 */
export const autoRelease: Task = {
  name: "auto-release",
  everyMs: 5 * 60_000,
  async run({ db, now, appUrl }) {
    const r = await releaseDueJobs(db, now, jobServices({ appUrl }));
    return `${r.released} job(s) released, ${r.waiting} waiting`;
  },
};

export const TASKS: Task[] = [expireRequests, credentialExpiry, autoRelease];

/** Run every task that is due and whose lease this worker wins. */
export async function runDueTasks(
  ctx: TaskContext,
  workerId: string,
  tasks: Task[] = TASKS,
): Promise<Record<string, string>> {
  const done: Record<string, string> = {};
  for (const task of tasks) {
    if (!(await takeTaskLease(ctx.db, task.name, workerId, ctx.now))) continue;
    let error: string | null = null;
    try {
      done[task.name] = await task.run(ctx);
    } catch (err) {
      error = err instanceof Error ? err.message : String(err);
      done[task.name] = `failed: ${error}`;
    }
    // A failed run is tried again in a minute rather than a whole period later.
    await finishTask(ctx.db, task.name, workerId, ctx.now, error ? 60_000 : task.everyMs, error);
  }
  return done;
}
