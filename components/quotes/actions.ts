"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { z } from "zod";
import { formValues, runAction, type ActionState } from "@/lib/server/action";
import { db } from "@/lib/server/db";
import { idSchema } from "@/lib/data/errors";
import { acceptQuote, declineQuote, submitQuote, withdrawQuote } from "@/lib/data/quotes";

export type QuoteActionState = ActionState;

const quoteIds = z.object({ requestId: idSchema, quoteId: idSchema });

export async function sendQuote(
  requestId: number,
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    roles: ["reviewer"],
    schema: z.object({ requestId: idSchema }),
    input: { requestId },
    values,
    run: (actor, ids) => submitQuote(db(), actor, ids.requestId, values),
    done: "Quote sent. The homeowner gets an e-mail.",
    after: (_r, ids) => revalidatePath(`/requests/${ids.requestId}`),
  });
}

export async function takeBackQuote(_prev: ActionState, formData: FormData): Promise<ActionState> {
  return runAction({
    roles: ["reviewer"],
    schema: quoteIds,
    input: formValues(formData),
    run: (actor, ids) => withdrawQuote(db(), actor, ids.quoteId),
    done: "Your quote is withdrawn.",
    after: (_r, ids) => revalidatePath(`/requests/${ids.requestId}`),
  });
}

export async function acceptQuoteAction(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  return runAction({
    roles: ["homeowner"],
    schema: quoteIds,
    input: formValues(formData),
    run: (actor, ids) => acceptQuote(db(), actor, ids.quoteId),
    done: "Accepted. Next, pay into held funds from the job page.",
    after: (jobId) => redirect(`/jobs/${jobId}`),
  });
}

export async function declineQuoteAction(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    roles: ["homeowner"],
    schema: quoteIds.extend({ reason: z.string().trim().max(1000).optional() }),
    input: values,
    values,
    run: (actor, v) => declineQuote(db(), actor, v.quoteId, v.reason || undefined),
    done: "Quote declined. The reviewer is told.",
    after: (_r, ids) => revalidatePath(`/requests/${ids.requestId}`),
  });
}
