/**
 * Receipts: one for every charge and refund, as a page's data and an e-mail, with the real SDK
 * against the payment fake and the real MariaDB. Amounts are checked against CLDR's en-GB
 * currency format (Unicode CLDR, as Node's ICU ships it): 12,345 pence is "£123.45".
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Knex } from "knex";
import {
  cancelJobWithRefund,
  jobServices,
  openDispute,
  settleDispute,
  startCheckout,
  transitionJob,
  type JobServices,
} from "@/lib/data/jobs";
import { startPayoutSetup } from "@/lib/data/payments";
import { getReceipt, listReceipts } from "@/lib/data/receipts";
import { renderEmail } from "@/lib/mail/templates";
import { testKnex, truncateAll } from "../support/db";
import { makeAdmin, makeHomeowner, makeJob, makeReviewer } from "../support/fixtures";
import { paymentsFakeControl, startWebhookReceiver } from "../support/payments";
import { TEST_PAYMENT_KEYS, TEST_PORTS } from "../support/fakes";
import { refusalOf } from "../support/status";

describe("receipts", () => {
  let knex: Knex;
  let receiver: Awaited<ReturnType<typeof startWebhookReceiver>>;
  let svc: JobServices;
  const fake = paymentsFakeControl(inject("paymentsUrl"), TEST_PAYMENT_KEYS.secretKey);

  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    receiver = await startWebhookReceiver(() => testKnex(), TEST_PAYMENT_KEYS.webhookSecret);
    await fake.reset();
    await fake.config({ webhookUrl: receiver.url });
    svc = jobServices({ pay: fake.client(), appUrl: "http://app.test" });
  });
  afterAll(async () => {
    await fake.config({ webhookUrl: `http://127.0.0.1:${TEST_PORTS.app}/api/webhooks/payments` });
    await receiver.close();
    await truncateAll(knex);
    await knex.destroy();
  });

  async function paidJob(priceMinor: number) {
    const reviewer = await makeReviewer(knex);
    await knex("reviewer_profiles")
      .where({ user_id: reviewer.id })
      .update({ payment_account_id: null, payouts_enabled: false });
    const u = new URL(await startPayoutSetup(knex, reviewer, svc));
    await fetch(`${fake.base}${u.pathname}`, {
      method: "POST",
      body: new URLSearchParams({ link: u.searchParams.get("link")!, action: "complete" }),
      redirect: "manual",
    });
    const job = await makeJob(knex, "awaiting_payment", { priceMinor, reviewer });
    await knex("jobs").where({ id: job.id }).update({ checkout_session_id: null });
    await fake.payCheckout(await startCheckout(knex, job.homeowner, job.id, svc));
    await fake.flush();
    return job;
  }

  const receiptMails = async (jobId: number) =>
    (await knex("email_outbox").where({ template: "receipt" }).orderBy("id").select("*"))
      .map((m) => ({
        ...m,
        payload: typeof m.payload === "string" ? JSON.parse(m.payload) : m.payload,
      }))
      .filter((m) => m.payload.url.includes(`/jobs/${jobId}/`));

  it("a payment and its refund each get a receipt, on the page and by e-mail, once", async () => {
    const job = await paidJob(12_345);
    let receipts = await listReceipts(knex, job.homeowner, job.id);
    expect(receipts).toHaveLength(1);
    expect(receipts[0]).toMatchObject({
      kind: "payment",
      amountMinor: 12_345,
      currency: "GBP",
      payerEmail: job.homeowner.email,
      refundOf: null,
    });
    expect(receipts[0]!.providerRef).toMatch(/^pi_/);
    let mails = await receiptMails(job.id);
    expect(mails).toHaveLength(1);
    expect(Number(mails[0].to_user_id)).toBe(job.homeowner.id);
    expect(mails[0].payload).toMatchObject({
      what: "Payment",
      number: receipts[0]!.number,
      amount: "£123.45",
      url: `http://app.test/jobs/${job.id}/receipts/${receipts[0]!.ledgerId}`,
    });
    const rendered = await renderEmail("receipt", mails[0].payload);
    expect(rendered.text).toContain("Payment: £123.45");
    expect(rendered.subject).toContain(receipts[0]!.number);

    // A redelivered webhook writes no second receipt.
    const ev = (await fake.events("checkout.session.completed")).find((e) =>
      JSON.stringify(e.event).includes(`"jobId":"${job.id}"`),
    )!;
    await fake.redeliver(ev.event.id);
    await fake.flush();
    expect(await receiptMails(job.id)).toHaveLength(1);

    await cancelJobWithRefund(knex, job.homeowner, job.id, svc);
    receipts = await listReceipts(knex, job.homeowner, job.id);
    expect(receipts.map((r) => [r.kind, r.amountMinor])).toEqual([
      ["payment", 12_345],
      ["refund", 12_345],
    ]);
    expect(receipts[1]!.refundOf).toBe(receipts[0]!.number);
    expect(receipts[1]!.providerRef).toMatch(/^re_/);
    mails = await receiptMails(job.id);
    expect(mails.map((m) => [m.payload.what, m.payload.amount])).toEqual([
      ["Payment", "£123.45"],
      ["Refund", "£123.45"],
    ]);
  });

  it("a part refund in a settlement has its own receipt for that part", async () => {
    const job = await paidJob(20_001);
    await transitionJob(knex, job.reviewer, job.id, "startReview");
    await transitionJob(knex, job.reviewer, job.id, "deliver");
    await openDispute(knex, job.homeowner, job.id, {
      reason: "Half of the questions were not answered at all.",
    });
    await settleDispute(
      knex,
      await makeAdmin(knex),
      job.id,
      { resolution: "partial_refund", refundMinor: 5_050 },
      svc,
    );
    const receipts = await listReceipts(knex, job.homeowner, job.id);
    expect(receipts.map((r) => [r.kind, r.amountMinor])).toEqual([
      ["payment", 20_001],
      ["refund", 5_050],
    ]);
    expect((await receiptMails(job.id)).map((m) => m.payload.amount)).toEqual([
      "£200.01",
      "£50.50",
    ]);
  });

  it("only the homeowner who paid and admins see receipts; other ids are 404", async () => {
    const job = await paidJob(5_000);
    const [receipt] = await listReceipts(knex, job.homeowner, job.id);
    expect((await getReceipt(knex, job.homeowner, job.id, receipt!.ledgerId)).number).toBe(
      receipt!.number,
    );
    expect((await listReceipts(knex, await makeAdmin(knex), job.id)).length).toBe(1);
    expect((await refusalOf(listReceipts(knex, job.reviewer, job.id))).status).toBe(404);
    expect((await refusalOf(listReceipts(knex, await makeHomeowner(knex), job.id))).status).toBe(
      404,
    );
    expect((await refusalOf(getReceipt(knex, job.homeowner, job.id, 999_999))).status).toBe(404);
    // A ledger row of another job is not this job's receipt.
    const other = await paidJob(5_100);
    const [theirs] = await listReceipts(knex, other.homeowner, other.id);
    expect(
      (await refusalOf(getReceipt(knex, job.homeowner, job.id, theirs!.ledgerId))).status,
    ).toBe(404);
    // An unknown job is 404 too.
    expect((await refusalOf(listReceipts(knex, job.homeowner, 999_999))).status).toBe(404);
  });
});
