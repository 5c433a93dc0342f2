"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { idSchema } from "@/lib/data/errors";
import { countersignFirstFill, saveFirstFill } from "@/lib/data/first-fill";
import { setPhotoItems } from "@/lib/data/photo-tags";
import { rateReviewer, replyToRating } from "@/lib/data/ratings";
import { formValues, runAction, type ActionState } from "@/lib/server/action";
import { db } from "@/lib/server/db";

const jobIds = z.object({ jobId: idSchema });
const jobAndProject = z.object({ jobId: idSchema, projectId: idSchema });

export async function rateReviewerAction(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    roles: ["homeowner"],
    schema: jobIds,
    input: values,
    values,
    run: (actor, ids) => rateReviewer(db(), actor, ids.jobId, values),
    done: "Thank you: your rating is on the reviewer's profile.",
    after: (_r, ids) => revalidatePath(`/jobs/${ids.jobId}`),
  });
}

export async function replyToRatingAction(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    roles: ["reviewer"],
    schema: jobIds,
    input: values,
    values,
    run: (actor, ids) => replyToRating(db(), actor, ids.jobId, values),
    done: "Your reply is on your profile beside the rating.",
    after: (_r, ids) => revalidatePath(`/jobs/${ids.jobId}`),
  });
}

export async function tagPhotoAction(_prev: ActionState, formData: FormData): Promise<ActionState> {
  const values = formValues(formData, ["itemKeys"]);
  return runAction({
    roles: ["homeowner"],
    schema: z.object({ projectId: idSchema, attachmentId: idSchema }),
    input: values,
    values,
    run: (actor, ids) =>
      setPhotoItems(db(), actor, ids.projectId, ids.attachmentId, {
        itemKeys: values.itemKeys ?? [],
      }),
    done: (keys) =>
      keys.length === 0
        ? "Saved: this photo is not tagged to any check."
        : `Saved: this photo shows ${keys.length} ${keys.length === 1 ? "check" : "checks"}.`,
    after: (_r, ids) => revalidatePath(`/projects/${ids.projectId}`),
  });
}

export async function saveFirstFillAction(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    roles: ["homeowner"],
    schema: jobAndProject,
    input: values,
    values,
    run: (actor, ids) => saveFirstFill(db(), actor, ids.jobId, values),
    done: "Saved. The comparison with the design is below.",
    after: (_r, ids) => revalidatePath(`/projects/${ids.projectId}/first-fill`),
  });
}

export async function countersignAction(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    roles: ["reviewer"],
    schema: jobAndProject,
    input: values,
    values,
    run: (actor, ids) => countersignFirstFill(db(), actor, ids.jobId, values),
    done: "Countersigned.",
    after: (_r, ids) => revalidatePath(`/projects/${ids.projectId}/first-fill`),
  });
}
