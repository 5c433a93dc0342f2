/**
 * `npm run bench`: the whole performance bench in one run (see README, "Benchmark").
 *
 *   1. the loop check (tests/bench/loop-check.ts, ≤ 0.5 ms median per system)
 *   2. a production build, and the bench dataset seeded into its own database
 *   3. autocannon against the app's routes with real session cookies, the bare baseline
 *      (tests/bench/bare-server.ts) and the framework floor (/api/bench/constant), with ratios
 *   4. the board's query plans, first-load JavaScript per page in Chromium, peak server memory
 *   5. scale-out: a second app instance and two workers on one database
 *   6. scaling: the board at 1,000 / 10,000 / 100,000 open requests, page 1 against page 200
 *
 * Figures go to .bench/results.json and .bench/results.md (git-ignored).
 * Options: --skip-build (reuse .next), --quick (short runs), --js (first-load JS only, seeding first if empty; on a seeded
 * database; BENCH_JS_DETAIL=1 lists the chunks), BENCH_DB, BENCH_PORT, BENCH_SECONDS.
 */
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, readdirSync, writeFileSync } from "node:fs";
import { gzipSync } from "node:zlib";
import autocannon from "autocannon";
import knexFactory, { type Knex } from "knex";
import { chromium, type BrowserContext } from "playwright-core";
import { knexConfig } from "@/knexfile";
import { DEMO_PASSWORD, DEMO_USERS } from "@/db/seeds/demo";
import { buildBoardQuery } from "@/lib/data/board";
import { getBoardReviewer } from "@/lib/data/reviewers";
import { enqueueEmail } from "@/lib/data/outbox";
import { getReviewState } from "@/lib/data/review";
import { TASKS } from "@/lib/worker/schedule";
import { boardQuerySchema } from "@/lib/validation/board";
import { startMailFake } from "../../mocks/mail/server";
import { startPaymentsFake } from "../../mocks/payments/server";
import { signInHttp } from "../support/session";
import { BASE, COUNTS, HOMEOWNER_BASE, seedBenchData } from "./dataset";

const args = new Set(process.argv.slice(2));
const QUICK = args.has("--quick");
/** --js: only the first-load JavaScript (seeding the bench database first if it is empty). */
const JS_ONLY = args.has("--js");
const SECONDS = Number(process.env.BENCH_SECONDS ?? (QUICK ? 3 : 10));
const SHORT = QUICK ? 2 : 4; // the scaling runs (one connection)
const CONNECTIONS = 32;
const DB_NAME = process.env.BENCH_DB ?? "loopwright_test_bench_data";
const PORT = Number(process.env.BENCH_PORT ?? 3380);
const PORTS = {
  a: PORT,
  b: PORT + 1,
  bare: PORT + 2,
  smtp: PORT - 430,
  mail: PORT - 429,
  payments: PORT - 428,
};
// The demo part of the dataset pays for its jobs on the payment fake, as `npm start` does.
process.env.STRIPE_API_PORT = String(PORTS.payments);
const OUT = ".bench";
const NODE = process.execPath;

const log = (s: string) => console.log(`[bench] ${s}`);
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
const children: ChildProcess[] = [];
const results: Record<string, unknown> = {
  startedAt: new Date().toISOString(),
  machine: { cpus: (await import("node:os")).cpus().length, node: process.version },
  settings: { seconds: SECONDS, connections: CONNECTIONS, database: DB_NAME },
};

// ---------------------------------------------------------------- processes

const appEnv = (port: number): NodeJS.ProcessEnv => ({
  ...process.env,
  NODE_ENV: "production" as const,
  DB_NAME,
  APP_URL: `http://127.0.0.1:${port}`,
  SMTP_PORT: String(PORTS.smtp),
  MAIL_FAKE_URL: `http://127.0.0.1:${PORTS.mail}`,
  STRIPE_API_PORT: String(PORTS.payments),
  NEXT_TELEMETRY_DISABLED: "1",
  BENCH: "1",
});

function start(name: string, argv: string[], env: NodeJS.ProcessEnv, logTo?: string[]) {
  const child = spawn(NODE, argv, { env, stdio: ["ignore", "pipe", "pipe"] });
  children.push(child);
  const keep = (b: Buffer) => {
    for (const line of b.toString().split("\n")) if (line.trim()) logTo?.push(line);
  };
  child.stdout!.on("data", keep);
  child.stderr!.on("data", (b: Buffer) => {
    keep(b);
    if (!logTo) process.stderr.write(`[${name}] ${b}`);
  });
  return child;
}

