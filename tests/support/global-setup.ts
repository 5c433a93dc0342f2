/**
 * Global setup for the e2e project: starts the built app (next start) on a test port against the
 * test database, with the mail, upload and payment fakes, for the browser and HTTP tests, and stops them
 * afterwards. `npm test` builds the app before vitest runs.
 * Set E2E_BASE_URL to test a server that is already running instead.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { existsSync } from "node:fs";
import type { TestProject } from "vitest/node";
import { acquireMailFake, acquirePaymentsFake, acquireUploadFake, TEST_PORTS } from "./fakes";

async function waitFor(url: string, ms: number): Promise<void> {
  const until = Date.now() + ms;
  while (Date.now() < until) {
    try {
      const res = await fetch(url);
      if (res.status < 500) return;
    } catch {
      // not up yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`${url} did not answer within ${ms} ms`);
}

export default async function setup(project: TestProject) {
  if (!process.env.E2E_BASE_URL && !existsSync(".next/BUILD_ID")) {
    throw new Error("No production build: run `npx next build` first (npm test does this).");
  }
  const PORT = TEST_PORTS.app;
  const leaveMail = await acquireMailFake();
  const leaveUploads = await acquireUploadFake().catch(async (e) => {
    await leaveMail();
    throw e;
  });
  const leavePayments = await acquirePaymentsFake().catch(async (e) => {
    await leaveMail();
    await leaveUploads();
    throw e;
  });
  const stopFakes = async () => {
    await leaveMail();
    await leaveUploads();
    await leavePayments();
  };
  project.provide("mailUrl", `http://127.0.0.1:${TEST_PORTS.mailHttp}`);
  project.provide("smtpPort", TEST_PORTS.mailSmtp);
  project.provide("uploadUrl", `http://127.0.0.1:${TEST_PORTS.upload}`);
  project.provide("paymentsUrl", `http://127.0.0.1:${TEST_PORTS.payments}`);
  if (process.env.E2E_BASE_URL) {
    project.provide("baseUrl", process.env.E2E_BASE_URL);
    return stopFakes;
  }
  const child: ChildProcess = spawn(
    process.execPath,
    ["node_modules/next/dist/bin/next", "start", "-H", "127.0.0.1", "-p", String(PORT)],
    {
      env: {
        ...process.env,
        DB_TARGET: "test",
        DB_NAME: process.env.DB_TEST_NAME ?? "loopwright_test",
        APP_URL: `http://127.0.0.1:${PORT}`,
        SMTP_PORT: String(TEST_PORTS.mailSmtp),
        MAIL_FAKE_URL: `http://127.0.0.1:${TEST_PORTS.mailHttp}`,
        UPLOADTHING_INGEST_URL: `http://127.0.0.1:${TEST_PORTS.upload}`,
        STRIPE_API_HOST: "127.0.0.1",
        STRIPE_API_PORT: String(TEST_PORTS.payments),
        STRIPE_API_PROTOCOL: "http",
        NEXT_TELEMETRY_DISABLED: "1",
      },
      stdio: ["ignore", "ignore", "inherit"],
    },
  );
  const baseUrl = `http://127.0.0.1:${PORT}`;
  try {
    await waitFor(`${baseUrl}/api/health`, 30_000);
  } catch (e) {
    child.kill("SIGTERM");
    await stopFakes();
    throw e;
  }
  project.provide("baseUrl", baseUrl);
  return async () => {
    child.kill("SIGTERM");
    await stopFakes();
  };
}
