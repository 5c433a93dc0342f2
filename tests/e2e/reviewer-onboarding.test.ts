import { CREDENTIAL_BATCH_MS } from "@/lib/data/notify";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser } from "playwright-core";
import type { Knex } from "knex";
import { mkdirSync } from "node:fs";
import { seedDemo, DEMO_PASSWORD, DEMO_USERS } from "@/db/seeds/demo";
import { sendBatch } from "@/lib/worker/mail";
import { REQUIRED_CREDENTIAL_KINDS } from "@/lib/credentials";
import { launchBrowser } from "../support/browser";
import { testKnex, truncateAll } from "../support/db";
import { MAIL_FROM, mailFake } from "../support/mail";
import { tinyPdf } from "../support/uploads";

const baseUrl = inject("baseUrl");
const shots = "tests/e2e/screenshots";

describe("a reviewer signs up, is verified by an admin, and gets the board", () => {
  let browser: Browser;
  let knex: Knex;
  const fake = mailFake();
  const email = `new.reviewer.${Date.now()}@example.test`;
  const inYear = new Date(Date.now() + 365 * 86_400_000).toISOString().slice(0, 10);

  beforeAll(async () => {
    mkdirSync(shots, { recursive: true });
    knex = testKnex();
    await truncateAll(knex);
    await seedDemo(knex);
    // The demo's own e-mails are not this journey's: start from an empty outbox and mailbox.
    await knex("email_outbox").del();
    await fake.reset();
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await truncateAll(knex);
    await knex.destroy();
  });

  it("goes from sign-up to the request board", async () => {
    const reviewer = await browser.newContext({ viewport: { width: 1200, height: 900 } });
    reviewer.setDefaultTimeout(15_000);
    const page = await reviewer.newPage();

    // Sign up as a reviewer; a weak password is refused beside its field first.
    await page.goto(`${baseUrl}/sign-up?as=reviewer`);
    await page.getByLabel("Your name").fill("Rowan Test");
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill("short");
    await page.getByRole("button", { name: "Create reviewer account" }).click();
    await expect(page.locator("#f-password-error").textContent()).resolves.toMatch(/at least 10/);
    await page.getByLabel("Password").fill("rooftop-collector-42");
    await page.getByRole("button", { name: "Create reviewer account" }).click();
    await page.waitForURL("**/reviewer/profile");

    // The verification e-mail goes out through the outbox and the SMTP fake; its link confirms the address.
    await sendBatch(knex, fake.transport(), MAIL_FROM, "e2e");
    const [mail] = await fake.messages(email);
    expect(mail?.subject).toBe("Confirm your e-mail address");
    const link = mail!.links.find((l) => l.includes("/verify-email?token="))!;
    await page.goto(link.replace(/^https?:\/\/[^/]+/, baseUrl));
    await page.getByRole("button", { name: "Confirm my address" }).click();
    await page.waitForURL("**/verify-email?done=1");

    // Profile.
    await page.goto(`${baseUrl}/reviewer/profile`);
    await page.getByLabel("Trading name").fill("Rowan Solar Test");
    await page.getByLabel("Years in the trade").fill("12");
    await page.getByLabel("Service region").selectOption("wales");
    await page
      .getByLabel("About your work")
      .fill("Solar thermal installs and design checks for twelve years.");
    await page.getByLabel("Flat-plate collectors").check();
    await page.getByRole("button", { name: "Save profile" }).click();
    await page.getByText("Profile saved.").waitFor();

    // Credentials: the required kinds.
    await page.goto(`${baseUrl}/reviewer/credentials`);
    for (const kind of REQUIRED_CREDENTIAL_KINDS) {
      await page.getByLabel("Kind").selectOption(kind);
      await page.getByLabel("Issued by").fill("Test Trade Body");
      await page.getByLabel("Certificate or policy number").fill(`RST-${kind.slice(0, 6)}`);
      await page.getByLabel("Expiry date").fill(inYear);
      await page.getByRole("button", { name: "Submit for verification" }).click();
      await page.getByText("Credential submitted").waitFor();
      await page.reload();
    }
    expect(await page.locator('[data-status="pending"]').count()).toBe(
      REQUIRED_CREDENTIAL_KINDS.length,
    );

    // Upload the document behind one of them through the upload SDK (our styled file input).
    await page.locator('input[type="file"]').first().setInputFiles({
      name: "insurance-certificate.pdf",
      mimeType: "application/pdf",
      buffer: tinyPdf(),
    });
    await page.getByText("Evidence uploaded.").waitFor();
    await page.reload();
    expect(await page.getByRole("link", { name: "View the uploaded document" }).count()).toBe(1);
    await page.screenshot({ path: `${shots}/reviewer-credentials.png`, fullPage: true });
    await page.goto(`${baseUrl}/dashboard`);
    expect(await page.getByRole("link", { name: "Request board" }).count()).toBe(0);

    // The admin verifies each one from the queue.
    const adminContext = await browser.newContext({ viewport: { width: 1400, height: 900 } });
    adminContext.setDefaultTimeout(15_000);
    const admin = await adminContext.newPage();
    await admin.goto(`${baseUrl}/sign-in`);
    await admin.getByLabel("E-mail").fill(DEMO_USERS.admin.email);
    await admin.getByLabel("Password").fill(DEMO_PASSWORD);
    await admin.getByRole("button", { name: "Sign in" }).click();
    await admin.waitForURL("**/dashboard");
    await admin.goto(`${baseUrl}/admin/credentials?status=pending&q=Rowan`);
    await admin.screenshot({ path: `${shots}/admin-queue.png`, fullPage: true });
    // The admin sees the evidence inline before deciding.
    const evidenceHref = await admin
      .getByRole("link", { name: "View evidence" })
      .first()
      .getAttribute("href");
    const evidence = await admin.request.get(`${baseUrl}${evidenceHref}`);
    expect(evidence.status()).toBe(200);
    expect(evidence.headers()["content-type"]).toBe("application/pdf");
    expect(await admin.locator("tbody tr[data-credential]").count()).toBe(
      REQUIRED_CREDENTIAL_KINDS.length,
    );
    for (let left = REQUIRED_CREDENTIAL_KINDS.length - 1; left >= 0; left--) {
      await admin.getByRole("button", { name: "Verify" }).first().click();
      // Verified rows leave the pending queue as soon as the action has run.
      await admin.waitForFunction(
        (n) => document.querySelectorAll("tbody tr[data-credential]").length === n,
        left,
      );
    }
    expect(await admin.locator("tbody tr[data-credential]").count()).toBe(0);

    // The reviewer now has the board.
    await page.goto(`${baseUrl}/dashboard`);
    await page.getByRole("link", { name: "Request board" }).click();
    await page.waitForURL("**/board");
    await expect(page.getByRole("heading", { name: "Request board" }).count()).resolves.toBe(1);
    await page.screenshot({ path: `${shots}/reviewer-board.png`, fullPage: true });

    // And the verification e-mails reached the reviewer.
    // Verified in one sitting: one e-mail lists them all, once the batch window has passed.
    const later = new Date(Date.now() + CREDENTIAL_BATCH_MS + 1000);
    await sendBatch(knex, fake.transport(), MAIL_FROM, "e2e", 20, later);
    const verified = (await fake.messages(email)).filter((m) =>
      /credentials? verified/i.test(m.subject),
    );
    expect(verified).toHaveLength(1);
    expect(verified[0]!.text.match(/is verified until/g)).toHaveLength(
      REQUIRED_CREDENTIAL_KINDS.length,
    );
    await reviewer.close();
    await adminContext.close();
  }, 120_000);
});
