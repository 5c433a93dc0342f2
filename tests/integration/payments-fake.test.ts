/**
 * The payments fake driven through the real stripe SDK, as the app will drive it; the hosted
 * pages are driven by form posts as a browser submits them, and webhooks land on a small
 * receiver here that verifies every signature with stripe.webhooks.constructEvent.
 * Needs neither the database nor the app.
 */
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import Stripe from "stripe";
import { startPaymentsFake, type PaymentsFake } from "../../mocks/payments/server";
import { paymentClient, verifyPaymentEvent } from "@/lib/payments/client";
import { parseEnv } from "@/lib/env";
import { paymentsFakeControl } from "../support/payments";

const OFFSET = Number(process.env.TEST_PORT_OFFSET ?? 0);
const PORT = 12111 + OFFSET + 100;
const KEY = "sk_test_payfake_suite";
const WHSEC = "whsec_payfake_suite";

interface Receiver {
  url: string;
  events: Stripe.Event[];
  raw: { body: string; signature: string }[];
  badSignatures: number;
  /** Answer the next N deliveries with 500. */
  failNext: number;
  server: Server;
}

async function startReceiver(): Promise<Receiver> {
  const r: Receiver = {
    url: "",
    events: [],
    raw: [],
    badSignatures: 0,
    failNext: 0,
    server: createServer((req, res) => {
      const chunks: Buffer[] = [];
      req.on("data", (c: Buffer) => chunks.push(c));
      req.on("end", () => {
        const body = Buffer.concat(chunks).toString("utf8");
        const signature = String(req.headers["stripe-signature"] ?? "");
        if (r.failNext > 0) {
          r.failNext -= 1;
          res.writeHead(500).end("down for a moment");
          return;
        }
        try {
          const event = Stripe.webhooks.constructEvent(body, signature, WHSEC);
          r.events.push(event);
          r.raw.push({ body, signature });
          res.writeHead(200, { "content-type": "application/json" }).end('{"received":true}');
        } catch {
          r.badSignatures += 1;
          res.writeHead(400).end("bad signature");
        }
      });
    }),
  };
  await new Promise<void>((done) => r.server.listen(0, "127.0.0.1", done));
  r.url = `http://127.0.0.1:${(r.server.address() as AddressInfo).port}/hook`;
  return r;
}

const GBP_LINE = (amount: number, name = "Remote design check") => ({
  quantity: 1,
  price_data: { currency: "gbp", unit_amount: amount, product_data: { name } },
});

