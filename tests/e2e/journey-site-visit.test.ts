/**
 * Journey 6, from fixtures: a site visit with the homeowner's date window, paid on the payment
 * fake, the visit proposed inside the window by the reviewer and confirmed by the homeowner
 * (each side e-mailed with a calendar invitation), then the review delivered and read.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser } from "playwright-core";
import type { Knex } from "knex";
import { jobServices, type JobServices } from "@/lib/data/jobs";
import { env } from "@/lib/env";
import { wallTimeIn } from "@/lib/time";
import { launchBrowser, step } from "../support/browser";
import { testKnex, truncateAll } from "../support/db";
import { TEST_PAYMENT_KEYS } from "../support/fakes";
import { makeJob } from "../support/fixtures";
import {
  deliverThroughData,
  fundByCheckout,
  ledgerOf,
  mailbox,
  shot,
  signedInPage,
} from "../support/journey";
import { paymentsFakeControl } from "../support/payments";

const baseUrl = inject("baseUrl");

describe("a site visit from payment to the delivered report in Chromium", () => {
  let browser: Browser;
  let knex: Knex;
  let mail: ReturnType<typeof mailbox>;
  let svc: JobServices;
  const fake = paymentsFakeControl(inject("paymentsUrl"), TEST_PAYMENT_KEYS.secretKey);
  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    await fake.config({ webhookUrl: `${baseUrl}/api/webhooks/payments` });
    svc = jobServices({ pay: fake.client(), appUrl: baseUrl });
    mail = mailbox(knex);
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await truncateAll(knex);
    await knex.destroy();
  });

  it("6: proposed inside the window, confirmed, visited and reported", async () => {
    const job = await makeJob(knex, "awaiting_payment", { kind: "site_visit", priceMinor: 18_000 });
    await fundByCheckout(knex, job.homeowner, job.id, svc, fake);
    const title = (await knex("projects").where({ id: job.project.id }).first("title")).title;
    const req = await knex("requests")
      .where({ id: job.request.id })
      .first("window_start", "window_end");
    const firstDay = String(req.window_start).slice(0, 10);
    // Two days into the window, at 10:30 local time.
    const d = new Date(`${firstDay}T12:00:00Z`);
    d.setUTCDate(d.getUTCDate() + 2);
    const day = wallTimeIn(d, env().APP_TIME_ZONE).slice(0, 10);

    const rp = await signedInPage(browser, baseUrl, job.reviewer.email, `/jobs/${job.id}`);
    await step("the reviewer proposes a time inside the window", async () => {
      await rp.locator("h2", { hasText: /^Site visit$/ }).waitFor();
      const at = rp.getByLabel("Date and time of the visit");
      expect(await at.getAttribute("min")).toContain(firstDay);
      await at.fill(`${day}T10:30`);
      await rp.getByRole("button", { name: "Propose this time" }).click();
      await rp
        .getByRole("status")
        .getByText(/Proposed\./)
        .waitFor();
      const m = await mail.expectMail(job.homeowner.email, `Site visit proposed: ${title}`);
      expect(m.attachments.some((a) => a.filename.endsWith(".ics"))).toBe(true);
    });

    const hp = await signedInPage(browser, baseUrl, job.homeowner.email, `/jobs/${job.id}`);
    await step("the homeowner confirms it", async () => {
      const status = hp.getByTestId("visit-status");
      await status.getByText("Proposed, waiting for the homeowner to confirm").waitFor();
      await hp.getByRole("button", { name: "Confirm this time" }).click();
      await status.getByText("Confirmed", { exact: true }).waitFor();
      await mail.expectMail(job.homeowner.email, `Site visit confirmed: ${title}`);
      await mail.expectMail(job.reviewer.email, `Site visit confirmed: ${title}`);
      const row = await knex("jobs").where({ id: job.id }).first("visit_at");
      expect(row.visit_at).not.toBeNull();
      await shot(hp, "site-visit-confirmed");
    });

    await step("after the visit the reviewer delivers the report", async () => {
      await deliverThroughData(knex, job.reviewer, job.id, baseUrl);
      await mail.expectMail(job.homeowner.email, `Report delivered: ${title}`);
      expect(await ledgerOf(knex, job.id)).toEqual(["charge 18000"]);
    });

    await step("the homeowner reads the report", async () => {
      await hp.goto(`${baseUrl}/jobs/${job.id}/report`);
      await hp.locator('[data-outcome="fix_before_filling"]').waitFor();
      expect(await hp.getByTestId("required-changes").textContent()).toContain(
        "Fit a thermostatic mixing valve",
      );
      await shot(hp, "site-visit-report");
    });

    await step("after the install: the first-fill record against the design", async () => {
      await hp.goto(`${baseUrl}/jobs/${job.id}`);
      await hp.getByRole("link", { name: "The first-fill record" }).click();
      await hp.waitForURL(`**/projects/${job.project.id}/first-fill`);
      const ff = hp.getByRole("form", { name: "First-fill readings" });
      await ff.getByLabel("Cold fill pressure").fill("1.9");
      await ff.getByLabel(/Vessel pre-charge/).fill("1.2");
      await ff.getByLabel(/Glycol concentration/).fill("40");
      await ff.getByRole("button", { name: "Save the readings" }).click();
      await hp.getByRole("table", { name: "Readings against the design" }).waitFor();
      expect(await hp.locator('[data-compare="cold-fill"]').getAttribute("data-status")).toBe(
        "matches",
      );
      expect(await knex("first_fill_records").where({ job_id: job.id })).toHaveLength(1);
      await shot(hp, "site-visit-first-fill");
    });
    await rp.context().close();
    await hp.context().close();
  }, 120_000);
});
