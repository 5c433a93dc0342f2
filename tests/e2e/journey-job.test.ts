/**
 * The money-and-review journeys in Chromium, each from a fixture state, with the ledger and
 * the e-mails checked at each step:
 *  3. the homeowner compares two quotes, accepts one and pays on the fake's checkout page
 *     (the declining card first);
 *  4. the reviewer works the checklist (a pin dropped with the keyboard), asks for a missing
 *     photo, the homeowner answers with one, the reviewer delivers; the homeowner reads the
 *     report and releases the payment;
 *  5. the homeowner disputes a delivered report and the admin settles with a part refund.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser } from "playwright-core";
import type { Knex } from "knex";
import { jobServices, type JobServices } from "@/lib/data/jobs";
import { env } from "@/lib/env";
import { refundSplit, splitFee } from "@/lib/jobs";
import { formatMoney } from "@/lib/money";
import { launchBrowser, step } from "../support/browser";
import { testKnex, truncateAll } from "../support/db";
import { TEST_PAYMENT_KEYS } from "../support/fakes";
import {
  FIXTURE_PASSWORD,
  makeAdmin,
  makeHomeowner,
  makeJob,
  makeProject,
  makeQuote,
  makeRequest,
  makeReviewer,
} from "../support/fixtures";
import {
  answerThroughData,
  deliverThroughData,
  fundByCheckout,
  jobState,
  ledgerOf,
  mailbox,
  payOnCheckout,
  readyPayouts,
  shot,
  signedInPage,
  sketchPng,
} from "../support/journey";
import { paymentsFakeControl } from "../support/payments";
import { signInHttp } from "../support/session";
import { tinyPng, uploadViaApp } from "../support/uploads";

const baseUrl = inject("baseUrl");
const gbp = (minor: number) => formatMoney(minor, "GBP");

describe("quotes, payment, review, release and dispute in Chromium", () => {
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

  it("3: compares two quotes, accepts one, pays after a declined card", async () => {
    const owner = await makeHomeowner(knex, { displayName: "Mira Hale" });
    const project = await makeProject(knex, owner, { title: "Mill cottage loop" });
    const request = await makeRequest(knex, project);
    const cheap = await makeReviewer(knex, { displayName: "Ada Quill" });
    const dear = await makeReviewer(knex, { displayName: "Bea Marsh" });
    await makeQuote(knex, request, cheap, { priceMinor: 9_500, turnaroundDays: 5 });
    await makeQuote(knex, request, dear, { priceMinor: 14_000, turnaroundDays: 2 });
    const page = await signedInPage(browser, baseUrl, owner.email, `/requests/${request.id}`);

    await step("compare the quotes, sorted by price", async () => {
      const table = page.getByRole("table", { name: "Quotes" });
      await table.waitFor();
      expect(await table.locator("tbody tr").count()).toBe(2);
      await page.getByRole("button", { name: /^Price/ }).click();
      expect(await page.locator("th[aria-sort]").count()).toBe(1);
      await shot(page, "quote-comparison");
    });

    let jobId = 0;
    await step("accept the cheaper quote", async () => {
      await page
        .getByRole("button", { name: `Accept the quote from ${cheap.displayName} Heating` })
        .click();
      // The confirmation names the price, the reviewer and what happens next.
      const dialog = page.getByRole("dialog");
      await dialog.getByText("What happens next").waitFor();
      await dialog.getByRole("button", { name: /^Accept for / }).click();
      await page.waitForURL(/\/jobs\/\d+$/);
      jobId = Number(page.url().match(/jobs\/(\d+)/)![1]);
      await page.locator('[data-job-state="awaiting_payment"]').waitFor();
      expect(await ledgerOf(knex, jobId)).toEqual([]);
      await mail.expectMail(cheap.email, "Your quote for Mill cottage loop was accepted");
      await mail.expectMail(dear.email, "Your quote for Mill cottage loop was not chosen");
    });

    await step("pay on the checkout page: declined, then paid", async () => {
      await payOnCheckout(page, knex, jobId, gbp(9_500));
      await fake.flush();
      expect(await ledgerOf(knex, jobId)).toEqual(["charge 9500"]);
      const money = page.getByTestId("job-money");
      await expect.poll(() => money.textContent()).toContain(`Held by Loopwright now${gbp(9_500)}`);
      await mail.expectMail(owner.email, "Payment held for Mill cottage loop");
      await mail.expectMail(owner.email, /^Receipt .*: payment for Mill cottage loop$/);
      await shot(page, "job-funded");
    });
    await page.context().close();
  }, 90_000);

  it("4: the review with a keyboard pin, a question answered with a photo, delivery and release", async () => {
    const reviewer = await makeReviewer(knex, { displayName: "Sol Brook" });
    await readyPayouts(knex, reviewer, svc, fake);
    const owner = await makeHomeowner(knex, { displayName: "Tobin Ash" });
    const project = await makeProject(knex, owner, { title: "Hillside loop" });
    const { cookie } = await signInHttp(baseUrl, owner.email, FIXTURE_PASSWORD);
    const sketch = await sketchPng();
    const up = await uploadViaApp(
      baseUrl,
      cookie,
      "sketch",
      { projectId: project.id },
      {
        name: "sketch.png",
        type: "image/png",
        bytes: sketch,
      },
    );
    expect(up.putBody?.serverData?.ok).toBe(true);
    const job = await makeJob(knex, "awaiting_payment", { project, reviewer, priceMinor: 12_000 });
    await fundByCheckout(knex, owner, job.id, svc, fake);
    expect(await ledgerOf(knex, job.id)).toEqual(["charge 12000"]);

    const rp = await signedInPage(browser, baseUrl, reviewer.email, `/jobs/${job.id}`);
    await step("start the review", async () => {
      await rp.getByRole("link", { name: "Start the review" }).click();
      await rp.waitForURL(`**/jobs/${job.id}/review`);
      await rp.getByRole("button", { name: "Start the review" }).click();
      await expect.poll(() => jobState(knex, job.id)).toBe("in_review");
      await rp.reload();
      await mail.expectMail(owner.email, "Review started: Hillside loop");
    });

    await step("answer the checklist", async () => {
      // Most items are answered beforehand through the autosave's own function (the whole
      // checklist clicked through is tests/e2e/review.test.ts); the reviewer answers the rest.
      const inBrowser = ["scald", "vessel-rating", "relief-valve"];
      await answerThroughData(knex, reviewer, job.id, inBrowser);
      await rp.reload();
      for (const key of inBrowser)
        await rp
          .locator(`article[data-item="${key}"]`)
          .getByText(key === "scald" ? "Concern" : "Sound", { exact: true })
          .click();
      const total = await rp.locator("article[data-item]").count();
      await expect
        .poll(() => rp.getByTestId("progress").textContent())
        .toBe(`${total} of ${total} items answered`);
    });

    const scald = rp.locator('article[data-item="scald"]');
    await step("drop a pin with the keyboard", async () => {
      await scald.getByRole("button", { name: "Pin on the sketch or a photo" }).click();
      await scald.getByLabel("Label for the next pin").fill("Hot outlet");
      const target = scald.locator("[data-pin-keyboard]");
      await target.focus();
      // From the centre: three steps right (0.65) and five down (0.75).
      for (let i = 0; i < 3; i++) await rp.keyboard.press("ArrowRight");
      for (let i = 0; i < 5; i++) await rp.keyboard.press("ArrowDown");
      expect(await scald.getByTestId("crosshair-at").textContent()).toBe("65% across, 75% down");
      await rp.keyboard.press("Enter");
      await scald.locator('[data-pin="1"]').waitFor();
      await scald.getByText("✓ Saved").waitFor();
      await shot(rp, "review-workspace");
    });

    await step("ask the homeowner for a missing photo", async () => {
      const vessel = rp.locator('article[data-item="vessel-rating"]');
      await vessel.getByRole("button", { name: "Ask the homeowner for a photo or a fact" }).click();
      await vessel.getByText("A photo", { exact: true }).click();
      await vessel
        .getByLabel("What you need from the homeowner")
        .fill("Please send a photo of the vessel's rating plate.");
      await vessel.getByRole("button", { name: "Send the question" }).click();
      await vessel.getByText("Waiting for the homeowner.").waitFor();
      const m = await mail.expectMail(owner.email, "Your reviewer asks about Hillside loop");
      expect(mail.linkIn(m, `/projects/${project.id}`, baseUrl)).toContain("#reviewer-questions");
    });

    const hp = await signedInPage(browser, baseUrl, owner.email, `/projects/${project.id}`);
    await step("the homeowner uploads the photo and answers with it", async () => {
      await hp.getByLabel("Shows").selectOption("vessel");
      await hp.getByLabel("Photo caption").fill("Vessel rating plate");
      await hp
        .locator("#photo-file")
        .setInputFiles({ name: "plate.png", mimeType: "image/png", buffer: tinyPng() });
      await hp.waitForFunction(() => document.querySelectorAll('[data-file="photo"]').length === 1);
      await hp.reload();
      const questions = hp.locator("#reviewer-questions");
      await questions.getByText("about “Expansion vessel rating”").waitFor();
      await questions.getByLabel("Your answer").fill("Here is the plate.");
      await questions
        .getByLabel("A photo (optional)")
        .selectOption({ label: "Vessel rating plate" });
      await questions.getByRole("button", { name: "Send the answer" }).click();
      await questions.getByText(/✓ Answered/).waitFor();
      const tagged = await knex("attachment_items").where({ item_key: "vessel-rating" }).count({
        n: "*",
      });
      expect(Number(tagged[0]!.n)).toBe(1);
      await mail.expectMail(reviewer.email, "New message about Hillside loop");
    });

    await step("the reviewer sees the answer and delivers", async () => {
      await rp.reload();
      await rp
        .locator('article[data-item="vessel-rating"]')
        .getByTestId("item-answer")
        .getByText("Here is the plate.")
        .waitFor();
      const draft = rp.locator("#report-draft");
      await draft.getByText("Fix before filling", { exact: true }).click();
      await draft
        .getByLabel(/^Summary for the homeowner/)
        .fill("A sound design. Fit a mixing valve at the outlet before filling.");
      await draft.getByRole("button", { name: "Add a required change" }).click();
      await draft.getByLabel("Change 1: what to do").fill("Fit a thermostatic mixing valve.");
      await draft.getByLabel("Link change 1 to an item").selectOption("scald");
      await draft.getByText("✓ Everything needed is there.").waitFor();
      await draft.getByTestId("save-report").getByText("✓ Saved").waitFor();
      // signedInPage accepts every confirm dialog; one handler only, or the second throws.
      await draft.getByRole("button", { name: "Deliver the report" }).click();
      await rp.waitForURL(`**/jobs/${job.id}/report`);
      expect(await jobState(knex, job.id)).toBe("delivered");
      expect(await ledgerOf(knex, job.id)).toEqual(["charge 12000"]);
      await mail.expectMail(owner.email, "Report delivered: Hillside loop");
    });
    await rp.context().close();

    await step("the homeowner reads the report with the pin and releases", async () => {
      await hp.goto(`${baseUrl}/jobs/${job.id}/report`);
      await hp.locator('[data-outcome="fix_before_filling"]').waitFor();
      expect(await hp.locator('[data-pin="1"]').getAttribute("aria-label")).toBe(
        "Pin 1: Hot outlet",
      );
      expect(await hp.getByTestId("required-changes").textContent()).toContain(
        "Fit a thermostatic mixing valve",
      );
      await shot(hp, "report");
      await hp.getByRole("button", { name: "Release the payment" }).click();
      await hp.getByText("The payment is released to").waitFor();
      expect(await jobState(knex, job.id)).toBe("released");
      const { payoutMinor, feeMinor } = splitFee(12_000, env().PLATFORM_FEE_PERCENT);
      expect(await ledgerOf(knex, job.id)).toEqual([
        "charge 12000",
        `transfer ${payoutMinor}`,
        `fee ${feeMinor}`,
      ]);
      await mail.expectMail(reviewer.email, "Payment released for Hillside loop");
    });

    await step("rate the reviewer; the public profile shows it", async () => {
      await hp.goto(`${baseUrl}/jobs/${job.id}`);
      const form = hp.getByRole("form", { name: "Rate the reviewer" });
      await form.getByLabel("5 stars").check();
      await form.getByLabel(/Comment/).fill("Found the missing mixing valve before we filled.");
      await form.getByRole("button", { name: "Send the rating" }).click();
      await hp.getByTestId("job-rating").waitFor();
      await hp.goto(`${baseUrl}/reviewers/${reviewer.id}`);
      expect(await hp.getByTestId("profile-rating").innerText()).toMatch(
        /5 out of 5\s*from 1 rating/,
      );
    });
    await hp.context().close();
  }, 180_000);

  it("5: a dispute settled with a part refund; the ledger and the e-mails agree", async () => {
    const reviewer = await makeReviewer(knex, { displayName: "Kit Dispute" });
    await readyPayouts(knex, reviewer, svc, fake);
    const admin = await makeAdmin(knex);
    const owner = await makeHomeowner(knex);
    const project = await makeProject(knex, owner, { title: "Quarry house loop" });
    const job = await makeJob(knex, "awaiting_payment", { project, reviewer, priceMinor: 15_000 });
    await fundByCheckout(knex, owner, job.id, svc, fake);
    await deliverThroughData(knex, reviewer, job.id, baseUrl);

    const hp = await signedInPage(browser, baseUrl, owner.email, `/jobs/${job.id}`);
    await step("the homeowner opens a dispute", async () => {
      await hp
        .getByLabel("What is wrong")
        .fill("The report does not say how to size the vessel for my roof height.");
      await hp.getByRole("button", { name: "Open a dispute" }).click();
      await hp.locator('[data-job-state="disputed"]').waitFor();
      expect(await ledgerOf(knex, job.id)).toEqual(["charge 15000"]);
      await mail.expectMail(reviewer.email, "Dispute opened: Quarry house loop");
      await mail.expectMail(admin.email, "Dispute opened: Quarry house loop");
    });

    const refundMinor = 5_000;
    const split = refundSplit(15_000, refundMinor, env().PLATFORM_FEE_PERCENT);
    await step("the admin settles with a part refund", async () => {
      const ap = await signedInPage(browser, baseUrl, admin.email, "/admin/disputes");
      await ap.getByRole("link", { name: "Quarry house loop" }).click();
      await ap.waitForURL(`**/jobs/${job.id}`);
      await ap.getByLabel("Refund part, pay the rest to the reviewer").check();
      await ap.getByLabel(/^Part refund amount/).fill("50");
      await ap.getByLabel("Note to both sides").fill("Half the vessel question was unanswered.");
      await shot(ap, "admin-settle");
      await ap.getByRole("button", { name: "Settle", exact: true }).click();
      await ap.locator('[data-job-state="partially_refunded"]').waitFor();
      await ap.context().close();
    });

    await step("the ledger and the e-mails agree", async () => {
      await fake.flush();
      const rows = await ledgerOf(knex, job.id);
      expect(rows).toEqual([
        "charge 15000",
        `refund -${split.refundMinor}`,
        `transfer ${split.payoutMinor}`,
        `fee ${split.feeMinor}`,
      ]);
      expect(split.refundMinor + split.payoutMinor + split.feeMinor).toBe(15_000);
      const refundMail = await mail.expectMail(owner.email, "Refund for Quarry house loop");
      expect(refundMail.text).toContain(gbp(split.refundMinor));
      const receipt = await mail.expectMail(
        owner.email,
        /^Receipt .*: refund for Quarry house loop$/,
      );
      expect(receipt.text).toContain(gbp(split.refundMinor));
      await mail.expectMail(owner.email, "Dispute settled: Quarry house loop");
      await mail.expectMail(reviewer.email, "Dispute settled: Quarry house loop");
      await hp.reload();
      expect(await hp.getByTestId("job-money").innerText()).toContain(gbp(split.refundMinor));
      await shot(hp, "job-settled");
    });
    await hp.context().close();
  }, 120_000);
});
