/**
 * Faults that must lose nothing, with the real stripe SDK against the payment fake and the real
 * MariaDB: the service hanging while a checkout, a transfer or a refund is made (before doing it,
 * and after doing it with the answer lost), and the app down between the payment and its webhook.
 * Each hang ends in a plain message within the client's timeout, leaves the job as it was, and a
 * retry with the same idempotency key moves the money once.
 */
import { afterAll, beforeAll, beforeEach, describe, expect, inject, it } from "vitest";
import type { Knex } from "knex";
import {
  cancelJobWithRefund,
  jobServices,
  releaseJob,
  startCheckout,
  syncCheckout,
  transitionJob,
  type JobServices,
} from "@/lib/data/jobs";
import { reconcile, startPayoutSetup } from "@/lib/data/payments";
import { testKnex, truncateAll } from "../support/db";
import { makeAdmin, makeJob, makeReviewer, type ReviewerFixture } from "../support/fixtures";
import { paymentsFakeControl, startWebhookReceiver } from "../support/payments";
import { TEST_PAYMENT_KEYS, TEST_PORTS } from "../support/fakes";
import { refusalOf } from "../support/status";

/** The test client's timeout; the app's own is 10 s (lib/payments/client.ts). */
const TIMEOUT_MS = 700;

describe("payment faults", () => {
  let knex: Knex;
  let receiver: Awaited<ReturnType<typeof startWebhookReceiver>>;
  let svc: JobServices;
  /** Gives up after TIMEOUT_MS and does not retry by itself: the person clicks again. */
  let impatient: JobServices;
  const fake = paymentsFakeControl(inject("paymentsUrl"), TEST_PAYMENT_KEYS.secretKey);

  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    receiver = await startWebhookReceiver(() => testKnex(), TEST_PAYMENT_KEYS.webhookSecret);
    await fake.reset();
    await fake.config({ webhookUrl: receiver.url });
    svc = jobServices({ pay: fake.client(), appUrl: "http://app.test" });
    impatient = jobServices({
      pay: fake.client({ timeout: TIMEOUT_MS, maxNetworkRetries: 0 }),
      appUrl: "http://app.test",
    });
  });
  beforeEach(async () => {
    await fake.faults({ fail: 0, hang: 0, hangAfter: 0, dropWebhooks: 0 });
  });
  afterAll(async () => {
    await fake.config({ webhookUrl: `http://127.0.0.1:${TEST_PORTS.app}/api/webhooks/payments` });
    await receiver.close();
    await truncateAll(knex);
    await knex.destroy();
  });

  const state = async (id: number) => (await knex("jobs").where({ id }).first("state")).state;
  const ledgerOf = async (id: number) =>
    (
      await knex("ledger_entries")
        .where({ job_id: id })
        .orderBy("id")
        .select("kind", "amount_minor")
    ).map((r) => `${r.kind} ${r.amount_minor}`);

  async function readyReviewer(): Promise<ReviewerFixture> {
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
    await fake.flush();
    return reviewer;
  }

  /** A job awaiting payment with no checkout session yet, so the first call is the create. */
  async function unpaidJob(priceMinor = 12_000) {
    const job = await makeJob(knex, "awaiting_payment", {
      priceMinor,
      reviewer: await readyReviewer(),
    });
    await knex("jobs").where({ id: job.id }).update({ checkout_session_id: null });
    return job;
  }

  async function paidJob(priceMinor = 12_000) {
    const job = await unpaidJob(priceMinor);
    await fake.payCheckout(await startCheckout(knex, job.homeowner, job.id, svc));
    await fake.flush();
    expect(await state(job.id)).toBe("funded");
    return job;
  }

  /** The call's refusal and how long it took to come. */
  async function timed(p: Promise<unknown>) {
    const t0 = Date.now();
    const r = await refusalOf(p);
    return { r, ms: Date.now() - t0 };
  }

  const callsTo = async (path: string) =>
    (await fake.requests()).filter((r) => r.method === "POST" && r.path === path);

  it("checkout creation hanging: a plain message within the timeout; the retry makes one session with the same key", async () => {
    const job = await unpaidJob();
    await fake.faults({ hang: 1 });
    const { r, ms } = await timed(startCheckout(knex, job.homeowner, job.id, impatient));
    expect(r.status).toBe(503);
    expect(r.message).toMatch(/did not answer while starting the payment\. Nothing has changed/);
    expect(ms).toBeLessThan(TIMEOUT_MS + 2_000);
    expect(await knex("jobs").where({ id: job.id }).first("state", "checkout_attempts")).toEqual({
      state: "awaiting_payment",
      checkout_attempts: 0,
    });

    // The service made the session but its answer was lost: the retry replays it.
    await fake.faults({ hangAfter: 1 });
    expect((await refusalOf(startCheckout(knex, job.homeowner, job.id, impatient))).status).toBe(
      503,
    );
    const url = await startCheckout(knex, job.homeowner, job.id, svc);
    const creates = (await callsTo("/v1/checkout/sessions")).filter((c) =>
      c.idempotencyKey?.startsWith(`job-${job.id}-`),
    );
    expect(creates.map((c) => [c.idempotencyKey, c.fault, c.replayed])).toEqual([
      [`job-${job.id}-checkout-1`, "hang", false],
      [`job-${job.id}-checkout-1`, "hang_after", false],
      [`job-${job.id}-checkout-1`, null, true],
    ]);
    await fake.payCheckout(url);
    await fake.flush();
    expect(await state(job.id)).toBe("funded");
    expect(await ledgerOf(job.id)).toEqual(["charge 12000"]);
  });

  it("a transfer hanging after the service made it: the job stays delivered; the retry replays it, one transfer", async () => {
    const job = await paidJob(10_000);
    await transitionJob(knex, job.reviewer, job.id, "startReview");
    await transitionJob(knex, job.reviewer, job.id, "deliver");
    await fake.faults({ hangAfter: 1 });
    const { r, ms } = await timed(releaseJob(knex, job.homeowner, job.id, impatient));
    expect(r.status).toBe(503);
    expect(r.message).toMatch(/did not answer while paying the reviewer/);
    expect(ms).toBeLessThan(TIMEOUT_MS + 2_000);
    expect(await state(job.id)).toBe("delivered");
    expect(await ledgerOf(job.id)).toEqual(["charge 10000"]);
    // The service has the transfer the ledger does not: the reconciliation says so.
    const admin = await makeAdmin(knex);
    const gap = await reconcile(knex, admin, svc);
    expect(gap.differences.filter((d) => d.jobId === job.id).map((d) => d.what)).toEqual([
      "transfer",
    ]);

    // A hang before the service does anything, then the click that goes through.
    await fake.faults({ hang: 1 });
    expect((await refusalOf(releaseJob(knex, job.homeowner, job.id, impatient))).status).toBe(503);
    await releaseJob(knex, job.homeowner, job.id, svc);
    expect(await state(job.id)).toBe("released");
    const transfers = await svc.pay.transfers.list({ transfer_group: `job-${job.id}` });
    expect(transfers.data).toHaveLength(1);
    const calls = await callsTo("/v1/transfers");
    expect(
      calls.filter((c) => c.idempotencyKey === `job-${job.id}-transfer`).map((c) => c.replayed),
    ).toEqual([false, false, true]);
    const [transfer] = await knex("ledger_entries").where({ job_id: job.id, kind: "transfer" });
    expect(transfer.provider_ref).toBe(transfers.data[0]!.id);
    expect(
      (await reconcile(knex, admin, svc)).differences.filter((d) => d.jobId === job.id),
    ).toEqual([]);
  });

  it("a refund hanging: the job stays funded; the retry refunds once", async () => {
    const job = await paidJob(9_000);
    await fake.faults({ hangAfter: 1 });
    const { r, ms } = await timed(cancelJobWithRefund(knex, job.homeowner, job.id, impatient));
    expect(r.status).toBe(503);
    expect(r.message).toMatch(/did not answer while refunding the payment/);
    expect(ms).toBeLessThan(TIMEOUT_MS + 2_000);
    expect(await state(job.id)).toBe("funded");
    expect(await ledgerOf(job.id)).toEqual(["charge 9000"]);
    expect(await knex("email_outbox").where({ template: "refund_issued" })).toHaveLength(0);

    await fake.faults({ hang: 1 });
    expect(
      (await refusalOf(cancelJobWithRefund(knex, job.homeowner, job.id, impatient))).status,
    ).toBe(503);
    await cancelJobWithRefund(knex, job.homeowner, job.id, svc);
    expect(await state(job.id)).toBe("refunded");
    expect(await ledgerOf(job.id)).toEqual(["charge 9000", "refund -9000"]);
    const pi = (await knex("jobs").where({ id: job.id }).first("payment_intent_id"))
      .payment_intent_id;
    expect((await svc.pay.refunds.list({ payment_intent: pi })).data.map((x) => x.amount)).toEqual([
      9_000,
    ]);
  });

  it("the app down when the payment is made: the fake retries, the restarted app funds the job once", async () => {
    const job = await unpaidJob(7_700);
    const url = await startCheckout(knex, job.homeowner, job.id, svc);
    const port = receiver.port;
    await receiver.close();
    await fake.payCheckout(url);
    // The first delivery finds nobody listening.
    await new Promise((r) => setTimeout(r, 300));
    expect(await state(job.id)).toBe("awaiting_payment");
    // A fresh process (its own database pool) on the same address.
    receiver = await startWebhookReceiver(
      () => testKnex(),
      TEST_PAYMENT_KEYS.webhookSecret,
      "http://app.test",
      port,
    );
    await fake.flush(20_000);
    expect(await state(job.id)).toBe("funded");
    expect(await ledgerOf(job.id)).toEqual(["charge 7700"]);
    const record = (await fake.events("checkout.session.completed")).find((e) =>
      JSON.stringify(e.event).includes(`"jobId":"${job.id}"`),
    )!;
    expect(record.delivery).toBe("delivered");
    expect(record.attempts.length).toBeGreaterThan(1);
    expect(record.attempts.at(-1)!.status).toBe(200);
    expect(record.attempts[0]!.status).not.toBe(200);
  });

  it("the webhooks lost while the app was down: the return page's check after the restart funds the job once", async () => {
    const job = await unpaidJob(6_600);
    const url = await startCheckout(knex, job.homeowner, job.id, svc);
    const port = receiver.port;
    await receiver.close();
    await fake.faults({ dropWebhooks: 10 });
    await fake.payCheckout(url);
    await fake.flush();
    receiver = await startWebhookReceiver(
      () => testKnex(),
      TEST_PAYMENT_KEYS.webhookSecret,
      "http://app.test",
      port,
    );
    await fake.faults({ dropWebhooks: 0 });
    expect(await state(job.id)).toBe("awaiting_payment");
    // The homeowner lands on the return page: it asks the service instead of the redirect.
    const fresh = testKnex();
    try {
      expect(await syncCheckout(fresh, job.homeowner, job.id, svc)).toBe("funded");
      expect(await syncCheckout(fresh, job.homeowner, job.id, svc)).toBe("unchanged");
    } finally {
      await fresh.destroy();
    }
    expect(await state(job.id)).toBe("funded");
    expect(await ledgerOf(job.id)).toEqual(["charge 6600"]);
    // A late redelivery of the lost event changes nothing.
    const record = (await fake.events("checkout.session.completed")).find((e) =>
      JSON.stringify(e.event).includes(`"jobId":"${job.id}"`),
    )!;
    expect(record.delivery).toBe("dropped");
    await fake.redeliver(record.event.id);
    await fake.flush();
    expect(await ledgerOf(job.id)).toEqual(["charge 6600"]);
    expect(await knex("audit_log").where({ entity_id: job.id, action: "job.fund" })).toHaveLength(
      1,
    );
  });
});
