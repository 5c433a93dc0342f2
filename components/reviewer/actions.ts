"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { formValues, runAction, type ActionState } from "@/lib/server/action";
import { db } from "@/lib/server/db";
import { addCredential, saveReviewerProfile } from "@/lib/data/reviewers";

export type FormState = ActionState;

export async function saveProfile(_prev: ActionState, formData: FormData): Promise<ActionState> {
  const values = formValues(formData, ["specialisms"]);
  return runAction({
    roles: ["reviewer"],
    schema: z.object({}),
    input: {},
    values,
    run: (actor) => saveReviewerProfile(db(), actor, { specialisms: [], ...values }),
    done: "Profile saved.",
    after: () => revalidatePath("/reviewer/profile"),
  });
}

export async function submitCredential(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    roles: ["reviewer"],
    schema: z.object({}),
    input: {},
    values,
    run: (actor) => addCredential(db(), actor, values),
    done: "Credential submitted: an admin will check it.",
    after: () => revalidatePath("/reviewer/credentials"),
  });
}
