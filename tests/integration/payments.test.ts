/**
 * Held funds end to end, with the real stripe SDK against the running payment fake and the real
 * MariaDB: checkout, verified webhooks, declines and retries, release with the fee, cancels,
 * refunds, disputes, auto-release by the worker, faults, forgery and replay, and the
 * reconciliation finding a difference injected into the fake.
 */
import { afterAll, beforeAll, beforeEach, describe, expect, inject, it } from "vitest";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import type { Knex } from "knex";
import Stripe from "stripe";
import { splitFee } from "@/lib/jobs";
import { env } from "@/lib/env";
import {
  cancelJob,
  cancelJobWithRefund,
  getJob,
  jobServices,
  openDispute,
  releaseJob,
  settleDispute,
  startCheckout,
  syncCheckout,
  transitionJob,
  type JobServices,
} from "@/lib/data/jobs";
import { handlePaymentEvent, reconcile, startPayoutSetup } from "@/lib/data/payments";
import { autoRelease } from "@/lib/worker/schedule";
import { verifyPaymentEvent } from "@/lib/payments/client";
import { testKnex, truncateAll } from "../support/db";
import { makeAdmin, makeJob, makeReviewer, type ReviewerFixture } from "../support/fixtures";
import { paymentsFakeControl } from "../support/payments";
import { TEST_PAYMENT_KEYS, TEST_PORTS } from "../support/fakes";
import { refusalOf } from "../support/status";

