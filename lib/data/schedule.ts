/**
 * The worker's schedule, shared by every worker process through the worker_schedule table: a
 * worker takes a task's lease with one conditional UPDATE, so a task runs in one place at a
 * time, and a crashed worker's lease simply runs out.
 */
import { sqlDateTime } from "@/lib/time";
import type { Db } from "./db";

export const LEASE_MS = 5 * 60_000;

/** Take the lease of a due task; true when this worker now owns it. */
export async function takeTaskLease(
  db: Db,
  task: string,
  workerId: string,
  now: Date,
): Promise<boolean> {
  await db.raw("INSERT IGNORE INTO worker_schedule (task, next_run_at) VALUES (?, ?)", [
    task,
    sqlDateTime(now),
  ]);
  const n = await db("worker_schedule")
    .where({ task })
    .andWhere("next_run_at", "<=", sqlDateTime(now))
    .andWhere((q) => q.whereNull("lease_until").orWhere("lease_until", "<", sqlDateTime(now)))
    .update({ lease_owner: workerId, lease_until: sqlDateTime(now, LEASE_MS) });
  return n === 1;
}

/** Give the lease back and set the next run (sooner after a failure). */
export async function finishTask(
  db: Db,
  task: string,
  workerId: string,
  now: Date,
  nextInMs: number,
  error: string | null,
): Promise<void> {
  await db("worker_schedule")
    .where({ task, lease_owner: workerId })
    .update({
      lease_owner: null,
      lease_until: null,
      last_run_at: sqlDateTime(now),
      next_run_at: sqlDateTime(now, nextInMs),
      last_error: error,
    });
}
