"use server";

import { revalidatePath } from "next/cache";
import { actionFailure, actionUser, formValues, type ActionState } from "@/lib/server/action-state";
import { db } from "@/lib/server/db";
import { acceptQuote, declineQuote, submitQuote, withdrawQuote } from "@/lib/server/quotes";

export type QuoteActionState = ActionState;

export async function sendQuote(
  requestId: number,
  _prev: QuoteActionState,
  formData: FormData,
): Promise<QuoteActionState> {
  const user = await actionUser();
  const values = formValues(formData);
  try {
    await submitQuote(db(), user, requestId, values as never);
  } catch (err) {
    return actionFailure(err, values);
  }
  revalidatePath(`/requests/${requestId}`);
  return { ok: true, message: "Quote sent. The homeowner gets an e-mail." };
}

export async function takeBackQuote(requestId: number, quoteId: number): Promise<void> {
  const user = await actionUser();
  await withdrawQuote(db(), user, quoteId);
  revalidatePath(`/requests/${requestId}`);
}

export async function acceptQuoteAction(
  requestId: number,
  quoteId: number,
  _prev: QuoteActionState,
): Promise<QuoteActionState> {
  const user = await actionUser();
  try {
    await acceptQuote(db(), user, quoteId);
  } catch (err) {
    return actionFailure(err);
  }
  revalidatePath(`/requests/${requestId}`);
  return { ok: true, message: "Accepted. Payment into held funds comes next." };
}

export async function declineQuoteAction(
  requestId: number,
  quoteId: number,
  formData: FormData,
): Promise<void> {
  const user = await actionUser();
  await declineQuote(db(), user, quoteId, String(formData.get("reason") ?? "") || undefined);
  revalidatePath(`/requests/${requestId}`);
}
