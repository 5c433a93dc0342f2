"use server";

import { redirect } from "next/navigation";
import {
  createAccount,
  requestPasswordReset,
  resendVerification,
  resetPassword,
  verifyEmail,
} from "@/lib/data/accounts";
import { publicAction, runAction, type ActionState } from "@/lib/server/action";
import { db } from "@/lib/server/db";
import { env } from "@/lib/env";
import { forgotPasswordSchema, resetPasswordSchema, signUpSchema } from "@/lib/validation/auth";
import { z } from "zod";

export type { ActionState } from "@/lib/server/action";

// Sign-up, password reset and e-mail confirmation are for people who are not signed in, so they
// go through publicAction: the same parse-first shape as runAction, without an actor.

export async function signUp(input: unknown): Promise<ActionState> {
  return publicAction({
    schema: signUpSchema,
    input,
    run: (v, client) => createAccount(db(), v, env().APP_URL, client.address),
  });
}

export async function requestReset(input: unknown): Promise<ActionState> {
  return publicAction({
    schema: forgotPasswordSchema,
    input,
    run: (v, client) => requestPasswordReset(db(), v.email, env().APP_URL, client.address),
    // The same answer whether or not the address is registered.
    done: "If an account uses that address, a reset link is on its way. It works for one hour.",
  });
}

export async function chooseNewPassword(input: unknown): Promise<ActionState> {
  return publicAction({
    schema: resetPasswordSchema,
    input,
    run: (v) => resetPassword(db(), v),
    done: "Your password is changed. You can sign in now.",
  });
}

/** The confirmation page's button: the link's token confirms the address. */
export async function confirmEmail(formData: FormData): Promise<void> {
  const raw = formData instanceof FormData ? formData.get("token") : null;
  const token = z
    .string()
    .regex(/^[A-Za-z0-9_-]{20,100}$/)
    .safeParse(raw);
  const ok = token.success && (await verifyEmail(db(), token.data));
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