describe("held funds through the payment service", () => {
  let knex: Knex;
  let receiver: Server;
  let svc: JobServices;
  const fake = paymentsFakeControl(inject("paymentsUrl"), TEST_PAYMENT_KEYS.secretKey);
  const handled: string[] = [];
  const e = () => ({ ...env(), STRIPE_WEBHOOK_SECRET: TEST_PAYMENT_KEYS.webhookSecret });

  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    // The app's webhook route, in small: verify the signature, then the same data function.
    receiver = createServer((req, res) => {
      const chunks: Buffer[] = [];
      req.on("data", (c: Buffer) => chunks.push(c));
      req.on("end", async () => {
        try {
          const event = verifyPaymentEvent(
            Buffer.concat(chunks).toString("utf8"),
            String(req.headers["stripe-signature"] ?? ""),
            e(),
          );
          handled.push(await handlePaymentEvent(knex, event, "http://app.test"));
          res.writeHead(200).end("{}");
        } catch (err) {
          res
            .writeHead(err instanceof Stripe.errors.StripeSignatureVerificationError ? 400 : 500)
            .end();
        }
      });
    });
    await new Promise<void>((r) => receiver.listen(0, "127.0.0.1", r));
    const port = (receiver.address() as AddressInfo).port;
    await fake.reset();
    await fake.config({ webhookUrl: `http://127.0.0.1:${port}/webhook` });
    svc = jobServices({ pay: fake.client(), appUrl: "http://app.test" });
  });
  beforeEach(() => {
    handled.length = 0;
  });
  afterAll(async () => {
    // Give the shared fake back to the app under test (the e2e project runs after this one).
    await fake.config({ webhookUrl: `http://127.0.0.1:${TEST_PORTS.app}/api/webhooks/payments` });
    await new Promise((r) => receiver.close(r));
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

  /** The fixtures give reviewers a made-up payout account; these tests need real ones. */
  async function noPayoutAccount(reviewer: ReviewerFixture) {
    await knex("reviewer_profiles")
      .where({ user_id: reviewer.id })
      .update({ payment_account_id: null, payouts_enabled: false });
    return reviewer;
  }

  /** A reviewer whose payout account is set up on the fake's page. */
  async function readyReviewer(): Promise<ReviewerFixture> {
    const reviewer = await noPayoutAccount(await makeReviewer(knex));
    const url = await startPayoutSetup(knex, reviewer, svc);
    const u = new URL(url);
    const done = await fetch(`${fake.base}${u.pathname}`, {
      method: "POST",
      body: new URLSearchParams({ link: u.searchParams.get("link")!, action: "complete" }),
      redirect: "manual",
    });
    expect(done.status).toBe(303);
    await fake.flush();
    const p = await knex("reviewer_profiles")
      .where({ user_id: reviewer.id })
      .first("payouts_enabled");
    expect(Boolean(p.payouts_enabled)).toBe(true);
    return reviewer;
  }

  /** A job paid through the fake's checkout page, funded by its webhook. */
  async function paidJob(priceMinor = 12_345, reviewer?: ReviewerFixture) {
    const job = await makeJob(knex, "awaiting_payment", {
      priceMinor,
      reviewer: reviewer ?? (await readyReviewer()),
    });
    const url = await startCheckout(knex, job.homeowner, job.id, svc);
    const paid = await fake.payCheckout(url);
    expect(paid.status).toBe(303);
    expect(paid.headers.get("location")).toBe(`http://app.test/jobs/${job.id}?checkout=done`);
    await fake.flush();
    expect(await state(job.id)).toBe("funded");
    return job;
  }

  async function deliveredJob(priceMinor?: number) {
    const job = await paidJob(priceMinor);
    await transitionJob(knex, job.reviewer, job.id, "startReview");
    await transitionJob(knex, job.reviewer, job.id, "deliver");
    return job;
  }

  it("checkout → signed webhook → funded, with the charge in the ledger and the e-mails queued", async () => {
    const job = await paidJob(12_345);
    expect(await ledgerOf(job.id)).toEqual(["charge 12345"]);
    const session = await knex("jobs").where({ id: job.id }).first("payment_intent_id");
    const pi = await svc.pay.paymentIntents.retrieve(session.payment_intent_id);
    expect(pi.amount_received).toBe(12_345);
    expect(pi.transfer_group).toBe(`job-${job.id}`);
    expect(pi.metadata.jobId).toBe(String(job.id));
    const mails = await knex("email_outbox")
      .where({ template: "payment_received" })
      .select("to_user_id");
    expect(mails.map((m) => Number(m.to_user_id)).sort()).toEqual(
      [job.homeowner.id, job.reviewer.id].sort(),
    );
    // The checkout call carried our own key: job + attempt.
    const keys = (await fake.requests()).map((r) => r.idempotencyKey);
    expect(keys).toContain(`job-${job.id}-checkout-1`);
  });

  it("a webhook delivered twice, or replayed, changes nothing twice", async () => {
    const job = await paidJob();
    const events = await fake.events("checkout.session.completed");
    const mine = events.filter((r) => JSON.stringify(r.event).includes(`"jobId":"${job.id}"`));
    expect(mine.length).toBe(1);
    await fake.redeliver(mine[0]!.event.id);
    await fake.flush();
    expect(handled).toContain("duplicate");
    expect(await ledgerOf(job.id)).toEqual([`charge ${job.amountMinor}`]);
    expect(await knex("audit_log").where({ entity_id: job.id, action: "job.fund" })).toHaveLength(
      1,
    );
  });

  it("a declined card leaves the job awaiting payment; paying again funds it once", async () => {
    const job = await makeJob(knex, "awaiting_payment", { reviewer: await readyReviewer() });
    const url = await startCheckout(knex, job.homeowner, job.id, svc);
    const declined = await fake.payCheckout(url, "decline");
    expect(declined.status).toBeLessThan(400);
    await fake.flush();
    expect(await state(job.id)).toBe("awaiting_payment");
    expect(await syncCheckout(knex, job.homeowner, job.id, svc)).toBe("unpaid");
    // The retry reuses the open session.
    const again = await startCheckout(knex, job.homeowner, job.id, svc);
    expect(again).toBe(url);
    await fake.payCheckout(again);
    await fake.flush();
    expect(await state(job.id)).toBe("funded");
    expect(await ledgerOf(job.id)).toEqual([`charge ${job.amountMinor}`]);
  });

  it("a late webhook: the return page asks the service and funds the job; the webhook then changes nothing", async () => {
    const job = await makeJob(knex, "awaiting_payment", { reviewer: await readyReviewer() });
    const url = await startCheckout(knex, job.homeowner, job.id, svc);
    await fake.faults({ dropWebhooks: 5 });
    await fake.payCheckout(url);
    expect(await state(job.id)).toBe("awaiting_payment");
    expect(await syncCheckout(knex, job.homeowner, job.id, svc)).toBe("funded");
    expect(await state(job.id)).toBe("funded");
    await fake.faults({ dropWebhooks: 0 });
    expect(await ledgerOf(job.id)).toEqual([`charge ${job.amountMinor}`]);
  });

  it("release: one transfer of the amount less the fee, even for ten clicks at once", async () => {
    await fake.config({ webhookUrl: receiverUrl() });
    const job = await deliveredJob(10_001);
    const { feeMinor, payoutMinor } = splitFee(10_001, env().PLATFORM_FEE_PERCENT);
    const results = await Promise.allSettled(
      Array.from({ length: 10 }, () => releaseJob(knex, job.homeowner, job.id, svc)),
    );
    expect(results.filter((r) => r.status === "fulfilled")).toHaveLength(1);
    for (const r of results)
      if (r.status === "rejected") expect((r.reason as { status: number }).status).toBe(409);
    expect(await state(job.id)).toBe("released");
    expect(await ledgerOf(job.id)).toEqual([
      "charge 10001",
      `transfer ${payoutMinor}`,
      `fee ${feeMinor}`,
    ]);
    expect(payoutMinor + feeMinor).toBe(10_001);
    const transfers = await svc.pay.transfers.list({ transfer_group: `job-${job.id}` });
    expect(transfers.data.map((t) => t.amount)).toEqual([payoutMinor]);
    expect((await getJob(knex, job.homeowner, job.id)).money.heldMinor).toBe(0);
  });

  it("refuses release to a stranger (404), to the reviewer (403), and before delivery (409)", async () => {
    const job = await paidJob();
    const other = await makeJob(knex, "funded");
    expect((await refusalOf(releaseJob(knex, other.homeowner, job.id, svc))).status).toBe(404);
    const asReviewer = await refusalOf(releaseJob(knex, job.reviewer, job.id, svc));
    expect(asReviewer.status).toBe(403);
    const early = await refusalOf(releaseJob(knex, job.homeowner, job.id, svc));
    expect(early.status).toBe(409);
    expect(early.message).toMatch(/only possible while it is "Report delivered"/);
    expect(await ledgerOf(job.id)).toEqual([`charge ${job.amountMinor}`]);
  });

  it("a reviewer without a ready payout account: the payment stays held, with a plain message", async () => {
    const job = await makeJob(knex, "awaiting_payment", {
      reviewer: await noPayoutAccount(await makeReviewer(knex)),
    });
    const url = await startCheckout(knex, job.homeowner, job.id, svc);
    await fake.payCheckout(url);
    await fake.flush();
    await transitionJob(knex, job.reviewer, job.id, "startReview");
    await transitionJob(knex, job.reviewer, job.id, "deliver");
    const r = await refusalOf(releaseJob(knex, job.homeowner, job.id, svc));
    expect(r.status).toBe(409);
    expect(r.message).toMatch(/payout account is not set up/);
    expect(await state(job.id)).toBe("delivered");
  });

  it("cancel before payment; cancel after payment with a full refund through the service", async () => {
    const unpaid = await makeJob(knex, "awaiting_payment");
    await cancelJob(knex, unpaid.homeowner, unpaid.id);
    expect(await state(unpaid.id)).toBe("cancelled");
    const job = await paidJob(9_000);
    await cancelJobWithRefund(knex, job.homeowner, job.id, svc);
    expect(await state(job.id)).toBe("refunded");
    expect(await ledgerOf(job.id)).toEqual(["charge 9000", "refund -9000"]);
    const pi = (await knex("jobs").where({ id: job.id }).first("payment_intent_id"))
      .payment_intent_id;
    const refunds = await svc.pay.refunds.list({ payment_intent: pi });
    expect(refunds.data.map((r) => r.amount)).toEqual([9_000]);
    expect(
      await knex("email_outbox").where({ template: "refund_issued", to_user_id: job.homeowner.id }),
    ).toHaveLength(1);
    // Once the review has started, the homeowner can no longer cancel.
    const started = await paidJob();
    await transitionJob(knex, started.reviewer, started.id, "startReview");
    expect(
      (await refusalOf(cancelJobWithRefund(knex, started.homeowner, started.id, svc))).status,
    ).toBe(409);
  });

  it("a dispute settled with a part refund: refund and transfer agree with the ledger", async () => {
    const job = await deliveredJob(20_000);
    const admin = await makeAdmin(knex);
    await openDispute(knex, job.homeowner, job.id, {
      reason: "The report does not answer the question about the relief discharge.",
    });
    expect(await state(job.id)).toBe("disputed");
    const bad = await refusalOf(
      settleDispute(
        knex,
        admin,
        job.id,
        { resolution: "partial_refund", refundMinor: 20_000 },
        svc,
      ),
    );
    expect(bad.status).toBe(422);
    expect(await state(job.id)).toBe("disputed");
    await settleDispute(
      knex,
      admin,
      job.id,
      { resolution: "partial_refund", refundMinor: 5_000, note: "Half answered." },
      svc,
    );
    expect(await state(job.id)).toBe("partially_refunded");
    const fee = splitFee(15_000, env().PLATFORM_FEE_PERCENT);
    expect(await ledgerOf(job.id)).toEqual([
      "charge 20000",
      "refund -5000",
      `transfer ${fee.payoutMinor}`,
      `fee ${fee.feeMinor}`,
    ]);
    const mails = await knex("email_outbox")
      .where({ template: "dispute_settled" })
      .select("to_user_id");
    expect(mails.map((m) => Number(m.to_user_id))).toEqual(
      expect.arrayContaining([job.homeowner.id, job.reviewer.id]),
    );
  });

  it("a full-refund settlement pays nothing out", async () => {
    const job = await deliveredJob(7_500);
    const admin = await makeAdmin(knex);
    await openDispute(knex, job.homeowner, job.id, {
      reason: "The reviewer never looked at the photos I sent.",
    });
    await settleDispute(knex, admin, job.id, { resolution: "full_refund" }, svc);
    expect(await state(job.id)).toBe("refunded");
    expect(await ledgerOf(job.id)).toEqual(["charge 7500", "refund -7500"]);
  });

  it("the worker releases a delivered job once its dispute window has closed, and only then", async () => {
    const job = await deliveredJob();
    const ctx = { db: knex, appUrl: "http://app.test" };
    // Not yet due.
    await autoRelease.run({ ...ctx, now: new Date() });
    expect(await state(job.id)).toBe("delivered");
    const later = new Date(Date.now() + (env().DISPUTE_WINDOW_DAYS + 1) * 86_400_000);
    // The worker's own client is the env's; point this run at the test fake through the same
    // function the task calls.
    const { releaseDueJobs } = await import("@/lib/data/jobs");
    const r = await releaseDueJobs(knex, later, svc);
    expect(r.released).toBeGreaterThanOrEqual(1);
    expect(await state(job.id)).toBe("released");
    // A homeowner who disputes inside the window keeps the money held past it.
    const disputed = await deliveredJob();
    await openDispute(knex, disputed.homeowner, disputed.id, {
      reason: "Not what the quote promised at all.",
    });
    await releaseDueJobs(knex, later, svc);
    expect(await state(disputed.id)).toBe("disputed");
  });

  it("the service failing during a release: a clear message, nothing moved; the retry moves money once", async () => {
    const job = await deliveredJob(11_000);
    await fake.faults({ fail: 2 });
    const r = await refusalOf(releaseJob(knex, job.homeowner, job.id, svc));
    expect(r.status).toBe(503);
    expect(r.message).toMatch(/did not answer/);
    expect(await state(job.id)).toBe("delivered");
    expect(await ledgerOf(job.id)).toEqual(["charge 11000"]);
    await fake.faults({ fail: 0 });
    await releaseJob(knex, job.homeowner, job.id, svc);
    const transfers = await svc.pay.transfers.list({ transfer_group: `job-${job.id}` });
    expect(transfers.data).toHaveLength(1);
  });

  it("a forged webhook is refused and changes nothing", async () => {
    const job = await makeJob(knex, "awaiting_payment");
    const body = JSON.stringify({
      id: "evt_forged_1",
      object: "event",
      type: "checkout.session.completed",
      data: {
        object: {
          id: "cs_x",
          payment_status: "paid",
          payment_intent: "pi_x",
          metadata: { jobId: String(job.id) },
          amount_total: job.amountMinor,
          currency: "gbp",
        },
      },
    });
    const forged = Stripe.webhooks.generateTestHeaderString({
      payload: body,
      secret: "whsec_wrong",
    });
    expect(() => verifyPaymentEvent(body, forged, e())).toThrow(
      Stripe.errors.StripeSignatureVerificationError,
    );
    expect(await state(job.id)).toBe("awaiting_payment");
    expect(await knex("payment_events").where({ event_id: "evt_forged_1" })).toHaveLength(0);
  });

  it("reconciliation agrees, then finds a refund made behind the ledger's back", async () => {
    const admin = await makeAdmin(knex);
    const job = await paidJob(8_000);
    const clean = await reconcile(knex, admin, svc);
    expect(clean.differences.filter((d) => d.jobId === job.id)).toEqual([]);
    const pi = (await knex("jobs").where({ id: job.id }).first("payment_intent_id"))
      .payment_intent_id;
    await svc.pay.refunds.create({ payment_intent: pi, amount: 1_000 });
    const report = await reconcile(knex, admin, svc);
    expect(report.differences).toContainEqual({
      jobId: job.id,
      what: "refund",
      ledgerMinor: 0,
      serviceMinor: 1_000,
      note: null,
    });
    expect((await refusalOf(reconcile(knex, job.homeowner, svc))).status).toBe(403);
  });

  function receiverUrl() {
    return `http://127.0.0.1:${(receiver.address() as AddressInfo).port}/webhook`;
  }
});