async function stopChild(child: ChildProcess) {
  if (child.exitCode !== null) return;
  const done = new Promise((r) => child.once("exit", r));
  child.kill("SIGTERM");
  await Promise.race([done, sleep(10_000)]);
  if (child.exitCode === null && child.signalCode === null) child.kill("SIGKILL");
}

async function waitFor(url: string, ms = 60_000, child?: ChildProcess) {
  const until = Date.now() + ms;
  while (Date.now() < until) {
    if (child && child.exitCode !== null) throw new Error(`${url}: the server exited`);
    try {
      if ((await fetch(url)).status < 500) return;
    } catch {
      // not up yet
    }
    await sleep(250);
  }
  throw new Error(`${url} did not answer within ${ms} ms`);
}

const startApp = async (port: number) => {
  // Measuring a server left over from an earlier run would print its figures as ours.
  const stale = await fetch(`http://127.0.0.1:${port}/api/health`).then(
    () => true,
    () => false,
  );
  if (stale)
    throw new Error(`port ${port} is already in use: stop what runs there (or set BENCH_PORT)`);
  const child = start(
    `app:${port}`,
    ["node_modules/next/dist/bin/next", "start", "-H", "127.0.0.1", "-p", String(port)],
    appEnv(port),
  );
  await waitFor(`http://127.0.0.1:${port}/api/health`, 60_000, child);
  return child;
};

/** Resident memory of a process and its children, in MB (Linux /proc). */
function treeRssMb(pid: number): number {
  const kids = new Map<number, number[]>();
  for (const d of readdirSync("/proc").filter((x) => /^\d+$/.test(x))) {
    try {
      const stat = readFileSync(`/proc/${d}/stat`, "utf8");
      const ppid = Number(stat.slice(stat.lastIndexOf(")") + 2).split(" ")[1]);
      kids.set(ppid, [...(kids.get(ppid) ?? []), Number(d)]);
    } catch {
      // gone
    }
  }
  let kb = 0;
  const visit = (p: number) => {
    try {
      const m = /VmRSS:\s+(\d+)/.exec(readFileSync(`/proc/${p}/status`, "utf8"));
      kb += Number(m?.[1] ?? 0);
    } catch {
      // gone
    }
    for (const k of kids.get(p) ?? []) visit(k);
  };
  visit(pid);
  return Math.round(kb / 1024);
}

function watchRss(pid: number) {
  let peak = 0;
  const timer = setInterval(() => (peak = Math.max(peak, treeRssMb(pid))), 250);
  return {
    peak: () => peak,
    reset: () => (peak = treeRssMb(pid)),
    stop: () => clearInterval(timer),
  };
}

// ---------------------------------------------------------------- load

interface Load {
  rps: number;
  p50: number;
  p99: number;
  requests: number;
  non2xx: number;
  errors: number;
  bytes: number;
}

async function load(url: string, cookie = "", seconds = SECONDS, connections = CONNECTIONS) {
  const r = await autocannon({
    url,
    connections,
    duration: seconds,
    headers: cookie ? { cookie } : {},
  });
  return toLoad(r);
}

function toLoad(r: autocannon.Result): Load {
  return {
    rps: Math.round(r.requests.average),
    p50: r.latency.p50,
    p99: r.latency.p99,
    requests: r.requests.total,
    non2xx: r.non2xx,
    errors: r.errors + r.timeouts,
    bytes: Math.round(r.throughput.total / Math.max(1, r.requests.total)),
  };
}

/** A short warm-up (JIT, pools, caches), then the measured run. */
async function measure(name: string, url: string, cookie = ""): Promise<Load> {
  await load(url, cookie, 2, 8);
  const r = await load(url, cookie);
  log(
    `${name.padEnd(28)} ${String(r.rps).padStart(6)} req/s  p50 ${r.p50} ms  p99 ${r.p99} ms` +
      (r.non2xx || r.errors ? `  (${r.non2xx} non-2xx, ${r.errors} errors)` : ""),
  );
  return r;
}

/**
 * The review workspace's autosave under load: PUT one checklist answer, each connection on an item
 * of its own (as a reviewer's tabs would be), sending the version the last save returned. Every
 * save locks the job's draft report, so the saves of one job queue behind each other: this is
 * the worst case of one busy review, not many reviews side by side.
 */
