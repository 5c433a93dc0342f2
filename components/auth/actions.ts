"use server";

import {
  createAccount,
  requestPasswordReset,
  resetPassword,
  type FieldErrors,
} from "@/lib/server/accounts";
import { db } from "@/lib/server/db";
import { env } from "@/lib/env";
import type { ForgotPasswordInput, ResetPasswordInput, SignUpInput } from "@/lib/validation/auth";
import { forgotPasswordSchema } from "@/lib/validation/auth";

export type ActionState = { ok: boolean; message?: string; fieldErrors?: FieldErrors };

export async function signUp(input: SignUpInput): Promise<ActionState> {
  try {
    const r = await createAccount(db(), input, env().APP_URL);
    return r.ok ? { ok: true } : { ok: false, message: r.message, fieldErrors: r.fieldErrors };
  } catch (err) {
    console.error("signUp failed", err);
    return { ok: false, message: "We could not create the account just now. Please try again." };
  }
}

export async function requestReset(input: ForgotPasswordInput): Promise<ActionState> {
  const parsed = forgotPasswordSchema.safeParse(input);
  if (!parsed.success)
    return { ok: false, fieldErrors: { email: ["Enter a valid e-mail address"] } };
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

export async function chooseNewPassword(input: ResetPasswordInput): Promise<ActionState> {
  try {
    const r = await resetPassword(db(), input);
    return r.ok
      ? { ok: true, message: "Your password is changed. You can sign in now." }
      : { ok: false, message: r.message, fieldErrors: r.fieldErrors };
  } catch (err) {
    console.error("resetPassword failed", err);
    return { ok: false, message: "We could not change the password just now. Please try again." };
  }
}
