/**
 * The homeowner pays on the payment fake's checkout page (a declining card first), the signed
 * webhook reaches the app's route, and the job page shows the money held. The webhook route
 * itself: a forged signature is a 400 and changes nothing; a replayed event is a 200 no-op.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Browser } from "playwright-core";
import type { Knex } from "knex";
import Stripe from "stripe";
import { formatMoney } from "@/lib/money";
import { launchBrowser } from "../support/browser";
import { testKnex, truncateAll } from "../support/db";
import { FIXTURE_PASSWORD, makeJob } from "../support/fixtures";
import { TEST_PAYMENT_KEYS } from "../support/fakes";
import { paymentsFakeControl } from "../support/payments";

const baseUrl = inject("baseUrl");

describe("paying into held funds in Chromium", () => {
  let browser: Browser;
  let knex: Knex;
  const fake = paymentsFakeControl(inject("paymentsUrl"), TEST_PAYMENT_KEYS.secretKey);
  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    // Job ids start again with the truncated database: so must the fake's idempotency keys.
    await fake.reset();
    await fake.config({ webhookUrl: `${baseUrl}/api/webhooks/payments` });
    browser = await launchBrowser();
  });
  afterAll(async () => {
    await browser?.close();
    await truncateAll(knex);
    await knex.destroy();
  });

  it("declined, then paid: the job page shows the payment held", async () => {
    const job = await makeJob(knex, "awaiting_payment", { priceMinor: 14_500 });
    const price = formatMoney(14_500, "GBP");
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    context.setDefaultTimeout(15_000);
    const page = await context.newPage();
    const log: string[] = [];
    page.on("console", (m) => log.push(`console ${m.type()}: ${m.text()}`));
    page.on("response", (r) => log.push(`${r.status()} ${r.url()}`));
    page.on("requestfailed", (r) => log.push(`failed ${r.url()} ${r.failure()?.errorText}`));
    await page.goto(`${baseUrl}/sign-in?callbackUrl=/jobs/${job.id}`);
    await page.getByLabel("E-mail").fill(job.homeowner.email);
    await page.getByLabel("Password").fill(FIXTURE_PASSWORD);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL(`**/jobs/${job.id}`);
    await page.getByRole("button", { name: `Pay ${price}` }).click();
    await page.waitForURL(/\/_fake\/checkout\//).catch(async (err) => {
      throw new Error(`${err}\n${await page.locator("main").innerText()}\n${log.join("\n")}`);
    });
    await page.getByRole("button", { name: "Use a declining card" }).click();
    await page.getByRole("alert").getByText("Card declined").waitFor();
    expect((await knex("jobs").where({ id: job.id }).first("state")).state).toBe(
      "awaiting_payment",
    );
    await page.getByRole("button", { name: "Pay with a test card" }).click();
    await page.waitForURL(`**/jobs/${job.id}?checkout=done`);
    await page.locator('[data-job-state="funded"]').waitFor();
    const money = page.getByTestId("job-money");
    await expect.poll(() => money.textContent()).toContain(`Held by Loopwright now${price}`);
    await page.screenshot({ path: "tests/e2e/screenshots/job-funded.png", fullPage: true });
    await fake.flush();
    const ledger = await knex("ledger_entries")
      .where({ job_id: job.id })
      .select("kind", "amount_minor");
    expect(ledger).toEqual([{ kind: "charge", amount_minor: 14_500 }]);
    await context.close();
  });

  it("the webhook route: a forged signature is 400; a signed replay is a 200 no-op", async () => {
    const job = await makeJob(knex, "awaiting_payment");
    const body = JSON.stringify({
      id: "evt_route_1",
      object: "event",
      type: "checkout.session.completed",
      data: {
        object: {
          id: "cs_route_1",
          object: "checkout.session",
          payment_status: "paid",
          payment_intent: "pi_route_1",
          amount_total: job.amountMinor,
          currency: "gbp",
          metadata: { jobId: String(job.id) },
        },
      },
    });
    const post = (signature: string) =>
      fetch(`${baseUrl}/api/webhooks/payments`, {
        method: "POST",
        headers: { "content-type": "application/json", "stripe-signature": signature },
        body,
      });
    const forged = await post(
      Stripe.webhooks.generateTestHeaderString({ payload: body, secret: "whsec_someone_else" }),
    );
    expect(forged.status).toBe(400);
    expect((await knex("jobs").where({ id: job.id }).first("state")).state).toBe(
      "awaiting_payment",
    );
    const signed = Stripe.webhooks.generateTestHeaderString({
      payload: body,
      secret: TEST_PAYMENT_KEYS.webhookSecret,
    });
    const first = await post(signed);
    expect(first.status).toBe(200);
    expect((await knex("jobs").where({ id: job.id }).first("state")).state).toBe("funded");
    const again = await post(signed);
    expect(again.status).toBe(200);
    expect(((await again.json()) as { outcome: string }).outcome).toBe("duplicate");
    expect(await knex("ledger_entries").where({ job_id: job.id })).toHaveLength(1);
  });
});