async function measureAutosave(
  base: string,
  cookie: string,
  jobId: number,
  readVersions: () => Promise<Record<string, number>>,
): Promise<Load & { connections: number; conflicts: number }> {
  let versions = await readVersions();
  const keys = Object.keys(versions);
  const connections = Math.min(CONNECTIONS, keys.length);
  let next = 0;
  let conflicts = 0;
  type Ctx = { item?: string; version?: number; n?: number };
  const run = (seconds: number) =>
    autocannon({
      url: base,
      connections,
      duration: seconds,
      headers: { cookie, "content-type": "application/json" },
      requests: [
        {
          method: "PUT",
          setupRequest: (req: autocannon.Request, context: object) => {
            const ctx = context as Ctx;
            ctx.item ??= keys[next++ % keys.length]!;
            ctx.version ??= versions[ctx.item]!;
            ctx.n = (ctx.n ?? 0) + 1;
            return {
              ...req,
              path: `/api/jobs/${jobId}/answers/${encodeURIComponent(ctx.item)}`,
              body: JSON.stringify({
                verdict: "sound",
                noteMd: `Checked on the bench, save ${ctx.n}.`,
                expectedVersion: ctx.version,
              }),
            };
          },
          onResponse: (status: number, body: string, context: object) => {
            const ctx = context as Ctx;
            const saved = JSON.parse(body) as { version?: number; current?: { version: number } };
            if (status === 409) conflicts++;
            ctx.version = saved.version ?? saved.current?.version ?? ctx.version;
            versions[ctx.item!] = ctx.version!;
          },
        },
      ],
    });
  await run(2);
  // Saves cut off at the end of the warm-up may have landed: start again from what is saved.
  await drain(base);
  versions = await readVersions();
  next = 0;
  conflicts = 0;
  const r = await run(SECONDS);
  const out = { ...toLoad(r), connections, conflicts };
  log(
    `${"checklist autosave (PUT)".padEnd(28)} ${String(out.rps).padStart(6)} req/s  p50 ${out.p50} ms  p99 ${out.p99} ms  (${connections} connections, one item each; ${out.conflicts} stale-version answers, ${out.non2xx} non-2xx)`,
  );
  return out;
}

/** Wait until requests cut off by the last run have left the server (health answers quickly). */
async function drain(base: string) {
  const until = Date.now() + 60_000;
  while (Date.now() < until) {
    const t0 = performance.now();
    await fetch(`${base}/api/health`).catch(() => undefined);
    if (performance.now() - t0 < 100) return;
    await sleep(500);
  }
}

/** Median latency with one connection: what one request costs, without queueing. */
async function median(url: string, cookie: string) {
  await load(url, cookie, 1, 1);
  const r = await load(url, cookie, SHORT, 1);
  if (r.non2xx || r.errors) throw new Error(`${url}: ${r.non2xx} non-2xx, ${r.errors} errors`);
  return r.p50;
}

// ---------------------------------------------------------------- steps

function loopCheck() {
  const out = spawnSync(NODE, ["--import", "tsx", "tests/bench/loop-check.ts"], {
    encoding: "utf8",
  });
  const text = out.stdout.trim();
  console.log(text);
  const us = [...text.matchAll(/median ([\d.]+) µs/g)].map((m) => Number(m[1]));
  return {
    exampleMedianUs: us[0],
    randomMedianUs: us[1],
    withinTarget: /within target/.test(text),
  };
}

function build() {
  if (args.has("--skip-build") && existsSync(".next/BUILD_ID")) {
    log("reusing the existing production build (--skip-build)");
    return null;
  }
  log("building the production app (next build)");
  const t0 = performance.now();
  const out = spawnSync(NODE, ["node_modules/next/dist/bin/next", "build"], {
    encoding: "utf8",
    env: { ...process.env, NEXT_TELEMETRY_DISABLED: "1" },
  });
  if (out.status !== 0) {
    console.error(out.stdout.slice(-3000), out.stderr.slice(-3000));
    throw new Error("next build failed");
  }
  return Math.round((performance.now() - t0) / 1000);
}

function knexOn(database: string | undefined, max = 4): Knex {
  const cfg = knexConfig("app");
  return knexFactory({
    ...cfg,
    connection: { ...(cfg.connection as object), database },
    pool: { min: 0, max },
  });
}

