"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { formValues, runAction, type ActionState } from "@/lib/server/action";
import { db } from "@/lib/server/db";
import { idSchema } from "@/lib/data/errors";
import { decideCredential, setSuspension } from "@/lib/data/reviewers";
import { env } from "@/lib/env";

export type AdminFormState = ActionState;

export async function decideCredentialAction(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    roles: ["admin"],
    schema: z.object({ decision: z.enum(["verify", "reject"]) }),
    input: values,
    values,
    run: (actor) => decideCredential(db(), actor, values, env().APP_URL),
    done: values.decision === "verify" ? "Verified." : "Rejected.",
    // No revalidation here: the form shows its confirmation first, then refreshes the queue.
  });
}

export async function suspensionAction(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    roles: ["admin"],
    schema: z.object({ reviewerId: idSchema, suspend: z.enum(["0", "1"]) }),
    input: values,
    values,
    run: (actor, v) =>
      setSuspension(db(), actor, {
        reviewerId: v.reviewerId,
        suspend: v.suspend === "1",
        reason: values.reason ?? "",
      }),
    done: (_r) => (values.suspend === "1" ? "Reviewer suspended." : "Reviewer reinstated."),
    after: (_r, v) => revalidatePath(`/admin/reviewers/${v.reviewerId}`),
  });
}
