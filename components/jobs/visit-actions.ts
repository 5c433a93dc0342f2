"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { idSchema } from "@/lib/data/errors";
import { askForAnotherVisit, confirmVisit, proposeVisit } from "@/lib/data/site-visits";
import { formValues, runAction, type ActionState } from "@/lib/server/action";
import { db } from "@/lib/server/db";

const jobIds = z.object({ jobId: idSchema });
const refresh = (_r: unknown, ids: { jobId: number }) => revalidatePath(`/jobs/${ids.jobId}`);

/** The reviewer proposes (or moves) the site visit. */
export async function proposeVisitAction(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    roles: ["reviewer"],
    schema: jobIds,
    input: values,
    values,
    run: (actor, ids) => proposeVisit(db(), actor, ids.jobId, values),
    done: "Proposed. The homeowner is asked to confirm; you both have the invitation by e-mail.",
    after: refresh,
  });
}

export async function confirmVisitAction(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    roles: ["homeowner"],
    schema: jobIds,
    input: values,
    run: (actor, ids) => confirmVisit(db(), actor, ids.jobId, values),
    done: "Confirmed. The calendar invitation is on its way to you both.",
    after: refresh,
  });
}

export async function askAnotherVisitAction(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    roles: ["homeowner"],
    schema: jobIds,
    input: values,
    values,
    run: (actor, ids) => askForAnotherVisit(db(), actor, ids.jobId, values),
    done: "Sent. The reviewer is asked to propose another time.",
    after: refresh,
  });
}