async function firstLoadJs(base: string, pages: Record<string, { path: string; cookie: string }>) {
  const browser = await chromium.launch({ executablePath: "/usr/bin/chromium" });
  const out: Record<string, number | string> = {};
  const later: Record<string, number> = {};
  const contexts = new Map<string, BrowserContext>();
  try {
    for (const [name, { path, cookie }] of Object.entries(pages)) {
      let context = contexts.get(cookie);
      if (!context) {
        context = await browser.newContext();
        const pairs = cookie ? cookie.split("; ").map((c) => c.split("=")) : [];
        await context.addCookies(
          pairs.map(([n, ...v]) => ({ name: n!, value: v.join("="), url: base })),
        );
        contexts.set(cookie, context);
      }
      const page = await context.newPage();
      const scripts: Promise<[string, number]>[] = [];
      page.on("response", (res) => {
        if (res.request().resourceType() === "script" && res.url().startsWith(base))
          scripts.push(
            res
              .body()
              .then((b): [string, number] => [new URL(res.url()).pathname, gzipSync(b).length])
              .catch((): [string, number] => [res.url(), 0]),
          );
      });
      const res = await page.goto(`${base}${path}`, { waitUntil: "load" });
      // First-load JS: the scripts the server's HTML names (what the page needs to hydrate);
      // chunks fetched later (lazy components) are counted apart.
      const html = res ? await res.text() : "";
      const named = new Set(
        [...html.matchAll(/<script[^>]+src="([^"]+)"/g)].map((m) => new URL(m[1]!, base).pathname),
      );
      await page.waitForLoadState("networkidle").catch(() => undefined);
      const sizes = await Promise.all(scripts);
      const kb = (xs: [string, number][]) => Math.round(xs.reduce((t, [, n]) => t + n, 0) / 1024);
      const first = sizes.filter(([u]) => named.has(u));
      out[name] = res && res.status() < 400 ? kb(first) : `status ${res?.status()}`;
      later[name] = kb(sizes.filter(([u]) => !named.has(u)));
      if (process.env.BENCH_JS_DETAIL)
        for (const [u, n] of first.sort((a, b) => b[1] - a[1]))
          log(`    ${(n / 1024).toFixed(1)} kB ${u}`);
      log(
        `first-load JS ${name.padEnd(16)} ${out[name]} kB gzipped, ${later[name]} kB later (${path})`,
      );
      await page.close();
    }
  } finally {
    await browser.close();
  }
  return { firstLoad: out, later };
}

async function boardPlans(knex: Knex) {
  const cases: Record<string, string>[] = [
    {},
    { kind: "remote_check", region: "south-west" },
    { collectorType: "flat_plate" },
    { budgetMin: "150" },
    { budgetMax: "120" },
    { postedWithinDays: "2" },
    { withinKm: "50" },
    { sort: "budget" },
    { sort: "distance" },
    { sort: "soonest" },
    { sort: "soonest", kind: "site_visit", region: "wales" },
  ];
  const plans: Record<string, unknown>[] = [];
  for (const raw of cases) {
    const built = buildBoardQuery(knex, boardQuerySchema.parse(raw), 20, { lat: 52, lng: -3.5 })
      .toSQL()
      .toNative();
    const [plan] = (await knex.raw(`EXPLAIN ${built.sql}`, built.bindings)) as [
      { table: string; key: string | null; type: string; Extra: string }[],
    ];
    const r = plan.find((p) => p.table === "r")!;
    plans.push({
      filter: new URLSearchParams(raw).toString() || "(none)",
      key: r.key,
      type: r.type,
    });
  }
  const bad = plans.filter((p) => !String(p.key).startsWith("requests_board") || p.type === "ALL");
  log(`board plans: ${plans.length - bad.length}/${plans.length} on a requests_board_* index`);
  return { plans, allIndexed: bad.length === 0 };
}

async function pageCursor(base: string, cookie: string, query: string, page: number) {
  let cursor: string | null = null;
  for (let i = 1; i < page; i++) {
    const res: Response = await fetch(
      `${base}/api/board?${query}${cursor ? `&cursor=${encodeURIComponent(cursor)}` : ""}`,
      { headers: { cookie } },
    );
    cursor = ((await res.json()) as { nextCursor: string | null }).nextCursor;
    if (!cursor) return null;
  }
  return cursor;
}

// ---------------------------------------------------------------- the run

