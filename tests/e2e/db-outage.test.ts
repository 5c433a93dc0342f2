/**
 * The database going away under a running app, without touching the shared MariaDB server: a
 * second instance of the built app reaches MariaDB through a TCP relay (tests/support/tcp-cut.ts)
 * that the test cuts and restores. While cut: health says down, pages answer 503 with a plain
 * message, JSON routes 503 with a message, actions answer in words, nothing answers 500. Once the
 * relay is back, the same process (no restart) serves again by itself.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Knex } from "knex";
import { knexConfig } from "@/knexfile";
import { testKnex, truncateAll } from "../support/db";
import { TEST_PORTS } from "../support/fakes";
import { FIXTURE_PASSWORD, makeHomeowner, makeReviewer } from "../support/fixtures";
import { signInHttp } from "../support/session";
import { startTcpCut, type TcpCut } from "../support/tcp-cut";
import { callAction, form } from "../support/actions-http";

const PORT = TEST_PORTS.app + 200;
const base = `http://127.0.0.1:${PORT}`;
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function waitFor(check: () => Promise<boolean>, ms: number): Promise<number> {
  const started = Date.now();
  while (Date.now() - started < ms) {
    if (await check().catch(() => false)) return Date.now() - started;
    await sleep(200);
  }
  throw new Error(`not within ${ms} ms`);
}

describe("database outage", () => {
  let knex: Knex;
  let relay: TcpCut;
  let app: ChildProcess;
  let home: string;
  let sol: string;

  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    const h = await makeHomeowner(knex);
    const r = await makeReviewer(knex);
    const c = knexConfig("test").connection as { host: string; port: number };
    relay = await startTcpCut({ host: c.host, port: c.port });
    app = spawn(
      process.execPath,
      ["node_modules/next/dist/bin/next", "start", "-H", "127.0.0.1", "-p", String(PORT)],
      {
        env: {
          ...process.env,
          DB_TARGET: "test",
          DB_NAME: process.env.DB_TEST_NAME ?? "loopwright_test",
          DB_PORT: String(relay.port),
          APP_URL: base,
          SMTP_PORT: String(TEST_PORTS.mailSmtp),
          UPLOADTHING_INGEST_URL: `http://127.0.0.1:${TEST_PORTS.upload}`,
          STRIPE_API_HOST: "127.0.0.1",
          STRIPE_API_PORT: String(TEST_PORTS.payments),
          STRIPE_API_PROTOCOL: "http",
          NEXT_TELEMETRY_DISABLED: "1",
        },
        stdio: ["ignore", "ignore", "ignore"],
      },
    );
    await waitFor(async () => (await fetch(`${base}/api/health`)).status === 200, 60_000);
    home = (await signInHttp(base, h.email, FIXTURE_PASSWORD)).cookie;
    sol = (await signInHttp(base, r.email, FIXTURE_PASSWORD)).cookie;
    expect(home).toContain("session-token");
  }, 120_000);

  afterAll(async () => {
    app?.kill("SIGTERM");
    await relay?.close();
    await truncateAll(knex);
    await knex.destroy();
  });

  it("answers 503 in words while cut, never 500, and recovers by itself when the database is back", async () => {
    void inject("baseUrl"); // the shared app keeps running on its own connection throughout
    const pid = app.pid;
    expect((await fetch(`${base}/dashboard`, { headers: { cookie: home } })).status).toBe(200);

    await relay.cut();

    const health = await fetch(`${base}/api/health`);
    expect(health.status).toBe(503);
    expect(await health.json()).toMatchObject({ database: "down", status: "degraded" });

    for (const [path, cookie] of [
      ["/dashboard", home],
      ["/settings/notifications", home],
      ["/board", sol],
      ["/", undefined],
    ] as const) {
      const res = await fetch(`${base}${path}`, {
        redirect: "manual",
        headers: cookie ? { cookie } : {},
      });
      expect(res.status, path).toBe(503);
      expect(res.headers.get("retry-after")).toBeTruthy();
      expect(await res.text()).toContain("briefly unavailable");
    }

    for (const [method, path, cookie] of [
      ["GET", "/api/board", sol],
      ["GET", "/api/files/1", home],
      ["POST", "/api/requests/1/messages", sol],
    ] as const) {
      const res = await fetch(`${base}${path}`, {
        method,
        headers: { cookie, "content-type": "application/json" },
        body: method === "POST" ? JSON.stringify({ body: "Still there?" }) : undefined,
      });
      expect(res.status, path).toBe(503);
      expect(await res.json()).toMatchObject({
        error: expect.stringMatching(/briefly unavailable/),
      });
    }

    const act = await callAction(
      base,
      "components/settings/actions.ts#saveNotificationSettings",
      [{ ok: false }, form({ notifyNewMessage: "on" })],
      { cookie: home, path: "/settings/notifications" },
    );
    expect(act.status).toBeLessThan(500);
    expect(act.value).toMatchObject({
      ok: false,
      message: expect.stringMatching(/briefly unavailable/),
    });

    // A burst of requests across the cut and the restore: each is answered, none with a 500.
    const statuses: number[] = [];
    const burst = Array.from({ length: 30 }, async (_x, i) => {
      await sleep(i * 50);
      const res = await fetch(`${base}${i % 2 ? "/api/board" : "/dashboard"}`, {
        redirect: "manual",
        headers: { cookie: i % 2 ? sol : home },
      });
      statuses.push(res.status);
      await res.arrayBuffer();
    });
    await sleep(700);
    await relay.restore();
    await Promise.all(burst);
    expect(statuses.filter((s) => s >= 500 && s !== 503)).toEqual([]);

    const recoveredMs = await waitFor(
      async () => (await fetch(`${base}/api/health`)).status === 200,
      20_000,
    );
    expect((await fetch(`${base}/dashboard`, { headers: { cookie: home } })).status).toBe(200);
    expect((await fetch(`${base}/api/board`, { headers: { cookie: sol } })).status).toBe(200);
    const again = await callAction(
      base,
      "components/settings/actions.ts#saveNotificationSettings",
      [{ ok: false }, form({ notifyNewMessage: "on" })],
      { cookie: home, path: "/settings/notifications" },
    );
    expect(again.value).toMatchObject({ ok: true });
    // The same process: it came back by itself.
    expect(app.pid).toBe(pid);
    expect(app.exitCode).toBeNull();
    console.log(`db outage: recovered ${recoveredMs} ms after the relay came back`);
  }, 90_000);
});
