import "server-only";
import { redirect } from "next/navigation";
import { getCurrentUser } from "./auth/session";
import { HttpError } from "./errors";

/** What a form's server action answers: success, or a message and errors beside the fields. */
export interface ActionState {
  ok: boolean;
  message?: string;
  fieldErrors?: Record<string, string[]>;
  /** What the person typed, echoed back so nothing is lost on a failed submit. */
  values?: Record<string, string>;
}

/** The signed-in user for a server action; a signed-out visitor goes to sign-in. */
export async function actionUser() {
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in");
  return user;
}

/** An expected failure (HttpError) becomes field errors; anything else is logged and stays vague. */
export function actionFailure(err: unknown, values?: Record<string, string>): ActionState {
  if (err instanceof HttpError)
    return { ok: false, message: err.message, fieldErrors: err.fieldErrors, values };
  console.error(err);
  return {
    ok: false,
    message: "Something went wrong on our side; what you typed is still here. Please try again.",
    values,
  };
}

/** A form's text fields as a plain object, without React's internal `$ACTION` keys. */
export function formValues(formData: FormData): Record<string, string> {
  return Object.fromEntries(
    [...formData.entries()].filter(([k]) => !k.startsWith("$")).map(([k, v]) => [k, String(v)]),
  );
}
