"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { HttpError } from "@/lib/server/errors";
import { getCurrentUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { acceptQuote, declineQuote, submitQuote, withdrawQuote } from "@/lib/server/quotes";

export interface QuoteActionState {
  ok: boolean;
  message?: string;
  fieldErrors?: Record<string, string[]>;
  values?: Record<string, string>;
}

async function actor() {
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in");
  return user;
}

function failure(err: unknown, values?: Record<string, string>): QuoteActionState {
  if (err instanceof HttpError)
    return { ok: false, message: err.message, fieldErrors: err.fieldErrors, values };
  console.error(err);
  return { ok: false, message: "Something went wrong on our side. Please try again.", values };
}

export async function sendQuote(
  requestId: number,
  _prev: QuoteActionState,
  formData: FormData,
): Promise<QuoteActionState> {
  const user = await actor();
  const values = Object.fromEntries(
    [...formData.entries()].filter(([k]) => !k.startsWith("$")).map(([k, v]) => [k, String(v)]),
  );
  try {
    await submitQuote(db(), user, requestId, values as never);
  } catch (err) {
    return failure(err, values);
  }
  revalidatePath(`/requests/${requestId}`);
  return { ok: true, message: "Quote sent. The homeowner gets an e-mail." };
}

export async function takeBackQuote(requestId: number, quoteId: number): Promise<void> {
  const user = await actor();
  await withdrawQuote(db(), user, quoteId);
  revalidatePath(`/requests/${requestId}`);
}

export async function acceptQuoteAction(
  requestId: number,
  quoteId: number,
  _prev: QuoteActionState,
): Promise<QuoteActionState> {
  const user = await actor();
  try {
    await acceptQuote(db(), user, quoteId);
  } catch (err) {
    return failure(err);
  }
  revalidatePath(`/requests/${requestId}`);
  return { ok: true, message: "Accepted. Payment into held funds comes next." };
}

export async function declineQuoteAction(
  requestId: number,
  quoteId: number,
  formData: FormData,
): Promise<void> {
  const user = await actor();
  await declineQuote(db(), user, quoteId, String(formData.get("reason") ?? "") || undefined);
  revalidatePath(`/requests/${requestId}`);
}
