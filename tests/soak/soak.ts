/**
 * `npm run soak`: load on loopback, then the long hostile-input run.
 *
 * 1. Starts the built app (`npx next build` first) on a port of its own against the TEST
 *    database (which it wipes) with the mail, upload and payment fakes, and makes 50 homeowners
 *    (each with a project and an open request) and 50 verified reviewers, all signed in.
 * 2. 100 simulated users for SOAK_SECONDS (default 60): reviewers browse the board and request
 *    pages, quote and message; homeowners open their dashboard and request, message, accept a
 *    quote and pay on the payment fake's checkout page.
 * 3. Checks: no 5xx at all, and the rows in the database match the writes the app acknowledged
 *    (quotes, messages, jobs, funded jobs). Prints throughput and latency percentiles.
 * 4. Runs tests/e2e/hostile-input.test.ts with HOSTILE_RUNS (default 150) and a fresh seed
 *    (printed, so a failure can be replayed with HOSTILE_SEED=<seed>).
 *
 * Environment: SOAK_SECONDS, SOAK_USERS (default 100), HOSTILE_RUNS, SOAK_SKIP_HOSTILE=1.
 */
import { spawn } from "node:child_process";
import { existsSync } from "node:fs";
import { knexConfig } from "../../knexfile";
import knexFactory, { type Knex } from "knex";
import { truncateAll } from "../support/db";
import {
  acquireMailFake,
  acquirePaymentsFake,
  acquireUploadFake,
  TEST_PAYMENT_KEYS,
  TEST_PORTS,
} from "../support/fakes";
import {
  FIXTURE_PASSWORD,
  makeHomeowner,
  makeProject,
  makeRequest,
  makeReviewer,
  type HomeownerFixture,
  type RequestFixture,
  type ReviewerFixture,
} from "../support/fixtures";
import { signInHttp } from "../support/session";
import { callAction, form } from "../support/actions-http";
import { paymentsFakeControl } from "../support/payments";

const SECONDS = Number(process.env.SOAK_SECONDS ?? 60);
const USERS = Number(process.env.SOAK_USERS ?? 100);
const PORT = TEST_PORTS.app + 300;
const BASE = `http://127.0.0.1:${PORT}`;
const PAYMENTS = `http://127.0.0.1:${TEST_PORTS.payments}`;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

// ---------------------------------------------------------------------------------------------
// Measuring
// ---------------------------------------------------------------------------------------------
const latencies: number[] = [];
const statusCounts = new Map<number, number>();
const serverErrors: string[] = [];
const acked = { quotes: 0, messages: 0, jobs: 0, payments: 0, autosaves: 0 };

async function timed<T extends { status: number }>(label: string, call: () => Promise<T>) {
  const t0 = performance.now();
  const r = await call();
  latencies.push(performance.now() - t0);
  statusCounts.set(r.status, (statusCounts.get(r.status) ?? 0) + 1);
  if (r.status >= 500) serverErrors.push(`${r.status} ${label}`);
  return r;
}

function get(path: string, cookie?: string) {
  return timed(`GET ${path}`, async () => {
    const res = await fetch(`${BASE}${path}`, {
      redirect: "manual",
      headers: cookie ? { cookie } : {},
    });
    await res.arrayBuffer();
    return res;
  });
}

function postJson(path: string, body: unknown, cookie: string) {
  return timed(`POST ${path}`, async () => {
    const res = await fetch(`${BASE}${path}`, {
      method: "POST",
      headers: { cookie, "content-type": "application/json" },
      body: JSON.stringify(body),
    });
    await res.arrayBuffer();
    return res;
  });
}

async function action(name: string, args: unknown[], cookie: string, path: string) {
  const ans = await timed(`action ${name}`, () => callAction(BASE, name, args, { cookie, path }));
  // An action answers 200 even when it failed unexpectedly: its "something went wrong" counts.
  if (/something went wrong/i.test(ans.value?.message ?? ""))
    serverErrors.push(`unexpected failure in ${name}`);
  return ans;
}

const pick = <T>(xs: T[]) => xs[Math.floor(Math.random() * xs.length)]!;

// ---------------------------------------------------------------------------------------------
// The journeys
// ---------------------------------------------------------------------------------------------
interface Home {
  who: HomeownerFixture;
  cookie: string;
  request: RequestFixture;
}
interface Rev {
  who: ReviewerFixture;
  cookie: string;
  quoted: Set<number>;
}

/**
 * HOOK (review workspace): once the checklist autosave route exists on this branch, reviewers
 * of funded jobs call it here and count acknowledged saves in `acked.autosaves`, and `verify()`
 * compares them with the answer rows. Until then it does nothing.
 */
async function autosaveChecklistHook(_r: Rev, _knex: Knex): Promise<void> {}