async function main() {
  mkdirSync(OUT, { recursive: true });
  results.loopCheck = JS_ONLY ? null : loopCheck();
  results.buildSeconds = build();

  const root = knexOn(undefined, 1);
  await root.raw(
    `CREATE DATABASE IF NOT EXISTS \`${DB_NAME}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`,
  );
  await root.destroy();
  // In memory, no webhooks: the bench makes no payments of its own.
  const payments = await startPaymentsFake({ port: PORTS.payments, webhookUrl: null });
  // --js on an empty database seeds it first (27 s on a quiet 2-core machine).
  const probe = knexOn(DB_NAME, 1);
  const seeded =
    (await probe.schema.hasTable("users")) &&
    Number((await probe("users").count({ n: "*" }))[0]!.n) > 0;
  await probe.destroy();
  if (!JS_ONLY || !seeded) {
    const seedKnex = knexOn(DB_NAME, 1);
    log(`seeding the bench dataset into ${DB_NAME}`);
    const dataset = await seedBenchData(seedKnex);
    await seedKnex.destroy();
    results.dataset = dataset;
    log(`dataset: ${JSON.stringify(dataset.rows)} in ${dataset.seconds.toFixed(1)} s`);
  }
  const knex = knexOn(DB_NAME);

  const mail = await startMailFake({
    smtpPort: PORTS.smtp,
    httpPort: PORTS.mail,
    dir: ".data/mail-bench",
  });
  await fetch(`http://127.0.0.1:${PORTS.mail}/api/messages`, { method: "DELETE" });

  const appA = await startApp(PORTS.a);
  const rss = watchRss(appA.pid!);
  const A = `http://127.0.0.1:${PORTS.a}`;
  const reviewerEmail = DEMO_USERS.reviewers[0].email;
  const reviewer = (await signInHttp(A, reviewerEmail, DEMO_PASSWORD)).cookie;
  const homeowner = (await signInHttp(A, DEMO_USERS.homeowners[0].email, DEMO_PASSWORD)).cookie;
  const reviewerId = Number((await knex("users").where({ email: reviewerEmail }).first("id")).id);
  const homeownerId = Number(
    (await knex("users").where({ email: DEMO_USERS.homeowners[0].email }).first("id")).id,
  );
  const project = await knex("projects").where({ owner_id: homeownerId }).first("id");
  const openRequest = (
    await knex("requests").where({ status: "open" }).orderBy("id", "desc").first("id")
  ).id;
  const job = await knex("jobs").where({ homeowner_id: homeownerId }).first("id");
  // A delivered report the reviewer wrote (the reviewer may read it, as the homeowner may).
  const delivered = await knex("jobs")
    .where({ reviewer_id: reviewerId })
    .whereIn("state", ["delivered", "released"])
    .first("id");
  const jsPages = (firstStep: number) => ({
    landing: { path: "/", cookie: "" },
    "sign-in": { path: "/sign-in", cookie: "" },
    "loop check": { path: "/loop-check", cookie: "" },
    "project steps": { path: `/projects/${firstStep}/edit/site`, cookie: homeowner },
    dashboard: { path: "/dashboard", cookie: homeowner },
    board: { path: "/board", cookie: reviewer },
    "request page": { path: `/requests/${openRequest}`, cookie: reviewer },
    ...(job ? { "job page": { path: `/jobs/${job.id}`, cookie: homeowner } } : {}),
    ...(delivered ? { report: { path: `/jobs/${delivered.id}/report`, cookie: reviewer } } : {}),
  });

  if (JS_ONLY) {
    await firstLoadJs(A, jsPages(project.id));
    await stopChild(appA);
    await mail.close();
    await payments.close();
    await knex.destroy();
    return;
  }
  // The routes under load.
  const typical = "kind=remote_check&region=south-west";
  const deepCursor = await pageCursor(A, reviewer, "", 200);
  // JSON first, pages after: a page that saturates the server leaves work queued behind it.
  const routes: Record<string, [string, string]> = {
    "constant JSON (floor)": [`${A}/api/bench/constant`, reviewer],
    "board, first page": [`${A}/api/board`, reviewer],
    "board, typical filter": [`${A}/api/board?${typical}`, reviewer],
    "board, page 200": [`${A}/api/board?cursor=${encodeURIComponent(deepCursor ?? "")}`, reviewer],
    "request page (reviewer)": [`${A}/requests/${openRequest}`, reviewer],
    "homeowner dashboard": [`${A}/dashboard`, homeowner],
    "landing page": [`${A}/`, ""],
    "loop check page": [`${A}/loop-check`, ""],
  };
  for (const [name, [url, cookie]] of Object.entries(routes)) {
    const res = await fetch(url, { headers: cookie ? { cookie } : {}, redirect: "manual" });
    if (res.status !== 200) throw new Error(`${name}: ${url} answered ${res.status}`);
  }

  // The bare baseline runs the SQL the board route runs, on the same connection settings.
  const reviewerSql = (() => {
    let captured: Knex.Sql | null = null;
    const spy = knexOn(DB_NAME);
    spy.on("query", (q: Knex.Sql) => (captured ??= q));
    return { spy, get: () => captured };
  })();
  await getBoardReviewer(reviewerSql.spy, reviewerId);
  await reviewerSql.spy.destroy();
  const me = await getBoardReviewer(knex, reviewerId);
  const boardSql = buildBoardQuery(knex, boardQuerySchema.parse({}), 20, me?.centre ?? null)
    .toSQL()
    .toNative();
  const captured = reviewerSql.get()!;
  const cfg = knexConfig("app");
  writeFileSync(
    `${OUT}/bare-spec.json`,
    JSON.stringify({
      connection: { ...(cfg.connection as object), database: DB_NAME },
      reviewer: { sql: captured.sql, bindings: captured.bindings },
      board: boardSql,
      sort: "newest",
      limit: 20,
    }),
  );
  const bare = start(
    "bare",
    ["--import", "tsx", "tests/bench/bare-server.ts", String(PORTS.bare), `${OUT}/bare-spec.json`],
    process.env,
  );
  await waitFor(`http://127.0.0.1:${PORTS.bare}/`);
  const fromApp = await (
    await fetch(routes["board, first page"]![0], { headers: { cookie: reviewer } })
  ).text();
  const fromBare = await (await fetch(`http://127.0.0.1:${PORTS.bare}/`)).text();
  const constantBody = await (await fetch(`${A}/api/bench/constant`)).text();

  log(`load: ${CONNECTIONS} connections, ${SECONDS} s per route`);
  const loads: Record<string, Load> = {};
  let boardRss = 0;
  for (const [name, [url, cookie]] of Object.entries(routes)) {
    rss.reset();
    loads[name] = await measure(name, url, cookie);
    if (name.startsWith("board")) boardRss = Math.max(boardRss, rss.peak());
    await drain(A);
  }
  // The review workspace's autosave, on the reviewer's job that is in review.
  const reviewJob = await knex("jobs")
    .where({ reviewer_id: reviewerId, state: "in_review" })
    .first("id");
  if (reviewJob) {
    const readVersions = async () => {
      const state = await getReviewState(knex, { id: reviewerId, role: "reviewer" }, reviewJob.id);
      return Object.fromEntries(Object.entries(state.answers).map(([k, a]) => [k, a.version]));
    };
    loads["checklist autosave (PUT)"] = await measureAutosave(
      A,
      reviewer,
      Number(reviewJob.id),
      readVersions,
    );
    await drain(A);
  }
  await stopChild(appA).catch(() => undefined);
  // The bare baseline runs with the app stopped, as the app runs without it.
  loads["bare Node + mysql2 (limit)"] = await measure(
    "bare Node + mysql2 (limit)",
    `http://127.0.0.1:${PORTS.bare}/`,
  );
  await stopChild(bare);
  const board = loads["board, first page"]!;
  results.load = loads;
  results.responseBytes = {
    board: fromApp.length,
    bare: fromBare.length,
    constant: constantBody.length,
    sameJson: fromApp === fromBare,
  };
  results.ratios = {
    boardToFloor: +(board.rps / loads["constant JSON (floor)"]!.rps).toFixed(2),
    boardToBare: +(board.rps / loads["bare Node + mysql2 (limit)"]!.rps).toFixed(2),
    floorToBare: +(
      loads["constant JSON (floor)"]!.rps / loads["bare Node + mysql2 (limit)"]!.rps
    ).toFixed(2),
  };
  log(`ratios: ${JSON.stringify(results.ratios)}`);
  results.memory = { boardPeakRssMb: boardRss, peakRssMb: rss.peak() };
  rss.stop();

  results.boardPlans = await boardPlans(knex);

  // First-load JavaScript in Chromium, one instance, no load.
  const appA2 = await startApp(PORTS.a);
  const firstStep = (await knex("projects").where({ id: project.id }).first("id")).id;
  results.firstLoadJsKb = await firstLoadJs(A, jsPages(firstStep));

  // Scale-out: two app instances and two workers on one database.
  log("scale-out: a second app instance and two workers against the same database");
  const appB = await startApp(PORTS.b);
  const B = `http://127.0.0.1:${PORTS.b}`;
  const reviewerB = (await signInHttp(B, reviewerEmail, DEMO_PASSWORD)).cookie;
  await knex("email_outbox").whereNot({ status: "sent" }).del();
  const workerLogs: string[][] = [[], []];
  const workers = [0, 1].map((i) =>
    start(`worker${i}`, ["--import", "tsx", "lib/worker/main.ts"], appEnv(PORTS.a), workerLogs[i]),
  );
  const started = Date.now() + 60_000;
  while (!workerLogs.every((l) => l.some((x) => x.includes("started"))) && Date.now() < started)
    await sleep(250);
  await load(`${B}/api/board`, reviewerB, 2, 8);
  // Both workers are polling: make every task due at once and queue the e-mails while the load
  // runs, so the two race for each task lease and each outbox row.
  for (const l of workerLogs) l.length = 0;
  await knex("worker_schedule").del();
  const MAILS = 200;
  const loads2 = Promise.all([
    load(`${A}/api/board`, reviewer, SECONDS, CONNECTIONS / 2),
    load(`${B}/api/board`, reviewerB, SECONDS, CONNECTIONS / 2),
  ]);
  const stamp = Date.now();
  let firstOutboxId = Infinity;
  for (let i = 0; i < MAILS; i++) {
    await enqueueEmail(knex, {
      to: { address: `bench-${i}@bench.loopwright.test` },
      template: "verify_email",
      payload: { name: `Bench ${i}`, url: `${A}/verify-email?token=bench${i}` },
      dedupeKey: `bench:${stamp}:${i}`,
    });
    if (i === 0)
      firstOutboxId = Number(
        (
          await knex("email_outbox")
            .where({ dedupe_key: `bench:${stamp}:0` })
            .first("id")
        ).id,
      );
  }
  const [la, lb] = await loads2;
  const until = Date.now() + 60_000;
  while (Date.now() < until) {
    const [left] = await knex("email_outbox")
      .whereIn("status", ["pending", "sending"])
      .count({ n: "*" });
    if (Number(left!.n) === 0) break;
    await sleep(500);
  }
  await sleep(3000); // a last pass of each worker
  await Promise.all(workers.map(stopChild));
  const messages = (await (await fetch(`http://127.0.0.1:${PORTS.mail}/api/messages`)).json()) as {
    messageId: string | null;
  }[];
  const perOutbox = new Map<string, number>();
  for (const m of messages) {
    const id = /<outbox-(\d+)@/.exec(m.messageId ?? "")?.[1];
    if (id && Number(id) >= firstOutboxId) perOutbox.set(id, (perOutbox.get(id) ?? 0) + 1);
  }
  const taskRuns = Object.fromEntries(
    TASKS.map((t) => [
      t.name,
      workerLogs.flat().filter((l) => l.startsWith(`[worker] ${t.name}:`)).length,
    ]),
  );
  const combined = la.rps + lb.rps;
  results.scaleOut = {
    instanceA: la,
    instanceB: lb,
    combinedRps: combined,
    combinedToBare: +(combined / loads["bare Node + mysql2 (limit)"]!.rps).toFixed(2),
    emails: {
      queued: MAILS,
      delivered: perOutbox.size,
      sentTwice: [...perOutbox.values()].filter((n) => n > 1).length,
    },
    taskRuns,
    noTaskRanTwice: Object.values(taskRuns).every((n) => n <= 1),
    workers: workerLogs.map(
      (l) => l.filter((x) => /\] (mail|expire|credential|auto)/.test(x)).length,
    ),
  };
  log(`scale-out: ${JSON.stringify(results.scaleOut)}`);
  await Promise.all([stopChild(appA2), stopChild(appB)]);

  // Scaling, last: it rewrites the requests table.
  log("scaling: board median (one connection) at 1,000 / 10,000 / 100,000 open requests");
  const scaling: Record<string, unknown> = {};
  const reopen = async (n: number) => {
    if (n <= 20_000) {
      const cut = Math.round((n * 10) / 9);
      await knex.raw(
        `UPDATE requests SET status = IF(id <= ? AND id % 10 <> 0, 'open', 'expired')
         WHERE id > ? AND id <= ? AND status IN ('open', 'expired') AND id % 10 <> 0`,
        [BASE + cut, BASE, BASE + 20_000],
      );
    } else {
      // One project per request, so every request may be open at once.
      await knex.raw(
        `INSERT IGNORE INTO projects (id, owner_id, title, system, status, worst_level)
         SELECT ? + seq, ? + 1 + seq % ?, CONCAT('Bench project ', seq), '{}', 'ready', 'ok'
         FROM seq_1_to_${n}`,
        [BASE, HOMEOWNER_BASE, COUNTS.homeowners],
      );
      await knex.raw(
        `UPDATE requests SET project_id = id, status = 'open',
                expires_at = NOW(3) + INTERVAL (1 + id % 29) DAY
         WHERE id > ? AND id <= ?`,
        [BASE, BASE + n],
      );
    }
    await knex.raw("ANALYZE TABLE requests");
    const [c] = await knex("requests").where({ status: "open" }).count({ n: "*" });
    return Number(c!.n);
  };
  const appS = await startApp(PORTS.a);
  for (const n of [1_000, 10_000, 100_000]) {
    const open = await reopen(n);
    scaling[`open ${n}`] = { open, boardP50Ms: await median(`${A}/api/board`, reviewer) };
    log(`  ${open} open: board p50 ${JSON.stringify(scaling[`open ${n}`])}`);
  }
  const pages: Record<string, unknown> = {};
  for (const sort of ["newest", "budget", "distance", "soonest"]) {
    const q = `sort=${sort}`;
    const cursor = await pageCursor(A, reviewer, q, 200);
    pages[sort] = {
      page1P50Ms: await median(`${A}/api/board?${q}`, reviewer),
      page200P50Ms: cursor
        ? await median(`${A}/api/board?${q}&cursor=${encodeURIComponent(cursor)}`, reviewer)
        : "fewer than 200 pages",
    };
    log(`  ${sort}: ${JSON.stringify(pages[sort])}`);
  }
  scaling.pagesAt100k = pages;
  results.scaling = scaling;
  await stopChild(appS);
  await mail.close();
  await payments.close();
  await knex.destroy();

  results.finishedAt = new Date().toISOString();
  writeFileSync(`${OUT}/results.json`, JSON.stringify(results, null, 2));
  writeFileSync(`${OUT}/results.md`, table(results));
  console.log(`\n${table(results)}`);
  log(`written ${OUT}/results.json and ${OUT}/results.md`);
}

