"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { idSchema } from "@/lib/data/errors";
import { addAddendum, answerItemRequest, startJobReview } from "@/lib/data/review";
import { formValues, runAction, type ActionState } from "@/lib/server/action";
import { db } from "@/lib/server/db";

const jobIds = z.object({ jobId: idSchema });

/** The reviewer starts the review: funded → in review, and the draft report is made. */
export async function startReviewAction(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  return runAction({
    roles: ["reviewer"],
    schema: jobIds,
    input: formValues(formData),
    run: (actor, ids) => startJobReview(db(), actor, ids.jobId),
    done: "The review has started. The homeowner has been told.",
    after: (_r, ids) => {
      revalidatePath(`/jobs/${ids.jobId}`);
      revalidatePath(`/jobs/${ids.jobId}/review`);
    },
  });
}

/** The homeowner answers the reviewer's question about one item, in words or with a photo. */
export async function answerItemRequestAction(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    roles: ["homeowner"],
    schema: z.object({ itemRequestId: idSchema, projectId: idSchema }),
    input: values,
    values,
    run: (actor, ids) =>
      answerItemRequest(db(), actor, ids.itemRequestId, {
        answerMd: values.answerMd,
        attachmentId: values.attachmentId,
      }),
    done: "Sent. Your reviewer sees the answer beside the item.",
    after: (_r, ids) => revalidatePath(`/projects/${ids.projectId}`),
  });
}

/** The reviewer adds a dated addendum to a delivered report. */
export async function addAddendumAction(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    roles: ["reviewer"],
    schema: jobIds,
    input: values,
    values,
    run: (actor, ids) => addAddendum(db(), actor, ids.jobId, { bodyMd: values.bodyMd }),
    done: "The addendum is added to the report.",
    after: (_r, ids) => revalidatePath(`/jobs/${ids.jobId}/report`),
  });
}
