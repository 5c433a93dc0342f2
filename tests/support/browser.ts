import { mkdir, writeFile } from "node:fs/promises";
import path from "node:path";
import { onTestFailed } from "vitest";
import {
  chromium,
  type Browser,
  type BrowserContext,
  type BrowserContextOptions,
} from "playwright-core";

/** Debian's Chromium, headless, with the flags this machine needs (no network beyond loopback). */
export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? "/usr/bin/chromium",
    headless: true,
    args: [
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
      "--disable-dev-shm-usage",
    ],
  });
}

/** Where a failing browser test leaves what it saw (git-ignored). */
export const FAILURES_DIR = path.resolve("tests/e2e/failures");

const slug = (s: string) =>
  s
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/^-|-$/g, "")
    .slice(0, 80);

/**
 * A browser context for one test, desktop-sized unless told otherwise, that records the console,
 * failed requests and 4xx/5xx answers, and keeps a Playwright trace. When the test fails it
 * writes, under tests/e2e/failures/<test>/, a screenshot and the HTML of every open page, the
 * log, and trace.zip (open it with `npx playwright-core show-trace` or trace.playwright.dev
 * offline copy). Call it inside the test, so the failure hook belongs to that test.
 */
export async function openContext(
  browser: Browser,
  options: BrowserContextOptions = {},
): Promise<BrowserContext> {
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 }, ...options });
  context.setDefaultTimeout(15_000);
  const log: string[] = [];
  const at = () => new Date().toISOString().slice(11, 23);
  context.on("console", (m) => log.push(`${at()} console.${m.type()}: ${m.text()}`));
  context.on("weberror", (e) => log.push(`${at()} page error: ${e.error().message}`));
  context.on("requestfailed", (r) =>
    log.push(`${at()} request failed: ${r.method()} ${r.url()} ${r.failure()?.errorText ?? ""}`),
  );
  context.on("response", (r) => {
    if (r.status() >= 400) log.push(`${at()} ${r.status()} ${r.request().method()} ${r.url()}`);
  });
  await context.tracing.start({ screenshots: true, snapshots: true });
  onTestFailed(async ({ task }) => {
    const dir = path.join(FAILURES_DIR, slug(`${task.suite?.name ?? ""} ${task.name}`));
    await mkdir(dir, { recursive: true });
    await writeFile(path.join(dir, "log.txt"), log.join("\n") + "\n");
    for (const [i, page] of context.pages().entries()) {
      await page
        .screenshot({ path: path.join(dir, `page-${i}.png`), fullPage: true })
        .catch(() => {});
      const html = await page.content().catch(() => "");
      await writeFile(path.join(dir, `page-${i}.html`), `<!-- ${page.url()} -->\n${html}`);
    }
    await context.tracing.stop({ path: path.join(dir, "trace.zip") }).catch(() => {});
    console.error(`Browser state of the failed test saved in ${path.relative(".", dir)}/`);
  });
  return context;
}

/**
 * One named step of a journey: if it fails, the error says which step, so a red test reads
 * "step 'pay with the declining card': …" instead of a bare locator timeout.
 */
export async function step<T>(name: string, run: () => Promise<T>): Promise<T> {
  try {
    return await run();
  } catch (error) {
    if (error instanceof Error) error.message = `step '${name}': ${error.message}`;
    throw error;
  }
}
