import Stripe from "stripe";
import { handlePaymentEvent } from "@/lib/data/payments";
import { verifyPaymentEvent } from "@/lib/payments/client";
import { db } from "@/lib/server/db";
import { errorResponse } from "@/lib/server/http";

/**
 * The payment service's webhooks. The raw body is checked with the SDK's own signature check
 * (a bad signature is a 400 and changes nothing); each event is handled once by its id. A
 * non-2xx answer makes the service retry, so a failure here loses nothing.
 */
export async function POST(req: Request) {
  const raw = await req.text();
  let event: Stripe.Event;
  try {
    event = verifyPaymentEvent(raw, req.headers.get("stripe-signature") ?? "");
  } catch (err) {
    if (err instanceof Stripe.errors.StripeSignatureVerificationError)
      return Response.json({ error: "The signature does not match." }, { status: 400 });
    return Response.json({ error: "Not a payment event." }, { status: 400 });
  }
  try {
    const outcome = await handlePaymentEvent(db(), event);
    return Response.json({ received: true, outcome });
  } catch (err) {
    return errorResponse(err);
  }
}
