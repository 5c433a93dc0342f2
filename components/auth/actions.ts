"use server";

import { redirect } from "next/navigation";
import {
  createAccount,
  requestPasswordReset,
  resendVerification,
  resetPassword,
  verifyEmail,
} from "@/lib/data/accounts";
import { failure, runAction, type ActionState } from "@/lib/server/action";
import { db } from "@/lib/server/db";
import { env } from "@/lib/env";
import { forgotPasswordSchema } from "@/lib/validation/auth";
import { fieldErrorsOf } from "@/lib/data/errors";
import { z } from "zod";

export type { ActionState } from "@/lib/server/action";

// Sign-up, password reset and e-mail confirmation are for people who are not signed in, so they
// do not go through runAction (which needs an actor); they keep its answer shape.

export async function signUp(input: unknown): Promise<ActionState> {
  try {
    await createAccount(db(), input, env().APP_URL);
    return { ok: true };
  } catch (err) {
    return failure(err);
  }
}

export async function requestReset(input: unknown): Promise<ActionState> {
  const parsed = forgotPasswordSchema.safeParse(input);
  if (!parsed.success)
    return {
      ok: false,
      message: "Some details need attention.",
      fieldErrors: fieldErrorsOf(parsed.error),
    };
  try {
    await requestPasswordReset(db(), parsed.data.email, env().APP_URL);
  } catch (err) {
    console.error("requestReset failed", err);
  }
  // The same answer whether or not the address is registered.
  return {
    ok: true,
    message: "If an account uses that address, a reset link is on its way. It works for one hour.",
  };
}

export async function chooseNewPassword(input: unknown): Promise<ActionState> {
  try {
    await resetPassword(db(), input);
    return { ok: true, message: "Your password is changed. You can sign in now." };
  } catch (err) {
    return failure(err);
  }
}

/** The confirmation page's button: the link's token confirms the address. */
export async function confirmEmail(formData: FormData): Promise<void> {
  const token = formData instanceof FormData ? formData.get("token") : null;
  const ok = await verifyEmail(db(), typeof token === "string" ? token : "");
  redirect(ok ? "/verify-email?done=1" : "/verify-email?failed=1");
}

/** The dashboard banner's button: a fresh confirmation link. */
export async function resendConfirmation(
  _prev: ActionState,
  _formData: FormData,
): Promise<ActionState> {
  return runAction({
    schema: z.object({}),
    input: {},
    run: (actor) => resendVerification(db(), actor, env().APP_URL),
    done: "A new confirmation link is on its way: check the inbox.",
  });
}
