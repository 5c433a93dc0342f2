/**
 * Small helpers the journeys share: sign in through the form, deliver and read the e-mails
 * through the mail fake, pay on the payment fake's checkout page, and save screenshots.
 *
 * Screenshots go to tests/e2e/screenshots/ (git-ignored). With SCREENSHOTS_DIR set
 * (`npm run screenshots` sets docs/screenshots), only the few named in DOC_SHOTS are written,
 * viewport-sized and palette-compressed, for the README.
 */
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import type { Knex } from "knex";
import type { Browser, BrowserContext, Page } from "playwright-core";
import sharp from "sharp";
import { expect } from "vitest";
import { sendBatch } from "@/lib/worker/mail";
import type { Actor } from "@/lib/data/actor";
import { startCheckout, syncCheckout, type JobServices } from "@/lib/data/jobs";
import { startPayoutSetup } from "@/lib/data/payments";
import {
  deliverReport,
  getReviewWorkspace,
  saveAnswer,
  saveReportDraft,
  startJobReview,
} from "@/lib/data/review";
import type { paymentsFakeControl } from "./payments";
import { openContext } from "./browser";
import { FIXTURE_PASSWORD } from "./fixtures";
import { MAIL_FROM, mailFake } from "./mail";

/** The phone the layout checks use (CSS pixels). */
export const PHONE = { width: 390, height: 844 } as const;

/** The screens `npm run screenshots` keeps in docs/screenshots/ for the README. */
export const DOC_SHOTS = new Set([
  "loop-check-project",
  "quote-comparison",
  "review-workspace",
  "report",
  "phone-project",
  "phone-report",
]);

const docsDir = process.env.SCREENSHOTS_DIR;
const shotsDir = path.resolve(docsDir ?? "tests/e2e/screenshots");

/** Save a screenshot of the page under `name` (desktop or phone, as the page's context is). */
export async function shot(page: Page, name: string): Promise<void> {
  if (docsDir) {
    if (!DOC_SHOTS.has(name)) return;
    mkdirSync(shotsDir, { recursive: true });
    const png = await page.screenshot({ fullPage: false });
    const small = await sharp(png)
      .png({ palette: true, quality: 70, compressionLevel: 9 })
      .toBuffer();
    writeFileSync(path.join(shotsDir, `${name}.png`), small);
    return;
  }
  mkdirSync(shotsDir, { recursive: true });
  await page.screenshot({ path: path.join(shotsDir, `${name}.png`), fullPage: true });
}

/** A recorded context (see openContext), desktop unless `phone`. */
export function context(browser: Browser, phone = false): Promise<BrowserContext> {
  return openContext(
    browser,
    phone ? { viewport: PHONE, isMobile: true, hasTouch: true, deviceScaleFactor: 1 } : {},
  );
}