// ---------------------------------------------------------------- the table

function table(r: Record<string, unknown>): string {
  const loads = r.load as Record<string, Load>;
  const ratios = r.ratios as Record<string, number>;
  const { firstLoad: js, later } = r.firstLoadJsKb as {
    firstLoad: Record<string, number | string>;
    later: Record<string, number>;
  };
  const mem = r.memory as Record<string, number>;
  const so = r.scaleOut as Record<string, unknown> & { emails: Record<string, number> };
  const sc = r.scaling as Record<string, { open: number; boardP50Ms: number }> & {
    pagesAt100k: Record<string, { page1P50Ms: number; page200P50Ms: number | string }>;
  };
  const lc = r.loopCheck as Record<string, unknown>;
  const ds = r.dataset as { seconds: number; rows: Record<string, number> };
  const lines = [
    `# Bench run ${r.startedAt} (${(r.machine as { cpus: number }).cpus} cores)`,
    "",
    `Dataset: ${Object.entries(ds.rows)
      .map(([k, v]) => `${v} ${k}`)
      .join(", ")} in ${ds.seconds.toFixed(0)} s.`,
    `Loop check: median ${lc.exampleMedianUs} µs (example), ${lc.randomMedianUs} µs (random systems).`,
    "",
    `| route (${CONNECTIONS} connections) | req/s | p50 ms | p99 ms |`,
    "| --- | ---: | ---: | ---: |",
    ...Object.entries(loads).map(([k, v]) => `| ${k} | ${v.rps} | ${v.p50} | ${v.p99} |`),
    "",
    `Board ÷ floor ${ratios.boardToFloor}, board ÷ bare ${ratios.boardToBare}, floor ÷ bare ${ratios.floorToBare}.`,
    `Server memory: peak ${mem.boardPeakRssMb} MB under the board load, ${mem.peakRssMb} MB over the run.`,
    "",
    "| page | first-load JS, gzipped | loaded later |",
    "| --- | ---: | ---: |",
    ...Object.entries(js).map(
      ([k, v]) => `| ${k} | ${v}${typeof v === "number" ? " kB" : ""} | ${later[k]} kB |`,
    ),
    "",
    `Scale-out (2 app instances, 2 workers): ${so.combinedRps} req/s combined (${so.combinedToBare} of bare); ` +
      `${so.emails.delivered}/${so.emails.queued} e-mails delivered, ${so.emails.sentTwice} sent twice; ` +
      `task runs ${JSON.stringify(so.taskRuns)}.`,
    "",
    "| open requests | board p50 ms (1 connection) |",
    "| ---: | ---: |",
    ...Object.entries(sc)
      .filter(([k]) => k.startsWith("open"))
      .map(([, v]) => `| ${v.open} | ${v.boardP50Ms} |`),
    "",
    "| sort (100k open) | page 1 p50 ms | page 200 p50 ms |",
    "| --- | ---: | ---: |",
    ...Object.entries(sc.pagesAt100k).map(
      ([k, v]) => `| ${k} | ${v.page1P50Ms} | ${v.page200P50Ms} |`,
    ),
    "",
  ];
  return lines.join("\n");
}

// Stopped part-way (Ctrl-C, a timeout): take the servers down with the bench.
for (const signal of ["SIGINT", "SIGTERM"] as const)
  process.once(signal, () => {
    for (const c of children) if (c.exitCode === null) c.kill("SIGKILL");
    process.exit(130);
  });

try {
  await main();
} finally {
  for (const c of children) if (c.exitCode === null) c.kill("SIGTERM");
}