async function reviewerJourney(r: Rev, homes: Home[], knex: Knex, until: number) {
  while (Date.now() < until) {
    await get("/api/board", r.cookie);
    const h = pick(homes);
    await get(`/requests/${h.request.id}`, r.cookie);
    if (!r.quoted.has(h.request.id) && Math.random() < 0.5) {
      const ans = await action(
        "components/quotes/actions.ts#sendQuote",
        [
          h.request.id,
          { ok: false },
          form({
            pricePounds: String(60 + Math.floor(Math.random() * 100)),
            turnaroundDays: "3",
            scopeMd: "Full checklist review of the loop, the sketch and the photos (soak).",
          }),
        ],
        r.cookie,
        `/requests/${h.request.id}`,
      );
      if (ans.value?.ok === true) {
        acked.quotes++;
        r.quoted.add(h.request.id);
      }
    }
    if (r.quoted.size) {
      const id = pick([...r.quoted]);
      const res = await postJson(
        `/api/requests/${id}/messages`,
        { body: "Could you add a photo of the pump station? (soak)" },
        r.cookie,
      );
      if (res.status === 201) acked.messages++;
    }
    await autosaveChecklistHook(r, knex);
  }
}

async function homeownerJourney(h: Home, knex: Knex, until: number) {
  const pay = paymentsFakeControl(PAYMENTS, TEST_PAYMENT_KEYS.secretKey);
  let paid = false;
  while (Date.now() < until) {
    await get("/dashboard", h.cookie);
    await get(`/requests/${h.request.id}`, h.cookie);
    const quotes = await knex("quotes")
      .where({ request_id: h.request.id, status: "live" })
      .select("id", "reviewer_id");
    if (quotes.length) {
      const q = pick(quotes);
      const res = await postJson(
        `/api/requests/${h.request.id}/messages?reviewer=${q.reviewer_id}`,
        { body: "Thanks, photo coming tonight. (soak)" },
        h.cookie,
      );
      if (res.status === 201) acked.messages++;
      if (!paid && quotes.length >= 2) {
        paid = true;
        const accepted = await action(
          "components/quotes/actions.ts#acceptQuoteAction",
          [{ ok: false }, form({ requestId: String(h.request.id), quoteId: String(q.id) })],
          h.cookie,
          `/requests/${h.request.id}`,
        );
        const jobId = /\/jobs\/(\d+)/.exec(accepted.redirect ?? "")?.[1];
        if (!jobId) continue;
        acked.jobs++;
        const checkout = await action(
          "components/jobs/actions.ts#payForJob",
          [{ ok: false }, form({ jobId })],
          h.cookie,
          `/jobs/${jobId}`,
        );
        if (!checkout.redirect?.includes("/_fake/checkout/")) continue;
        const paidRes = await timed("pay on the checkout page", () =>
          pay.payCheckout(new URL(checkout.redirect!, PAYMENTS).toString()),
        );
        if (paidRes.status === 303 || paidRes.status === 302) acked.payments++;
        await get(`/jobs/${jobId}`, h.cookie);
      }
    }
    await sleep(100);
  }
}

/** A session cookie, or an error saying why not (a journey without one would measure nothing). */
async function session(email: string, knex: Knex): Promise<string> {
  // The simulated users share loopback, but real ones come from their own addresses: clear the
  // per-address sign-in counter before each (the per-account limit still applies).
  await knex("rate_limit_hits").where("bucket", "like", "signin:address:%").delete();
  const s = await signInHttp(BASE, email, FIXTURE_PASSWORD);
  if (!s.cookie.includes("session-token"))
    throw new Error(`${email} could not sign in (status ${s.status})`);
  return s.cookie;
}

// ---------------------------------------------------------------------------------------------
// Set-up, run, verify
// ---------------------------------------------------------------------------------------------
function percentile(xs: number[], p: number): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor((p / 100) * s.length))] ?? 0;
}

async function waitForHealth(ms: number) {
  const until = Date.now() + ms;
  while (Date.now() < until) {
    try {
      if ((await fetch(`${BASE}/api/health`)).status === 200) return;
    } catch {
      // not up yet
    }
    await sleep(250);
  }
  throw new Error(`${BASE} did not come up`);
}