/** Sign in through the sign-in form and land on `to` (the dashboard unless told). */
export async function signIn(
  page: Page,
  baseUrl: string,
  email: string,
  to = "/dashboard",
  password = FIXTURE_PASSWORD,
): Promise<void> {
  await page.goto(`${baseUrl}/sign-in?callbackUrl=${encodeURIComponent(to)}`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(`**${to}`);
}

/** A new context signed in as `email` with a page on `to`. */
export async function signedInPage(
  browser: Browser,
  baseUrl: string,
  email: string,
  to = "/dashboard",
  o: { phone?: boolean; password?: string } = {},
): Promise<Page> {
  const ctx = await context(browser, o.phone);
  const page = await ctx.newPage();
  page.on("dialog", (d) => void d.accept());
  await signIn(page, baseUrl, email, to, o.password);
  return page;
}

/**
 * The e-mails: `deliver()` sends what the outbox holds through the SMTP fake (as the worker
 * does), `subjects(to)` lists what reached an address, `link(to, subject, baseUrl)` returns
 * the first link of the newest matching message, pointed at the app under test.
 */
export function mailbox(knex: Knex) {
  const fake = mailFake();
  const deliver = () => sendBatch(knex, fake.transport(), MAIL_FROM, "e2e-journey", 100);
  return {
    fake,
    deliver,
    async subjects(to: string): Promise<string[]> {
      await deliver();
      return (await fake.messages(to)).map((m) => m.subject);
    },
    /** Delivers, then expects a message to `to` whose subject matches, and returns it. */
    async expectMail(to: string, subject: RegExp | string) {
      await deliver();
      const all = await fake.messages(to);
      const m = all.find((x) =>
        typeof subject === "string" ? x.subject === subject : subject.test(x.subject),
      );
      expect(
        m,
        `an e-mail "${subject}" to ${to}; got ${all.map((x) => x.subject).join(" | ")}`,
      ).toBeDefined();
      return m!;
    },
    /** The message's link containing `part`, rewritten to the app under test. */
    linkIn(m: { links: string[] }, part: string, baseUrl: string): string {
      const l = m.links.find((x) => x.includes(part));
      expect(l, `a link with ${part} in ${m.links.join(" ")}`).toBeDefined();
      return l!.replace(/^https?:\/\/[^/]+/, baseUrl);
    },
  };
}

/** A small drawn loop sketch (collector, pipe, cylinder) as a PNG, for pins and screenshots. */
export function sketchPng(width = 900, height = 600): Promise<Buffer> {
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 900 600">
<rect width="900" height="600" fill="#f8fafc"/>
<polygon points="60,200 380,60 380,90 60,230" fill="#94a3b8"/>
<rect x="120" y="95" width="200" height="90" fill="#1e3a5f" transform="rotate(-23 220 140)"/>
<path d="M330 110 L520 110 L520 420 L600 420" stroke="#b45309" stroke-width="8" fill="none"/>
<path d="M300 160 L480 160 L480 470 L600 470" stroke="#2563eb" stroke-width="8" fill="none"/>
<rect x="600" y="330" width="150" height="220" rx="30" fill="#e2e8f0" stroke="#334155" stroke-width="6"/>
<circle cx="490" cy="320" r="26" fill="#dc2626"/>
<text x="640" y="590" font-size="22" font-family="sans-serif" fill="#334155">cylinder</text>
<text x="70" y="270" font-size="22" font-family="sans-serif" fill="#334155">collectors</text>
<text x="400" y="330" font-size="22" font-family="sans-serif" fill="#334155">vessel</text>
</svg>`;
  return sharp(Buffer.from(svg)).png().toBuffer();
}

/** The ledger rows of a job, oldest first, as `kind amount`. */
export async function ledgerOf(knex: Knex, jobId: number): Promise<string[]> {
  const rows = await knex("ledger_entries")
    .where({ job_id: jobId })
    .orderBy("id")
    .select("kind", "amount_minor");
  return rows.map((r) => `${r.kind} ${r.amount_minor}`);
}

/** The job's state now. */
export async function jobState(knex: Knex, jobId: number): Promise<string> {
  return (await knex("jobs").where({ id: jobId }).first("state")).state as string;
}

/**
 * On the job page: press Pay, on the fake's checkout page try the declining card (the page
 * says so and the job stays unpaid), then pay with the test card and come back funded.
 */
export async function payOnCheckout(page: Page, knex: Knex, jobId: number, price: string) {
  await page.getByRole("button", { name: `Pay ${price}` }).click();
  await page.waitForURL(/\/_fake\/checkout\//);
  await page.getByRole("button", { name: "Use a declining card" }).click();
  await page.getByRole("alert").getByText("Card declined").waitFor();
  expect(await jobState(knex, jobId)).toBe("awaiting_payment");
  await page.getByRole("button", { name: "Pay with a test card" }).click();
  await page.waitForURL(`**/jobs/${jobId}?checkout=done`);
  await page.locator('[data-job-state="funded"]').waitFor();
}

/** The sign-up form; returns once the account exists. */
export async function signUp(
  page: Page,
  baseUrl: string,
  who: { name: string; email: string; password: string; reviewer?: boolean },
) {
  await page.goto(`${baseUrl}/sign-up${who.reviewer ? "?as=reviewer" : ""}`);
  await page.getByLabel("Your name").fill(who.name);
  await page.getByLabel("E-mail").fill(who.email);
  await page.getByLabel("Password").fill(who.password);
  await page
    .getByRole("button", { name: who.reviewer ? "Create reviewer account" : "Create account" })
    .click();
  await page.waitForURL(who.reviewer ? "**/reviewer/profile" : "**/dashboard");
}

/** Opens the verification link from the mail fake and confirms the address. */
export async function verifyEmail(
  page: Page,
  baseUrl: string,
  mail: ReturnType<typeof mailbox>,
  email: string,
) {
  const m = await mail.expectMail(email, "Confirm your e-mail address");
  await page.goto(mail.linkIn(m, "/verify-email?token=", baseUrl));
  await page.getByRole("button", { name: "Confirm my address" }).click();
  await page.waitForURL("**/verify-email?done=1");
}

/**
 * A job funded the way a homeowner funds it: a checkout session paid with the test card on the
 * payment fake, then the app's own sync (the webhook may come too; it then changes nothing).
 */
export async function fundByCheckout(
  knex: Knex,
  owner: Actor,
  jobId: number,
  svc: JobServices,
  fake: ReturnType<typeof paymentsFakeControl>,
) {
  await fake.payCheckout(await startCheckout(knex, owner, jobId, svc), "ok");
  await syncCheckout(knex, owner, jobId, svc);
  await fake.flush();
  expect(await jobState(knex, jobId)).toBe("funded");
}

/**
 * Answers every checklist item of a job in review but those in `skip`, through the function the
 * workspace's autosave calls: sound, or a concern for `concernKey`. Returns the workspace as
 * it was before.
 */
export async function answerThroughData(
  knex: Knex,
  reviewer: Actor,
  jobId: number,
  skip: readonly string[] = [],
  concernKey = "scald",
) {
  const ws = await getReviewWorkspace(knex, reviewer, jobId);
  for (const item of ws.items) {
    if (skip.includes(item.key)) continue;
    await saveAnswer(knex, reviewer, jobId, item.key, {
      verdict: item.key === concernKey ? "concern" : "sound",
      noteMd: item.key === concernKey ? "No mixing valve shown at the outlet." : "",
      expectedVersion: ws.answers[item.key]?.version ?? 0,
    });
  }
  return ws;
}

/**
 * A funded job reviewed and delivered through the review functions (as the demo seed does):
 * every item sound but `concernKey`, a summary, one required change.
 */
export async function deliverThroughData(
  knex: Knex,
  reviewer: Actor,
  jobId: number,
  appUrl: string,
  concernKey = "scald",
) {
  await startJobReview(knex, reviewer, jobId);
  const ws = await answerThroughData(knex, reviewer, jobId, [], concernKey);
  await saveReportDraft(knex, reviewer, jobId, {
    outcome: "fix_before_filling",
    summaryMd: "Sound apart from one item: fit a mixing valve before filling.",
    requiredChanges: [{ text: "Fit a thermostatic mixing valve.", itemKeys: [concernKey] }],
    expectedVersion: ws.draft.version,
  });
  await deliverReport(knex, reviewer, jobId, appUrl);
  expect(await jobState(knex, jobId)).toBe("delivered");
}

/** The reviewer's payout account, set up on the payment fake's page (as a reviewer would). */
export async function readyPayouts(
  knex: Knex,
  reviewer: Actor,
  svc: JobServices,
  fake: ReturnType<typeof paymentsFakeControl>,
) {
  await knex("reviewer_profiles")
    .where({ user_id: reviewer.id })
    .update({ payment_account_id: null, payouts_enabled: false });
  const setup = new URL(await startPayoutSetup(knex, reviewer, svc));
  await fetch(`${fake.base}${setup.pathname}`, {
    method: "POST",
    body: new URLSearchParams({ link: setup.searchParams.get("link")!, action: "complete" }),
    redirect: "manual",
  });
  await fake.flush();
  await expect
    .poll(async () =>
      Boolean(
        (await knex("reviewer_profiles").where({ user_id: reviewer.id }).first("payouts_enabled"))
          .payouts_enabled,
      ),
    )
    .toBe(true);
}
