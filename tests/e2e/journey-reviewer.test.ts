/**
 * Journey 2, from a wiped database: a reviewer signs up and confirms the address, fills in the
 * profile (with a site-visit centre), submits the credentials and uploads a document; the admin
 * verifies them; the reviewer sets up a payout account on the payment fake's page, filters the
 * board (by distance, then by kind), opens a request, quotes and sends a message. The e-mails
 * are read from the mail fake at each step.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser } from "playwright-core";
import type { Knex } from "knex";
import { REQUIRED_CREDENTIAL_KINDS } from "@/lib/credentials";
import { launchBrowser, step } from "../support/browser";
import { testKnex, truncateAll } from "../support/db";
import { TEST_PAYMENT_KEYS } from "../support/fakes";
import { makeAdmin, makeHomeowner, makeProject, makeRequest } from "../support/fixtures";
import { context, mailbox, shot, signedInPage, signUp, verifyEmail } from "../support/journey";
import { paymentsFakeControl } from "../support/payments";
import { tinyPdf } from "../support/uploads";

const baseUrl = inject("baseUrl");

describe("a reviewer's journey in Chromium", () => {
  let browser: Browser;
  let knex: Knex;
  let mail: ReturnType<typeof mailbox>;
  const fake = paymentsFakeControl(inject("paymentsUrl"), TEST_PAYMENT_KEYS.secretKey);
  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    await fake.config({ webhookUrl: `${baseUrl}/api/webhooks/payments` });
    mail = mailbox(knex);
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await truncateAll(knex);
    await knex.destroy();
  });

  it("2: signs up, is verified, sets up payouts, filters the board, quotes and messages", async () => {
    // Known state: an admin; three open requests, two of them site visits 15 and 250 km north
    // of the centre the reviewer will type (invented geography: 1° of latitude ≈ 111.2 km).
    const admin = await makeAdmin(knex);
    const owner = await makeHomeowner(knex);
    const project = await makeProject(knex, owner, { title: "Orchard barn loop" });
    // One open request per project: the site visits are on projects of their own.
    const near = await makeRequest(knex, await makeProject(knex, owner), {
      kind: "site_visit",
      siteLat: 51 + 15 / 111.2,
      siteLng: -2,
    });
    const far = await makeRequest(knex, await makeProject(knex, owner), {
      kind: "site_visit",
      siteLat: 51 + 250 / 111.2,
      siteLng: -2,
    });
    const remote = await makeRequest(knex, project, { kind: "remote_check" });
    const email = `rowan.${Date.now()}@example.test`;
    const inYear = new Date(Date.now() + 365 * 86_400_000).toISOString().slice(0, 10);
    const ctx = await context(browser);
    const page = await ctx.newPage();

    await step("sign up as a reviewer and confirm the address", async () => {
      await signUp(page, baseUrl, {
        name: "Rowan Journey",
        email,
        password: "rooftop-collector-42",
        reviewer: true,
      });
      await verifyEmail(page, baseUrl, mail, email);
    });

    await step("fill in the profile with a site-visit centre", async () => {
      await page.goto(`${baseUrl}/reviewer/profile`);
      await page.getByLabel("Trading name").fill("Rowan Journey Solar");
      await page.getByLabel("Years in the trade").fill("12");
      await page.getByLabel("Service region").selectOption("south-west");
      await page.getByLabel("Site-visit centre, latitude").fill("51");
      await page.getByLabel("Site-visit centre, longitude").fill("-2");
      await page.getByLabel("Travel radius").fill("100");
      await page
        .getByLabel("About your work")
        .fill("Solar thermal installs and design checks for twelve years.");
      await page.getByLabel("Flat-plate collectors").check();
      await page.getByRole("button", { name: "Save profile" }).click();
      await page.getByText("Profile saved.").waitFor();
    });

    await step("submit the credentials and upload a document", async () => {
      await page.goto(`${baseUrl}/reviewer/credentials`);
      for (const kind of REQUIRED_CREDENTIAL_KINDS) {
        await page.getByLabel("Kind").selectOption(kind);
        await page.getByLabel("Issued by").fill("Test Trade Body");
        await page.getByLabel("Certificate or policy number").fill(`RJ-${kind.slice(0, 6)}`);
        await page.getByLabel("Expiry date").fill(inYear);
        await page.getByRole("button", { name: "Submit for verification" }).click();
        await page.getByText("Credential submitted").waitFor();
        await page.reload();
      }
      await page.locator('input[type="file"]').first().setInputFiles({
        name: "insurance-certificate.pdf",
        mimeType: "application/pdf",
        buffer: tinyPdf(),
      });
      await page.getByText("Evidence uploaded.").waitFor();
      await shot(page, "reviewer-credentials");
    });

    await step("the admin verifies each credential from the queue", async () => {
      const ap = await signedInPage(
        browser,
        baseUrl,
        admin.email,
        "/admin/credentials?status=pending",
      );
      const rows = ap.locator("tbody tr[data-credential]");
      await rows.first().waitFor();
      expect(await rows.count()).toBe(REQUIRED_CREDENTIAL_KINDS.length);
      await shot(ap, "admin-credentials");
      for (let left = REQUIRED_CREDENTIAL_KINDS.length - 1; left >= 0; left--) {
        await ap.getByRole("button", { name: "Verify" }).first().click();
        await ap.waitForFunction(
          (n) => document.querySelectorAll("tbody tr[data-credential]").length === n,
          left,
        );
      }
      await ap.context().close();
      // Verifications in one sitting go out as one e-mail after a short wait (CREDENTIAL_BATCH_MS):
      // let the wait pass.
      await knex("email_outbox")
        .where({ template: "credential_verified", status: "pending" })
        .update({ next_attempt_at: knex.raw("CURRENT_TIMESTAMP(3)") });
      const subjects = await mail.subjects(email);
      expect(subjects.filter((s) => /credentials? verified/i.test(s))).toEqual([
        `${REQUIRED_CREDENTIAL_KINDS.length} credentials verified`,
      ]);
    });

    await step("set up the payout account on the payment fake's page", async () => {
      await page.goto(`${baseUrl}/reviewer/earnings`);
      await page.getByRole("button", { name: "Set up your payout account" }).click();
      await page.waitForURL(/\/_fake\/connect\//);
      await page.getByRole("button", { name: "Complete payout account setup" }).click();
      await page.waitForURL("**/reviewer/earnings?setup=done");
      await fake.flush();
      await page.reload();
      await page.getByText(/^Ready: payments for the reviews you deliver/).waitFor();
      const profile = await knex("reviewer_profiles as p")
        .join("users as u", "u.id", "p.user_id")
        .where("u.email", email)
        .first("p.payouts_enabled");
      expect(Boolean(profile.payouts_enabled)).toBe(true);
      await mail.expectMail(email, "Your payout account is ready");
    });

    await step("filter the board by distance", async () => {
      await page.goto(`${baseUrl}/board`);
      await page.locator("[data-board-item]").first().waitFor();
      await page.getByLabel("Site visits within (km)").fill("100");
      await page.getByLabel("Sort").selectOption("distance");
      await page.getByRole("button", { name: "Show requests" }).click();
      await page.waitForURL(/withinKm=100/);
      await page.locator(`[data-board-item="${near.id}"]`).waitFor();
      expect(await page.locator(`[data-board-item="${near.id}"]`).innerText()).toMatch(
        /15 km away/,
      );
      expect(await page.locator(`[data-board-item="${far.id}"]`).count()).toBe(0);
      await shot(page, "board-distance");
    });

    await step("filter by kind and open the remote check", async () => {
      await page.goto(`${baseUrl}/board?kind=remote_check`);
      const item = page.locator(`[data-board-item="${remote.id}"]`);
      await item.waitFor();
      expect(await page.locator(`[data-board-item="${near.id}"]`).count()).toBe(0);
      await item.getByRole("link", { name: "Remote design check" }).click();
      await page.waitForURL(`**/requests/${remote.id}`);
    });

    await step("quote, and the homeowner is e-mailed", async () => {
      await page.getByLabel("Price").fill("120");
      await page.getByLabel("Turnaround").fill("4");
      await page
        .getByLabel("What the review covers")
        .fill("**Checklist review** of the sketch and photos, with a written report.");
      await page.getByRole("button", { name: "Send quote" }).click();
      await page.getByText("Quote sent.").waitFor();
      const q = await knex("quotes")
        .where({ request_id: remote.id })
        .first("price_minor", "status");
      expect(q).toEqual({ price_minor: 12000, status: "live" });
      await mail.expectMail(owner.email, "New quote for Orchard barn loop");
    });

    await step("send a message, and the homeowner is e-mailed", async () => {
      await page.reload();
      await page
        .getByRole("textbox", { name: /^Message/ })
        .fill("Could you add a photo of the vessel?");
      await page.getByRole("button", { name: "Send message" }).click();
      await page
        .locator("[data-message]", { hasText: "Could you add a photo of the vessel?" })
        .waitFor();
      await mail.expectMail(owner.email, "New message about Orchard barn loop");
      await shot(page, "request-quoted");
    });
    await ctx.close();
  }, 150_000);
});
