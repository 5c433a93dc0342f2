/**
 * Starts the built app (next start) on a test port against the test database for the browser
 * and HTTP tests, and stops it afterwards. `npm test` builds the app before vitest runs.
 * Set E2E_BASE_URL to test a server that is already running instead.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { existsSync } from "node:fs";
import type { TestProject } from "vitest/node";
import { startMailFake } from "../../mocks/mail/server";
import { startUploadFake } from "../../mocks/uploads/server";

// The test stack uses its own ports so it can run beside `npm start`; TEST_PORT_OFFSET shifts
// them all, so two checkouts can run their suites on one machine at once.
const OFFSET = Number(process.env.TEST_PORT_OFFSET ?? 0);
const PORT = Number(process.env.E2E_PORT ?? 3100 + OFFSET);
const MAIL_SMTP_PORT = 2526 + OFFSET;
const MAIL_HTTP_PORT = 2581 + OFFSET;
const UPLOAD_PORT = 2591 + OFFSET;

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
  const mail = await startMailFake({
    smtpPort: MAIL_SMTP_PORT,
    httpPort: MAIL_HTTP_PORT,
    dir: ".data/mail-test",
  });
  project.provide("mailUrl", `http://127.0.0.1:${MAIL_HTTP_PORT}`);
  project.provide("smtpPort", MAIL_SMTP_PORT);
  const uploads = await startUploadFake({ port: UPLOAD_PORT, dir: ".data/uploads-test" });
  project.provide("uploadUrl", `http://127.0.0.1:${UPLOAD_PORT}`);
  if (process.env.E2E_BASE_URL) {
    project.provide("baseUrl", process.env.E2E_BASE_URL);
    return async () => {
      await mail.close();
      await uploads.close();
    };
  }
  if (!existsSync(".next/BUILD_ID")) {
    throw new Error("No production build: run `npx next build` first (npm test does this).");
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
        SMTP_PORT: String(MAIL_SMTP_PORT),
        MAIL_FAKE_URL: `http://127.0.0.1:${MAIL_HTTP_PORT}`,
        UPLOADTHING_INGEST_URL: `http://127.0.0.1:${UPLOAD_PORT}`,
        NEXT_TELEMETRY_DISABLED: "1",
      },
      stdio: ["ignore", "ignore", "inherit"],
    },
  );
  const baseUrl = `http://127.0.0.1:${PORT}`;
  await waitFor(`${baseUrl}/api/health`, 30_000);
  project.provide("baseUrl", baseUrl);
  return async () => {
    child.kill("SIGTERM");
    await mail.close();
    await uploads.close();
  };
}

declare module "vitest" {
  export interface ProvidedContext {
    baseUrl: string;
    mailUrl: string;
    smtpPort: number;
    uploadUrl: string;
  }
}
