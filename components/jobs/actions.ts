"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import { z } from "zod";
import { idSchema } from "@/lib/data/errors";
import {
  cancelJob,
  cancelJobWithRefund,
  openDispute,
  releaseJob,
  settleDispute,
  startCheckout,
} from "@/lib/data/jobs";
import { startPayoutSetup } from "@/lib/data/payments";
import { formValues, runAction, type ActionState } from "@/lib/server/action";
import { db } from "@/lib/server/db";

const jobIds = z.object({ jobId: idSchema });
const refresh = (_r: unknown, ids: { jobId: number }) => revalidatePath(`/jobs/${ids.jobId}`);

/** Pay: off to the payment service's checkout page. */
export async function payForJob(_prev: ActionState, formData: FormData): Promise<ActionState> {
  return runAction({
    roles: ["homeowner"],
    schema: jobIds,
    input: formValues(formData),
    run: (actor, ids) => startCheckout(db(), actor, ids.jobId),
    done: "Opening the payment page…",
    after: (url) => redirect(url),
  });
}

export async function cancelJobAction(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  return runAction({
    roles: ["homeowner"],
    schema: jobIds,
    input: formValues(formData),
    run: (actor, ids) => cancelJob(db(), actor, ids.jobId),
    done: "The job is cancelled. Nothing was charged.",
    after: refresh,
  });
}

export async function cancelForRefundAction(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  return runAction({
    roles: ["homeowner"],
    schema: jobIds,
    input: formValues(formData),
    run: (actor, ids) => cancelJobWithRefund(db(), actor, ids.jobId),
    done: "The job is cancelled and the payment refunded in full.",
    after: refresh,
  });
}

export async function releaseAction(_prev: ActionState, formData: FormData): Promise<ActionState> {
  return runAction({
    roles: ["homeowner"],
    schema: jobIds,
    input: formValues(formData),
    run: (actor, ids) => releaseJob(db(), actor, ids.jobId),
    done: "Released. The reviewer is paid, less the platform fee.",
    after: refresh,
  });
}

export async function disputeAction(_prev: ActionState, formData: FormData): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    roles: ["homeowner"],
    schema: jobIds,
    input: values,
    values,
    run: (actor, ids) => openDispute(db(), actor, ids.jobId, values),
    done: "Your dispute is open. The payment stays held while the Loopwright team looks at it.",
    after: refresh,
  });
}

/** The admin's settlement; a part refund is typed in the currency's major unit (e.g. 40.50). */
export async function settleAction(_prev: ActionState, formData: FormData): Promise<ActionState> {
  const values = formValues(formData);
  const amount = String(values.refundAmount ?? "").trim();
  return runAction({
    roles: ["admin"],
    schema: jobIds.extend({
      refundAmount: z
        .string()
        .regex(/^(\d{1,7}(\.\d{1,2})?)?$/, "An amount such as 40 or 40.50")
        .optional(),
    }),
    input: values,
    values,
    run: (actor, ids) =>
      settleDispute(db(), actor, ids.jobId, {
        resolution: values.resolution,
        note: values.note,
        ...(values.resolution === "partial_refund"
          ? { refundMinor: amount ? Math.round(Number(amount) * 100) : undefined }
          : {}),
      }),
    done: "The dispute is settled. Both sides get an e-mail.",
    after: (_r, ids) => {
      revalidatePath(`/jobs/${ids.jobId}`);
      revalidatePath("/admin/disputes");
    },
  });
}

/** A reviewer sets up their payout account on the payment service's page. */
export async function setUpPayoutAccount(
  _prev: ActionState,
  _formData: FormData,
): Promise<ActionState> {
  return runAction({
    roles: ["reviewer"],
    schema: z.object({}),
    input: {},
    run: (actor) => startPayoutSetup(db(), actor),
    done: "Opening the payout account set-up…",
    after: (url) => redirect(url),
  });
}
