"use server";

import { revalidatePath } from "next/cache";
import { z } from "zod";
import { savePreferences } from "@/lib/data/preferences";
import { formValues, runAction, type ActionState } from "@/lib/server/action";
import { db } from "@/lib/server/db";

export async function saveNotificationSettings(
  _prev: ActionState,
  formData: FormData,
): Promise<ActionState> {
  const values = formValues(formData);
  return runAction({
    schema: z.object({}),
    input: {},
    run: (actor) =>
      savePreferences(db(), actor, {
        notifyNewMessage: values.notifyNewMessage === "on",
        notifyNewQuote: values.notifyNewQuote === "on",
      }),
    done: "Saved.",
    after: () => revalidatePath("/settings/notifications"),
  });
}