describe("payments fake through the stripe SDK", () => {
  let fake: PaymentsFake;
  let receiver: Receiver;
  let stripe: Stripe;
  const control = paymentsFakeControl(`http://127.0.0.1:${PORT}`, KEY);

  beforeAll(async () => {
    receiver = await startReceiver();
    fake = await startPaymentsFake({
      port: PORT,
      secretKey: KEY,
      webhookSecret: WHSEC,
      webhookUrl: receiver.url,
      webhookRetry: { baseMs: 50, maxMs: 200, maxAttempts: 4, timeoutMs: 2000 },
    });
    stripe = control.client();
  });
  afterAll(async () => {
    await fake?.close();
    await new Promise((done) => receiver?.server.close(done));
  });
  beforeEach(async () => {
    await control.reset();
    await control.config({ webhookUrl: receiver.url });
    receiver.events.length = 0;
    receiver.raw.length = 0;
    receiver.badSignatures = 0;
    receiver.failNext = 0;
  });

  async function paidSession(amount = 12000, job = "41") {
    const session = await stripe.checkout.sessions.create({
      mode: "payment",
      success_url: "http://127.0.0.1:3999/jobs/41/paid?session={CHECKOUT_SESSION_ID}",
      cancel_url: "http://127.0.0.1:3999/jobs/41",
      line_items: [GBP_LINE(amount)],
      metadata: { job },
      payment_intent_data: { transfer_group: `job_${job}`, metadata: { job } },
    });
    const res = await control.payCheckout(session.url!);
    expect(res.status).toBe(303);
    const paid = await stripe.checkout.sessions.retrieve(session.id);
    return { session: paid, location: res.headers.get("location") };
  }

  async function onboarded(email = "reviewer@example.test") {
    const account = await stripe.accounts.create({ type: "express", email, country: "GB" });
    const link = await stripe.accountLinks.create({
      account: account.id,
      type: "account_onboarding",
      refresh_url: "http://127.0.0.1:3999/settings/payouts/retry",
      return_url: "http://127.0.0.1:3999/settings/payouts/done",
    });
    const linkId = new URL(link.url).searchParams.get("link")!;
    const done = await fetch(`${fake.url}/_fake/connect/${account.id}`, {
      method: "POST",
      body: new URLSearchParams({ link: linkId, action: "complete" }),
      redirect: "manual",
    });
    expect(done.status).toBe(303);
    return { account: await stripe.accounts.retrieve(account.id), link, done };
  }

  it("checkout: create, pay on the hosted page, signed webhooks, session paid", async () => {
    const session = await stripe.checkout.sessions.create({
      mode: "payment",
      success_url: "http://127.0.0.1:3999/jobs/41/paid?session={CHECKOUT_SESSION_ID}",
      cancel_url: "http://127.0.0.1:3999/jobs/41",
      line_items: [GBP_LINE(12000)],
      metadata: { job: "41" },
      payment_intent_data: { transfer_group: "job_41", metadata: { job: "41" } },
    });
    expect(session.id).toBe("cs_test_000001");
    expect(session).toMatchObject({
      object: "checkout.session",
      status: "open",
      payment_status: "unpaid",
      amount_total: 12000,
      currency: "gbp",
      livemode: false,
      metadata: { job: "41" },
      payment_intent: null,
      url: `${fake.url}/_fake/checkout/cs_test_000001`,
    });
    expect(session.lastResponse.requestId).toMatch(/^req_/);

    const pageRes = await fetch(session.url!);
    const html = await pageRes.text();
    expect(pageRes.status).toBe(200);
    expect(html).toContain("LOCAL TEST STAND-IN");
    expect(html).toContain("£120.00");
    expect(html).toContain("Pay with a test card");
    expect(html).toContain("Use a declining card");
    expect(html).toContain('href="http://127.0.0.1:3999/jobs/41"');

    const pay = await control.payCheckout(session.url!);
    expect(pay.status).toBe(303);
    expect(pay.headers.get("location")).toBe(
      "http://127.0.0.1:3999/jobs/41/paid?session=cs_test_000001",
    );
    await control.flush();

    expect(receiver.badSignatures).toBe(0);
    const types = receiver.events.map((e) => e.type);
    expect(types).toEqual(
      expect.arrayContaining(["checkout.session.completed", "payment_intent.succeeded"]),
    );
    const completed = receiver.events.find((e) => e.type === "checkout.session.completed")!;
    expect(completed).toMatchObject({ object: "event", livemode: false });
    expect(completed.id).toMatch(/^evt_/);
    expect(completed.api_version).toBe(Stripe.API_VERSION);
    const obj = completed.data.object as Stripe.Checkout.Session;
    expect(obj).toMatchObject({ id: session.id, status: "complete", payment_status: "paid" });
    // The signature is real: another secret does not verify it.
    const { body, signature } = receiver.raw[0]!;
    expect(signature).toMatch(/^t=\d+,v1=[0-9a-f]{64}$/);
    expect(() => Stripe.webhooks.constructEvent(body, signature, "whsec_other")).toThrow(
      Stripe.errors.StripeSignatureVerificationError,
    );

    const paid = await stripe.checkout.sessions.retrieve(session.id, {
      expand: ["payment_intent", "line_items"],
    });
    expect(paid.status).toBe("complete");
    expect(paid.payment_status).toBe("paid");
    const pi = paid.payment_intent as Stripe.PaymentIntent;
    expect(pi).toMatchObject({
      object: "payment_intent",
      status: "succeeded",
      amount: 12000,
      amount_received: 12000,
      transfer_group: "job_41",
      metadata: { job: "41" },
    });
    expect(pi.latest_charge).toMatch(/^ch_/);
    expect(paid.line_items?.data[0]).toMatchObject({
      description: "Remote design check",
      amount_total: 12000,
    });
    const succeeded = receiver.events.find((e) => e.type === "payment_intent.succeeded")!;
    expect((succeeded.data.object as Stripe.PaymentIntent).id).toBe(pi.id);

    const charges = await stripe.charges.list({ payment_intent: pi.id });
    expect(charges.data.map((c) => [c.id, c.amount_captured, c.paid])).toEqual([
      [pi.latest_charge, 12000, true],
    ]);
    // Paying twice changes nothing and sends the buyer on again.
    const again = await control.payCheckout(session.url!);
    expect(again.headers.get("location")).toBe(`/_fake/checkout/${session.id}`);
    expect((await stripe.charges.list()).data).toHaveLength(1);
  });

  it("a declining card leaves the session open and fires payment_intent.payment_failed", async () => {
    const session = await stripe.checkout.sessions.create({
      mode: "payment",
      success_url: "http://127.0.0.1:3999/ok",
      line_items: [GBP_LINE(5000, "Site visit")],
      payment_intent_data: { metadata: { job: "42" } },
    });
    const res = await control.payCheckout(session.url!, "decline");
    expect(res.status).toBe(303);
    expect(res.headers.get("location")).toBe(`/_fake/checkout/${session.id}?declined=1`);
    const page = await (await fetch(`${fake.url}${res.headers.get("location")}`)).text();
    expect(page).toContain("Card declined.");
    expect(page).toContain("Pay with a test card");

    await control.flush();
    const failed = receiver.events.filter((e) => e.type === "payment_intent.payment_failed");
    expect(failed).toHaveLength(1);
    const pi = failed[0]!.data.object as Stripe.PaymentIntent;
    expect(pi.metadata).toEqual({ job: "42" });
    expect(pi.last_payment_error?.code).toBe("card_declined");
    expect(receiver.events.some((e) => e.type === "checkout.session.completed")).toBe(false);

    const open = await stripe.checkout.sessions.retrieve(session.id);
    expect(open).toMatchObject({ status: "open", payment_status: "unpaid", payment_intent: null });
    expect((await stripe.balance.retrieve()).available).toEqual([
      expect.objectContaining({ amount: 0, currency: "gbp" }),
    ]);

    // Trying again with the good card pays the same payment intent.
    await control.payCheckout(session.url!, "ok");
    const paid = await stripe.checkout.sessions.retrieve(session.id);
    expect(paid.payment_status).toBe("paid");
    expect(paid.payment_intent).toBe(pi.id);
  });

  it("an expired session cannot be paid and fires checkout.session.expired", async () => {
    const session = await stripe.checkout.sessions.create({
      mode: "payment",
      success_url: "http://127.0.0.1:3999/ok",
      line_items: [GBP_LINE(5000)],
    });
    const expired = await stripe.checkout.sessions.expire(session.id);
    expect(expired.status).toBe("expired");
    const res = await control.payCheckout(session.url!);
    expect(res.headers.get("location")).toBe(`/_fake/checkout/${session.id}`);
    expect(await (await fetch(session.url!)).text()).toContain("This checkout has expired");
    expect((await stripe.checkout.sessions.retrieve(session.id)).payment_status).toBe("unpaid");
    await expect(stripe.checkout.sessions.expire(session.id)).rejects.toMatchObject({
      type: "StripeInvalidRequestError",
    });
    await control.flush();
    expect(receiver.events.map((e) => e.type)).toEqual(["checkout.session.expired"]);
  });

  it("replays an idempotent POST and refuses the same key with another body", async () => {
    const params = { amount: 3000, currency: "gbp", metadata: { job: "43" } };
    const first = await stripe.paymentIntents.create(params, { idempotencyKey: "job-43-fund" });
    const second = await stripe.paymentIntents.create(params, { idempotencyKey: "job-43-fund" });
    expect(second.id).toBe(first.id);
    expect(second.lastResponse.headers["idempotent-replayed"]).toBe("true");
    expect(first.lastResponse.headers["idempotent-replayed"]).toBeUndefined();
    expect((await stripe.paymentIntents.list()).data).toHaveLength(1);

    const err = await stripe.paymentIntents
      .create({ ...params, amount: 3100 }, { idempotencyKey: "job-43-fund" })
      .catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
    expect((await stripe.paymentIntents.list()).data).toHaveLength(1);

    // A refusal is not kept under the key: after the cause is fixed the same key goes through.
    const account = await stripe.accounts.create({ type: "express" });
    const refused = await stripe.transfers
      .create(
        { amount: 100, currency: "gbp", destination: account.id },
        { idempotencyKey: "job-43-release" },
      )
      .catch((e: unknown) => e);
    expect(refused).toMatchObject({ code: "insufficient_capabilities_for_transfer" });
    const log = await control.requests();
    expect(log.filter((r) => r.idempotencyKey === "job-43-fund").map((r) => r.replayed)).toEqual([
      false,
      true,
      false,
    ]);
  });

  it("refunds: partial, then the full remainder, then nothing more", async () => {
    const { session } = await paidSession(10000);
    const pi = session.payment_intent as string;
    const partial = await stripe.refunds.create({ payment_intent: pi, amount: 2500 });
    expect(partial).toMatchObject({
      object: "refund",
      amount: 2500,
      status: "succeeded",
      payment_intent: pi,
      currency: "gbp",
    });
    expect(partial.id).toMatch(/^re_/);
    const rest = await stripe.refunds.create({ payment_intent: pi });
    expect(rest.amount).toBe(7500);
    const over = await stripe.refunds
      .create({ payment_intent: pi, amount: 1 })
      .catch((e: unknown) => e);
    expect(over).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(over).toMatchObject({ code: "charge_already_refunded", statusCode: 400 });

    const refunds = await stripe.refunds.list({ payment_intent: pi });
    expect(refunds.data.map((r) => r.amount)).toEqual([7500, 2500]);
    expect((await stripe.refunds.retrieve(partial.id)).amount).toBe(2500);
    const charge = await stripe.charges.retrieve(partial.charge as string);
    expect(charge).toMatchObject({ amount_refunded: 10000, refunded: true });

    const second = await paidSession(4000, "44");
    const tooMuch = await stripe.refunds
      .create({ payment_intent: second.session.payment_intent as string, amount: 4001 })
      .catch((e: unknown) => e);
    expect(tooMuch).toMatchObject({ code: "amount_too_large", param: "amount", statusCode: 400 });
    await control.flush();
    expect(receiver.events.filter((e) => e.type === "charge.refunded")).toHaveLength(2);
  });

  it("payout account onboarding through the setup page, then transfers", async () => {
    const account = await stripe.accounts.create({
      type: "express",
      email: "reviewer@example.test",
      metadata: { reviewer: "9" },
    });
    expect(account.id).toMatch(/^acct_/);
    expect(account).toMatchObject({
      charges_enabled: false,
      payouts_enabled: false,
      details_submitted: false,
      metadata: { reviewer: "9" },
    });
    await paidSession(20000);
    const refused = await stripe.transfers
      .create({ amount: 1000, currency: "gbp", destination: account.id, transfer_group: "job_41" })
      .catch((e: unknown) => e);
    expect(refused).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(refused).toMatchObject({ code: "insufficient_capabilities_for_transfer" });
    const noDashboard = await stripe.accounts.createLoginLink(account.id).catch((e: unknown) => e);
    expect(noDashboard).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);

    const link = await stripe.accountLinks.create({
      account: account.id,
      type: "account_onboarding",
      refresh_url: "http://127.0.0.1:3999/settings/payouts/retry",
      return_url: "http://127.0.0.1:3999/settings/payouts/done",
    });
    expect(link.url.startsWith(`${fake.url}/_fake/connect/${account.id}?`)).toBe(true);
    const setup = await fetch(link.url);
    const html = await setup.text();
    expect(html).toContain("Complete payout account setup");
    expect(html).toContain("LOCAL TEST STAND-IN");
    const linkId = new URL(link.url).searchParams.get("link")!;
    const done = await fetch(`${fake.url}/_fake/connect/${account.id}`, {
      method: "POST",
      body: new URLSearchParams({ link: linkId, action: "complete" }),
      redirect: "manual",
    });
    expect(done.status).toBe(303);
    expect(done.headers.get("location")).toBe("http://127.0.0.1:3999/settings/payouts/done");
    // A used link sends the visitor to refresh_url, as an expired one does.
    const reused = await fetch(link.url, { redirect: "manual" });
    expect(reused.headers.get("location")).toBe("http://127.0.0.1:3999/settings/payouts/retry");

    const ready = await stripe.accounts.retrieve(account.id);
    expect(ready).toMatchObject({
      charges_enabled: true,
      payouts_enabled: true,
      details_submitted: true,
    });
    await control.flush();
    const updated = receiver.events.filter((e) => e.type === "account.updated");
    expect(updated).toHaveLength(1);
    expect(updated[0]!.account).toBe(account.id);
    expect(updated[0]!.data.object).toMatchObject({ id: account.id, payouts_enabled: true });
    expect(updated[0]!.data.previous_attributes).toMatchObject({ payouts_enabled: false });

    const charge = (await stripe.charges.list()).data[0]!;
    const transfer = await stripe.transfers.create({
      amount: 17600,
      currency: "gbp",
      destination: account.id,
      transfer_group: "job_41",
      source_transaction: charge.id,
      metadata: { job: "41" },
    });
    expect(transfer).toMatchObject({
      object: "transfer",
      amount: 17600,
      destination: account.id,
      transfer_group: "job_41",
      source_transaction: charge.id,
    });
    expect(transfer.id).toMatch(/^tr_/);
    expect((await stripe.transfers.retrieve(transfer.id)).amount).toBe(17600);
    expect(
      (await stripe.transfers.list({ transfer_group: "job_41" })).data.map((t) => t.id),
    ).toEqual([transfer.id]);
    expect((await stripe.transfers.list({ transfer_group: "job_99" })).data).toEqual([]);
    // More than is left on the source charge is refused.
    const beyond = await stripe.transfers
      .create({
        amount: 2401,
        currency: "gbp",
        destination: account.id,
        source_transaction: charge.id,
      })
      .catch((e: unknown) => e);
    expect(beyond).toMatchObject({ code: "amount_too_large" });

    const login = await stripe.accounts.createLoginLink(account.id);
    const dashboard = await fetch(login.url);
    expect(dashboard.status).toBe(200);
    const dashHtml = await dashboard.text();
    expect(dashHtml).toContain("Setup: complete");
    expect(dashHtml).toContain("£176.00");
  });

  it("balance: charges − refunds − transfers, per currency", async () => {
    const { account } = await onboarded();
    await paidSession(12000, "50");
    const second = await paidSession(5000, "51");
    await stripe.refunds.create({
      payment_intent: second.session.payment_intent as string,
      amount: 2000,
    });
    await stripe.transfers.create({ amount: 9000, currency: "gbp", destination: account.id });
    const eur = await stripe.checkout.sessions.create({
      mode: "payment",
      success_url: "http://127.0.0.1:3999/ok",
      line_items: [
        {
          quantity: 2,
          price_data: { currency: "eur", unit_amount: 700, product_data: { name: "Site visit" } },
        },
      ],
    });
    await control.payCheckout(eur.url!);

    const balance = await stripe.balance.retrieve();
    const available = Object.fromEntries(balance.available.map((b) => [b.currency, b.amount]));
    expect(available).toEqual({ gbp: 12000 + 5000 - 2000 - 9000, eur: 1400 });

    const tooBig = await stripe.transfers
      .create({ amount: 6001, currency: "gbp", destination: account.id })
      .catch((e: unknown) => e);
    expect(tooBig).toMatchObject({ code: "balance_insufficient", statusCode: 400 });
    await stripe.transfers.create({ amount: 6000, currency: "gbp", destination: account.id });
    const after = await stripe.balance.retrieve();
    expect(after.available.find((b) => b.currency === "gbp")?.amount).toBe(0);

    const theirs = await stripe.balance.retrieve({}, { stripeAccount: account.id });
    expect(theirs.available).toEqual([expect.objectContaining({ amount: 15000, currency: "gbp" })]);
  });

  it("payment intents: confirm, decline, manual capture, cancel", async () => {
    const pi = await stripe.paymentIntents.create({
      amount: 2500,
      currency: "gbp",
      payment_method: "pm_card_visa",
      confirm: true,
    });
    expect(pi).toMatchObject({ status: "succeeded", amount_received: 2500 });

    const declining = await stripe.paymentIntents.create({ amount: 2500, currency: "gbp" });
    expect(declining.status).toBe("requires_payment_method");
    const err = await stripe.paymentIntents
      .confirm(declining.id, { payment_method: "pm_card_chargeDeclined" })
      .catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeCardError);
    expect(err).toMatchObject({ code: "card_declined", statusCode: 402 });
    expect((await stripe.paymentIntents.retrieve(declining.id)).status).toBe(
      "requires_payment_method",
    );

    const held = await stripe.paymentIntents.create({
      amount: 8000,
      currency: "gbp",
      capture_method: "manual",
      payment_method: "pm_card_visa",
      confirm: true,
    });
    expect(held).toMatchObject({
      status: "requires_capture",
      amount_capturable: 8000,
      amount_received: 0,
    });
    const captured = await stripe.paymentIntents.capture(held.id, { amount_to_capture: 6000 });
    expect(captured).toMatchObject({ status: "succeeded", amount_received: 6000 });

    const updated = await stripe.paymentIntents.update(declining.id, {
      amount: 2700,
      metadata: { job: "60" },
    });
    expect(updated).toMatchObject({ amount: 2700, metadata: { job: "60" } });
    const canceled = await stripe.paymentIntents.cancel(declining.id);
    expect(canceled.status).toBe("canceled");
    await expect(stripe.paymentIntents.cancel(pi.id)).rejects.toMatchObject({
      code: "payment_intent_unexpected_state",
    });
    const balance = await stripe.balance.retrieve();
    expect(balance.available[0]?.amount).toBe(2500 + 6000);
  });

  it("retries a webhook while the receiver answers 500, then it is accepted", async () => {
    receiver.failNext = 2;
    const account = await stripe.accounts.create({ type: "express" });
    const link = await stripe.accountLinks.create({
      account: account.id,
      type: "account_onboarding",
      refresh_url: "http://127.0.0.1:3999/r",
      return_url: "http://127.0.0.1:3999/d",
    });
    await fetch(`${fake.url}/_fake/connect/${account.id}`, {
      method: "POST",
      body: new URLSearchParams({
        link: new URL(link.url).searchParams.get("link")!,
        action: "complete",
      }),
      redirect: "manual",
    });
    await control.flush();
    const [record] = await control.events("account.updated");
    expect(record!.delivery).toBe("delivered");
    expect(record!.attempts.map((a) => a.status)).toEqual([500, 500, 200]);
    expect(receiver.events.map((e) => e.id)).toEqual([record!.event.id]);

    // A receiver that never recovers: bounded attempts, then the event is marked failed.
    receiver.failNext = 100;
    await stripe.checkout.sessions.expire(
      (
        await stripe.checkout.sessions.create({
          mode: "payment",
          success_url: "http://127.0.0.1:3999/ok",
          line_items: [GBP_LINE(5000)],
        })
      ).id,
    );
    await control.flush();
    const [gaveUp] = await control.events("checkout.session.expired");
    expect(gaveUp!.delivery).toBe("failed");
    expect(gaveUp!.attempts).toHaveLength(4);
    // An unreachable receiver is retried the same way.
    receiver.failNext = 0;
    await control.config({ webhookUrl: "http://127.0.0.1:9/unreachable" });
    await stripe.accounts.create({ type: "express" });
    await onboarded("other@example.test");
    await control.flush();
    const [unreachable] = await control.events("account.updated").then((r) => r.slice(-1));
    expect(unreachable!.delivery).toBe("failed");
    expect(unreachable!.attempts.every((a) => a.status === null && a.error)).toBe(true);
    // ...and can be sent again once the app is back.
    await control.config({ webhookUrl: receiver.url });
    await control.redeliver(unreachable!.event.id);
    await control.flush();
    expect(receiver.events.at(-1)?.id).toBe(unreachable!.event.id);
  });

  it("a refused call while a delivery is being retried loses none of its record", async () => {
    receiver.failNext = 1;
    const { account } = await onboarded();
    // Each refusal rolls the fake's state back to before the call; the delivery in progress
    // must still be recorded in the state that is kept.
    for (let i = 0; i < 5; i++) {
      const refused = await stripe.transfers
        .create({ amount: 100, currency: "gbp", destination: account.id })
        .catch((e: unknown) => e);
      expect(refused).toMatchObject({ code: "balance_insufficient" });
      await new Promise((r) => setTimeout(r, 20));
    }
    await control.flush();
    const [record] = await control.events("account.updated");
    expect(record!.delivery).toBe("delivered");
    expect(record!.attempts.map((a) => a.status)).toEqual([500, 200]);
  });

  it("fault switches: fail, hang and dropped webhooks", async () => {
    // fail 1: the SDK retries once with the same idempotency key and succeeds.
    await control.faults({ fail: 1 });
    const a = await stripe.accounts.create({ type: "express" });
    const log = (await control.requests()).filter((r) => r.path === "/v1/accounts");
    expect(log.map((r) => r.status)).toEqual([500, 200]);
    expect(log[0]!.idempotencyKey).toBe(log[1]!.idempotencyKey);
    expect((await stripe.accounts.list()).data.map((x) => x.id)).toEqual([a.id]);

    // fail 2: more than the one retry, so the caller sees the service's error.
    await control.faults({ fail: 2 });
    const failed = await stripe.accounts.create({ type: "express" }).catch((e: unknown) => e);
    expect(failed).toBeInstanceOf(Stripe.errors.StripeAPIError);
    expect(failed).toMatchObject({ statusCode: 500, type: "StripeAPIError" });
    expect((await stripe.accounts.list()).data).toHaveLength(1);

    // hang: never answered; a client with a short timeout gives up with a connection error.
    await control.faults({ hang: 1 });
    const impatient = control.client({ timeout: 300, maxNetworkRetries: 0 });
    const hung = await impatient.balance.retrieve().catch((e: unknown) => e);
    expect(hung).toBeInstanceOf(Stripe.errors.StripeConnectionError);
    // ...and with a retry the second attempt is answered.
    await control.faults({ hang: 1 });
    const patient = control.client({ timeout: 300, maxNetworkRetries: 1 });
    expect((await patient.balance.retrieve()).object).toBe("balance");
    // Reset lets a hanging call go: the dropped connection is retried once by the SDK (it
    // retries a closed connection even with retries off) and that retry is answered.
    await control.faults({ hang: 1 });
    const pending = stripe.balance
      .retrieve({}, { timeout: 20_000, maxNetworkRetries: 0 })
      .catch((e: unknown) => e);
    await new Promise((r) => setTimeout(r, 100));
    await control.reset();
    expect(await pending).toMatchObject({ object: "balance" });
    expect((await control.requests()).map((r) => [r.path, r.status, r.fault])).toEqual([
      ["/v1/balance", 200, null],
    ]);

    // dropWebhooks: the next delivery is silently lost; the one after arrives.
    await control.faults({ dropWebhooks: 1 });
    expect(await (await fetch(`${fake.url}/_fake/faults`)).json()).toEqual({
      fail: 0,
      hang: 0,
      hangAfter: 0,
      dropWebhooks: 1,
    });
    await onboarded("one@example.test");
    await onboarded("two@example.test");
    await control.flush();
    const records = await control.events("account.updated");
    expect(records.map((r) => r.delivery)).toEqual(["dropped", "delivered"]);
    expect(receiver.events.map((e) => e.id)).toEqual([records[1]!.event.id]);

    // Reset clears the switches.
    await control.faults({ fail: 5, dropWebhooks: 5 });
    await control.reset();
    expect(await (await fetch(`${fake.url}/_fake/faults`)).json()).toEqual({
      fail: 0,
      hang: 0,
      hangAfter: 0,
      dropWebhooks: 0,
    });
  });

  it("reset and the other test controls need the fake's secret key", async () => {
    const account = await stripe.accounts.create({ type: "express" });
    const attempts: Record<string, string>[] = [{}, { authorization: "Bearer sk_test_wrong" }];
    for (const headers of attempts) {
      const res = await fetch(`${fake.url}/_fake/reset`, { method: "POST", headers });
      expect(res.status).toBe(401);
      const faults = await fetch(`${fake.url}/_fake/faults`, {
        method: "POST",
        headers,
        body: JSON.stringify({ fail: 3 }),
      });
      expect(faults.status).toBe(401);
    }
    expect((await stripe.accounts.retrieve(account.id)).id).toBe(account.id);
    await control.reset();
    const gone = await stripe.accounts.retrieve(account.id).catch((e: unknown) => e);
    expect(gone).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect(gone).toMatchObject({ code: "resource_missing", statusCode: 404 });
    const health = await fetch(`${fake.url}/_fake/health`);
    expect(health.status).toBe(200);
    expect(await health.json()).toMatchObject({ ok: true });
  });

  it("refuses bad keys, unknown parameters and unknown objects in the service's shapes", async () => {
    const bad = new Stripe("sk_test_not_this_one", {
      host: "127.0.0.1",
      port: PORT,
      protocol: "http",
      maxNetworkRetries: 0,
      telemetry: false,
    });
    const err = await bad.balance.retrieve().catch((e: unknown) => e);
    expect(err).toBeInstanceOf(Stripe.errors.StripeAuthenticationError);
    expect(err).toMatchObject({ statusCode: 401 });
    const raw = await fetch(`${fake.url}/v1/balance`);
    expect(raw.status).toBe(401);
    expect(raw.headers.get("request-id")).toMatch(/^req_/);
    expect(await raw.json()).toMatchObject({ error: { type: "invalid_request_error" } });

    const unknown = await stripe.checkout.sessions
      .create({
        mode: "payment",
        success_url: "http://127.0.0.1:3999/ok",
        line_items: [GBP_LINE(5000)],
        colour: "blue",
      } as Stripe.Checkout.SessionCreateParams)
      .catch((e: unknown) => e);
    expect(unknown).toMatchObject({ code: "parameter_unknown", param: "colour", statusCode: 400 });
    expect((await stripe.checkout.sessions.list()).data).toEqual([]);
    const noMode = await stripe.checkout.sessions
      .create({ success_url: "http://127.0.0.1:3999/ok", line_items: [GBP_LINE(5000)] })
      .catch((e: unknown) => e);
    expect(noMode).toMatchObject({ code: "parameter_missing", param: "mode" });

    const missing = await stripe.transfers.retrieve("tr_nope").catch((e: unknown) => e);
    expect(missing).toMatchObject({ code: "resource_missing", statusCode: 404 });
    expect((missing as Stripe.errors.StripeError).requestId).toMatch(/^req_/);
    const page = await fetch(`${fake.url}/_fake/checkout/cs_nope`);
    expect(page.status).toBe(404);
    expect(await page.text()).toContain("No such checkout");
  });

  it("the app's payment client reaches the fake from the environment alone", async () => {
    const e = parseEnv({
      STRIPE_SECRET_KEY: KEY,
      STRIPE_WEBHOOK_SECRET: WHSEC,
      STRIPE_API_PORT: String(PORT),
    });
    const client = paymentClient(e);
    expect(paymentClient(e)).toBe(client);
    const account = await client.accounts.create({ type: "express" });
    expect(account.id).toMatch(/^acct_test_/);
    await onboarded();
    await control.flush();
    const { body, signature } = receiver.raw[0]!;
    const event = verifyPaymentEvent(body, signature, e);
    expect(event.type).toBe("account.updated");
    expect(() => verifyPaymentEvent(body.replace("account", "acc0unt"), signature, e)).toThrow(
      Stripe.errors.StripeSignatureVerificationError,
    );
  });

  it("keeps its state across a restart when given a folder", async () => {
    const dir = mkdtempSync(join(tmpdir(), "payfake-"));
    try {
      const port = PORT + 1;
      const first = await startPaymentsFake({ port, secretKey: KEY, webhookUrl: null, dir });
      const client = paymentsFakeControl(first.url, KEY).client();
      const account = await client.accounts.create({ type: "express", email: "kept@example.test" });
      await first.close();
      const second = await startPaymentsFake({ port, secretKey: KEY, webhookUrl: null, dir });
      try {
        expect((await client.accounts.retrieve(account.id)).email).toBe("kept@example.test");
        expect((await client.accounts.create({ type: "express" })).id).not.toBe(account.id);
      } finally {
        await second.close();
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it("refuses to start in production", async () => {
    const before = process.env.APP_ENV;
    process.env.APP_ENV = "production";
    try {
      await expect(startPaymentsFake({ port: PORT + 2, secretKey: KEY })).rejects.toThrow(
        /production/,
      );
    } finally {
      if (before === undefined) delete process.env.APP_ENV;
      else process.env.APP_ENV = before;
    }
  });
});
