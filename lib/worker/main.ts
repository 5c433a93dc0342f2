/**
 * The worker: sends the e-mail outbox and runs the scheduled tasks. Safe to run more than once.
 *   tsx lib/worker/main.ts             run until SIGINT/SIGTERM
 *   tsx lib/worker/main.ts --once      one pass, then exit
 *   tsx lib/worker/main.ts --task credential-expiry   run one task now (by hand), then exit
 */
import { hostname } from "node:os";
import { getDb } from "@/lib/data/db";
import { parseEnv } from "@/lib/env";
import { createTransport, sendBatch } from "./mail";
import { runDueTasks, TASKS } from "./schedule";

const POLL_MS = 2000;

async function main(): Promise<void> {
  const env = parseEnv();
  const db = getDb();
  const transport = createTransport({
    host: env.SMTP_HOST,
    port: env.SMTP_PORT,
    from: env.MAIL_FROM,
  });
  const workerId = `${hostname()}:${process.pid}`;
  const args = process.argv.slice(2);
  let stopping = false;
  const stop = () => {
    stopping = true;
  };
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);

  try {
    const taskIndex = args.indexOf("--task");
    if (taskIndex >= 0) {
      const task = TASKS.find((t) => t.name === args[taskIndex + 1]);
      if (!task) throw new Error(`unknown task; known: ${TASKS.map((t) => t.name).join(", ")}`);
      console.log(
        `[worker] ${task.name}: ${await task.run({ db, now: new Date(), appUrl: env.APP_URL })}`,
      );
      return;
    }
    console.log(`[worker] ${workerId} started`);
    do {
      try {
        const sent = await sendBatch(db, transport, env.MAIL_FROM, workerId);
        if (sent.sent || sent.retried || sent.failed)
          console.log(`[worker] mail: ${JSON.stringify(sent)}`);
        const ran = await runDueTasks({ db, now: new Date(), appUrl: env.APP_URL }, workerId);
        for (const [name, outcome] of Object.entries(ran))
          console.log(`[worker] ${name}: ${outcome}`);
      } catch (err) {
        // The database or the mail server may be briefly away; the next pass tries again.
        console.error("[worker] pass failed:", err instanceof Error ? err.message : err);
      }
      if (args.includes("--once")) break;
      for (let waited = 0; waited < POLL_MS && !stopping; waited += 200)
        await new Promise((r) => setTimeout(r, 200));
    } while (!stopping);
    console.log("[worker] stopped");
  } finally {
    transport.close();
    await db.destroy();
  }
}

main().catch((err: unknown) => {
  console.error("[worker] failed:", err instanceof Error ? err.message : err);
  process.exit(1);
});
