import { getDb, type Db } from "./db";

export interface Health {
  status: "ok" | "degraded";
  database: "up" | "down";
  error?: string;
}

/** Ask the database for one row, with a short timeout so a dead server answers quickly. */
export async function getHealth(db: Db = getDb()): Promise<Health> {
  let timer: NodeJS.Timeout | undefined;
  try {
    await Promise.race([
      db.raw("SELECT 1"),
      new Promise((_, reject) => {
        timer = setTimeout(() => reject(new Error("database did not answer within 2 s")), 2000);
      }),
    ]);
    return { status: "ok", database: "up" };
  } catch (err) {
    const message = err instanceof Error ? err.message : "unknown error";
    return { status: "degraded", database: "down", error: message.split("\n")[0] };
  } finally {
    clearTimeout(timer);
  }
}
