/**
 * A site visit arranged in Chromium: the reviewer proposes a time inside the homeowner's window
 * on the job page (a day outside it is refused beside the field), the homeowner confirms it,
 * and both calendar invitations — read from the mail fake and parsed with ical.js — carry the
 * same UID, the second with a higher SEQUENCE (RFC 5546 §2.1.4). The homeowner's receipt page
 * prints the payment through Intl.NumberFormat.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import type { Knex } from "knex";
import ICAL from "ical.js";
import { formatMoney } from "@/lib/money";
import { wallTimeIn } from "@/lib/time";
import { sendBatch } from "@/lib/worker/mail";
import { launchBrowser } from "../support/browser";
import { testKnex, truncateAll } from "../support/db";
import {
  FIXTURE_PASSWORD,
  makeHomeowner,
  makeJob,
  makeProject,
  makeRequest,
  makeReviewer,
} from "../support/fixtures";
import { signInHttp } from "../support/session";
import { MAIL_FROM, mailFake } from "../support/mail";

const baseUrl = inject("baseUrl");
const TZ = "Europe/London";

function icsOf(text: string) {
  const cal = new ICAL.Component(ICAL.parse(text) as unknown[]);
  const event = new ICAL.Event(cal.getFirstSubcomponent("vevent")!);
  return { uid: event.uid, sequence: event.sequence, start: event.startDate.toJSDate() };
}

describe("arranging a site visit in Chromium", () => {
  let browser: Browser;
  let knex: Knex;
  const mail = mailFake();
  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    await mail.reset();
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await truncateAll(knex);
    await knex.destroy();
  });

  async function signedIn(email: string, path: string): Promise<Page> {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    context.setDefaultTimeout(20_000);
    const page = await context.newPage();
    await page.goto(`${baseUrl}/sign-in?callbackUrl=${encodeURIComponent(path)}`);
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill(FIXTURE_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL(`**${path}`);
    return page;
  }

  async function invitation(address: string, subject: RegExp) {
    await sendBatch(knex, mail.transport(), MAIL_FROM, "e2e-visit", 50);
    const m = (await mail.messages(address)).find((x) => subject.test(x.subject));
    expect(m, `${subject} to ${address}`).toBeDefined();
    const file = m!.attachments.find((a) => a.filename.endsWith(".ics"))!;
    return icsOf(file.content);
  }

  it("proposed by the reviewer, confirmed by the homeowner, with both invitations", async () => {
    const job = await makeJob(knex, "funded", { kind: "site_visit", priceMinor: 18_000 });
    await knex("ledger_entries").insert({
      job_id: job.id,
      kind: "charge",
      amount_minor: 18_000,
      currency: "GBP",
      provider_ref: "pi_e2e_visit",
      idempotency_key: `job-${job.id}-charge`,
    });
    const req = await knex("requests").where({ id: job.request.id }).first("window_end");
    const lastDay = String(req.window_end).slice(0, 10);
    const day = wallTimeIn(new Date(Date.now() + 5 * 86_400_000), TZ).slice(0, 10);
    const when = `${day}T10:30`;

    const reviewer = await signedIn(job.reviewer.email, `/jobs/${job.id}`);
    await reviewer.getByRole("heading", { name: "Site visit", exact: true }).waitFor();
    expect(await reviewer.getByTestId("visit-caution").innerText()).toMatch(
      /scaffold or a tower[\s\S]*never from a ladder alone/,
    );
    // A day after the window: refused beside the field, nothing saved. (The input's own max
    // would stop the browser first, so it is lifted to show the server's answer.)
    const at = reviewer.getByLabel("Date and time of the visit");
    await at.evaluate((el) => el.removeAttribute("max"));
    const after = new Date(`${lastDay}T12:00:00Z`);
    after.setUTCDate(after.getUTCDate() + 1);
    await at.fill(`${after.toISOString().slice(0, 10)}T10:00`);
    await reviewer.getByRole("button", { name: "Propose this time" }).click();
    await reviewer.getByText(/Pick a day inside the homeowner's window/).waitFor();
    expect((await knex("jobs").where({ id: job.id }).first("visit_at")).visit_at).toBeNull();

    await at.fill(when);
    await reviewer.getByLabel("Note for the homeowner (optional)").fill("I bring a tower.");
    await reviewer.getByRole("button", { name: "Propose this time" }).click();
    await reviewer
      .getByRole("status")
      .getByText(/Proposed\./)
      .waitFor();
    const first = await invitation(job.homeowner.email, /Site visit proposed/);
    expect(first.sequence).toBe(1);

    const home = await signedIn(job.homeowner.email, `/jobs/${job.id}`);
    const status = home.getByTestId("visit-status");
    await status.getByText("Proposed, waiting for the homeowner to confirm").waitFor();
    expect(await status.innerText()).toContain("10:30");
    await home.getByRole("button", { name: "Confirm this time" }).click();
    await status.getByText("Confirmed", { exact: true }).waitFor();
    await home.getByText(/Site visit confirmed for .*10:30/).waitFor();
    await home.screenshot({
      path: "tests/e2e/screenshots/site-visit-confirmed.png",
      fullPage: true,
    });

    for (const who of [job.homeowner.email, job.reviewer.email]) {
      const c = await invitation(who, /Site visit confirmed/);
      expect(c.uid).toBe(first.uid);
      expect(c.sequence).toBe(2);
      expect(c.start.toISOString()).toBe(first.start.toISOString());
    }

    // The receipt for the payment, from the job page's link.
    await home.getByRole("link", { name: "Receipts" }).click();
    await home.waitForURL(`**/jobs/${job.id}/receipts`);
    expect(await home.getByTestId("receipt-amount").innerText()).toBe(formatMoney(18_000, "GBP"));
    await home.getByRole("button", { name: /Print all or save as PDF/ }).waitFor();
    await home.context().close();
    await reviewer.context().close();
  });

  it("a reviewer without a ready payout account is told beside the quote form and on the board", async () => {
    const request = await makeRequest(knex, await makeProject(knex, await makeHomeowner(knex)));
    const notReady = await makeReviewer(knex);
    await knex("reviewer_profiles")
      .where({ user_id: notReady.id })
      .update({ payment_account_id: null, payouts_enabled: false });
    const ready = await makeReviewer(knex);
    await knex("reviewer_profiles").where({ user_id: ready.id }).update({ payouts_enabled: true });
    const html = async (email: string, path: string) => {
      const { cookie } = await signInHttp(baseUrl, email, FIXTURE_PASSWORD);
      const res = await fetch(`${baseUrl}${path}`, { headers: { cookie } });
      expect(res.status).toBe(200);
      return { text: await res.text(), cookie };
    };
    const notice = /payment can only be released to you once your payout account is\s+set up/;
    for (const path of [`/requests/${request.id}`, "/board"]) {
      const page = await html(notReady.email, path);
      expect(page.text).toMatch(notice);
      expect(page.text).toMatch(/href="\/reviewer\/earnings"[^>]*>Set up your payout account/);
      expect((await html(ready.email, path)).text).not.toMatch(notice);
    }
    // The link opens a real page.
    const { cookie } = await signInHttp(baseUrl, notReady.email, FIXTURE_PASSWORD);
    const earnings = await fetch(`${baseUrl}/reviewer/earnings`, { headers: { cookie } });
    expect(earnings.status).toBe(200);
  });
});
