/**
 * The payment service client, pointed by the environment alone: locally and in tests
 * STRIPE_API_HOST/PORT/PROTOCOL name the fake in mocks/payments; in production they name the
 * real service. Framework-free (no "server-only"), so the worker can use it too.
 */
import Stripe from "stripe";
import { env, type Env } from "../env";

let cached: { signature: string; client: Stripe } | undefined;

/** One SDK instance per configuration; retries once (POSTs carry idempotency keys), 10 s timeout. */
export function paymentClient(e: Env = env()): Stripe {
  const signature = [
    e.STRIPE_SECRET_KEY,
    e.STRIPE_API_HOST,
    e.STRIPE_API_PORT,
    e.STRIPE_API_PROTOCOL,
  ].join("|");
  if (cached?.signature !== signature) {
    cached = {
      signature,
      client: new Stripe(e.STRIPE_SECRET_KEY, {
        host: e.STRIPE_API_HOST,
        port: e.STRIPE_API_PORT,
        protocol: e.STRIPE_API_PROTOCOL,
        maxNetworkRetries: 1,
        timeout: 10_000,
        telemetry: false,
      }),
    };
  }
  return cached.client;
}

/**
 * A webhook's event, checked against its Stripe-Signature header with the webhook secret.
 * `rawBody` must be the request body exactly as received. Throws
 * Stripe.errors.StripeSignatureVerificationError when the signature does not match.
 */
export function verifyPaymentEvent(
  rawBody: string | Buffer,
  signatureHeader: string,
  e: Env = env(),
): Stripe.Event {
  return paymentClient(e).webhooks.constructEvent(
    rawBody,
    signatureHeader,
    e.STRIPE_WEBHOOK_SECRET,
  );
}