async function main() {
  if (!existsSync(".next/BUILD_ID"))
    throw new Error("No production build: run `npx next build` first.");
  process.env.DB_TARGET = "test";
  const knex = knexFactory({ ...knexConfig("test"), pool: { min: 0, max: 8 } });
  const leave = [await acquireMailFake(), await acquireUploadFake(), await acquirePaymentsFake()];
  await truncateAll(knex);
  await paymentsFakeControl(PAYMENTS, TEST_PAYMENT_KEYS.secretKey).reset();
  const app = spawn(
    process.execPath,
    ["node_modules/next/dist/bin/next", "start", "-H", "127.0.0.1", "-p", String(PORT)],
    {
      env: {
        ...process.env,
        DB_TARGET: "test",
        DB_NAME: process.env.DB_TEST_NAME ?? "loopwright_test",
        APP_URL: BASE,
        SMTP_PORT: String(TEST_PORTS.mailSmtp),
        UPLOADTHING_INGEST_URL: `http://127.0.0.1:${TEST_PORTS.upload}`,
        STRIPE_API_HOST: "127.0.0.1",
        STRIPE_API_PORT: String(TEST_PORTS.payments),
        STRIPE_API_PROTOCOL: "http",
        NEXT_TELEMETRY_DISABLED: "1",
      },
      stdio: ["ignore", "ignore", "inherit"],
    },
  );
  // The payment fake's webhooks go to the e2e app's port; point them at this one.
  await paymentsFakeControl(PAYMENTS, TEST_PAYMENT_KEYS.secretKey).config({
    webhookUrl: `${BASE}/api/webhooks/payments`,
  });
  let failed = false;
  try {
    await waitForHealth(60_000);
    const homes: Home[] = [];
    const revs: Rev[] = [];
    const nHomes = Math.floor(USERS / 2);
    for (let i = 0; i < nHomes; i++) {
      const who = await makeHomeowner(knex);
      const request = await makeRequest(knex, await makeProject(knex, who));
      homes.push({
        who,
        request,
        cookie: await session(who.email, knex),
      });
    }
    for (let i = 0; i < USERS - nHomes; i++) {
      const who = await makeReviewer(knex);
      revs.push({
        who,
        quoted: new Set(),
        cookie: await session(who.email, knex),
      });
    }
    console.log(
      `[soak] ${homes.length} homeowners and ${revs.length} reviewers for ${SECONDS} s on ${BASE}`,
    );
    const started = Date.now();
    const until = started + SECONDS * 1000;
    await Promise.all([
      ...revs.map((r) => reviewerJourney(r, homes, knex, until)),
      ...homes.map((h) => homeownerJourney(h, knex, until)),
    ]);
    const elapsed = (Date.now() - started) / 1000;
    // Let the last webhooks land.
    await paymentsFakeControl(PAYMENTS, TEST_PAYMENT_KEYS.secretKey).flush(20_000);

    const count = async (q: Knex.QueryBuilder) =>
      Number(((await q.count({ n: "*" })) as { n: number }[])[0]!.n);
    const rows = {
      quotes: await count(knex("quotes")),
      messages: await count(knex("messages")),
      jobs: await count(knex("jobs")),
      funded: await count(knex("jobs").whereNotNull("funded_at")),
    };
    console.log(
      `[soak] ${latencies.length} requests in ${elapsed.toFixed(1)} s: ${(latencies.length / elapsed).toFixed(1)} req/s; ` +
        `p50 ${percentile(latencies, 50).toFixed(0)} ms, p95 ${percentile(latencies, 95).toFixed(0)} ms, ` +
        `p99 ${percentile(latencies, 99).toFixed(0)} ms, max ${percentile(latencies, 100).toFixed(0)} ms`,
    );
    console.log(`[soak] statuses ${JSON.stringify(Object.fromEntries([...statusCounts].sort()))}`);
    console.log(
      `[soak] acknowledged ${JSON.stringify(acked)}; in the database ${JSON.stringify(rows)}`,
    );
    const problems: string[] = [];
    if (serverErrors.length)
      problems.push(
        `${serverErrors.length} 5xx answers, e.g. ${serverErrors.slice(0, 5).join("; ")}`,
      );
    if (rows.quotes !== acked.quotes)
      problems.push(`quotes: ${rows.quotes} rows, ${acked.quotes} acknowledged`);
    if (rows.messages !== acked.messages)
      problems.push(`messages: ${rows.messages} rows, ${acked.messages} acknowledged`);
    if (rows.jobs !== acked.jobs)
      problems.push(`jobs: ${rows.jobs} rows, ${acked.jobs} acknowledged`);
    if (rows.funded !== acked.payments)
      problems.push(`funded jobs: ${rows.funded}, ${acked.payments} payments acknowledged`);
    if (problems.length) {
      failed = true;
      console.error(`[soak] FAILED:\n  ${problems.join("\n  ")}`);
    } else console.log("[soak] passed: no 5xx, every acknowledged write is in the database");
  } finally {
    app.kill("SIGTERM");
    await truncateAll(knex);
    await knex.destroy();
    for (const l of leave) await l();
  }
  if (failed) process.exit(1);

  if (process.env.SOAK_SKIP_HOSTILE !== "1") {
    const seed = String(Math.floor(Math.random() * 2 ** 31));
    const runs = process.env.HOSTILE_RUNS ?? "150";
    console.log(`[soak] hostile input: ${runs} runs per target, seed ${seed}`);
    const code = await new Promise<number>((ok) =>
      spawn("npx", ["vitest", "run", "--project", "e2e", "tests/e2e/hostile-input.test.ts"], {
        stdio: "inherit",
        env: { ...process.env, HOSTILE_SEED: seed, HOSTILE_RUNS: runs },
      }).on("exit", (c) => ok(c ?? 1)),
    );
    if (code !== 0) {
      console.error(
        `[soak] hostile input failed; replay with HOSTILE_SEED=${seed} HOSTILE_RUNS=${runs}`,
      );
      process.exit(code);
    }
  }
}

main().catch((e: unknown) => {
  console.error("[soak] failed:", e);
  process.exit(1);
});
