import "server-only";
import type { Knex } from "knex";
import bcrypt from "bcryptjs";
import { z } from "zod";
import { signUpSchema, resetPasswordSchema, type SignUpInput } from "@/lib/validation/auth";
import { enqueueEmail } from "@/lib/mail/outbox";
import { consumeToken, issueToken } from "./auth/tokens";
import { isCommonPassword } from "./auth/common-passwords";

export type Role = "homeowner" | "reviewer" | "admin";
export type FieldErrors = Record<string, string[]>;
export type Result<T> =
  { ok: true; value: T } | { ok: false; fieldErrors: FieldErrors; message: string };

const BCRYPT_ROUNDS = 11;
// Compared against when the address is unknown, so a wrong address takes as long as a wrong password.
const DUMMY_HASH = bcrypt.hashSync("not-a-real-password-0000", BCRYPT_ROUNDS);

export interface AuthUser {
  id: number;
  email: string;
  role: Role;
  displayName: string;
}

function passwordProblems(password: string): string[] {
  return isCommonPassword(password)
    ? ["This password is on a list of common passwords: choose another"]
    : [];
}

/** A fresh single-use verification link, e-mailed in the caller's transaction. */
async function queueVerification(
  trx: Knex.Transaction,
  user: { id: number; email: string; name: string },
  appUrl: string,
  dedupeKey?: string,
) {
  const token = await issueToken(trx, user.id, "verify_email");
  await enqueueEmail(trx, {
    to: { address: user.email, userId: user.id },
    template: "verify_email",
    payload: { name: user.name, url: `${appUrl}/verify-email?token=${token}` },
    dedupeKey,
  });
}

/** Sign-up: the account, and the verification e-mail in the same transaction. */
export async function createAccount(
  knex: Knex,
  input: SignUpInput,
  appUrl: string,
): Promise<Result<AuthUser>> {
  const parsed = signUpSchema.safeParse(input);
  if (!parsed.success) {
    const { fieldErrors } = z.flattenError(parsed.error);
    return {
      ok: false,
      fieldErrors: fieldErrors as FieldErrors,
      message: "Some details need attention.",
    };
  }
  const v = parsed.data;
  const common = passwordProblems(v.password);
  if (common.length)
    return {
      ok: false,
      fieldErrors: { password: common },
      message: "Some details need attention.",
    };
  const hash = await bcrypt.hash(v.password, BCRYPT_ROUNDS);
  try {
    return await knex.transaction(async (trx) => {
      const [id] = await trx("users").insert({
        email: v.email,
        password_hash: hash,
        role: v.role,
        display_name: v.displayName,
      });
      const userId = Number(id);
      await queueVerification(trx, { id: userId, email: v.email, name: v.displayName }, appUrl);
      await trx("audit_log").insert({
        actor_id: userId,
        action: "user.signed_up",
        entity_type: "user",
        entity_id: userId,
        detail: JSON.stringify({ role: v.role }),
      });
      return {
        ok: true as const,
        value: { id: userId, email: v.email, role: v.role, displayName: v.displayName },
      };
    });
  } catch (err) {
    if ((err as { code?: string }).code === "ER_DUP_ENTRY") {
      return {
        ok: false,
        fieldErrors: {
          email: ["An account with this e-mail already exists: sign in or reset the password"],
        },
        message: "Some details need attention.",
      };
    }
    throw err;
  }
}

/** Check a password; null for an unknown address or a wrong password (the caller cannot tell which). */
export async function authenticate(
  knex: Knex,
  email: string,
  password: string,
): Promise<AuthUser | null> {
  const row = await knex("users")
    .where({ email: email.trim().toLowerCase() })
    .first("id", "email", "role", "display_name", "password_hash");
  const ok = await bcrypt.compare(password, row?.password_hash ?? DUMMY_HASH);
  if (!row || !ok) return null;
  return { id: Number(row.id), email: row.email, role: row.role, displayName: row.display_name };
}

export async function verifyEmail(knex: Knex, token: string): Promise<boolean> {
  return knex.transaction(async (trx) => {
    const userId = await consumeToken(trx, token, "verify_email");
    if (!userId) return false;
    await trx("users")
      .where({ id: userId })
      .update({ email_verified_at: trx.raw("CURRENT_TIMESTAMP(3)") });
    await trx("audit_log").insert({
      actor_id: userId,
      action: "user.email_verified",
      entity_type: "user",
      entity_id: userId,
      detail: "{}",
    });
    return true;
  });
}

/** Always succeeds from the caller's view: whether the address exists is never revealed. */
export async function requestPasswordReset(
  knex: Knex,
  email: string,
  appUrl: string,
): Promise<void> {
  await knex.transaction(async (trx) => {
    const user = await trx("users")
      .where({ email: email.trim().toLowerCase() })
      .first("id", "email", "display_name");
    if (!user) return;
    const token = await issueToken(trx, Number(user.id), "reset_password");
    await enqueueEmail(trx, {
      to: { address: user.email, userId: Number(user.id) },
      template: "reset_password",
      payload: { name: user.display_name, url: `${appUrl}/reset-password?token=${token}` },
    });
  });
}

export async function resetPassword(
  knex: Knex,
  input: { token: string; password: string; confirm: string },
): Promise<Result<null>> {
  const parsed = resetPasswordSchema.safeParse(input);
  if (!parsed.success) {
    const { fieldErrors } = z.flattenError(parsed.error);
    return {
      ok: false,
      fieldErrors: fieldErrors as FieldErrors,
      message: "Some details need attention.",
    };
  }
  const common = passwordProblems(parsed.data.password);
  if (common.length)
    return {
      ok: false,
      fieldErrors: { password: common },
      message: "Some details need attention.",
    };
  const hash = await bcrypt.hash(parsed.data.password, BCRYPT_ROUNDS);
  return knex.transaction(async (trx) => {
    const userId = await consumeToken(trx, parsed.data.token, "reset_password");
    if (!userId)
      return {
        ok: false as const,
        fieldErrors: { token: ["This link has expired or was already used: ask for a new one"] },
        message: "This link has expired or was already used.",
      };
    await trx("users").where({ id: userId }).update({ password_hash: hash });
    await trx("audit_log").insert({
      actor_id: userId,
      action: "user.password_reset",
      entity_type: "user",
      entity_id: userId,
      detail: "{}",
    });
    return { ok: true as const, value: null };
  });
}

/** A fresh verification link for a signed-in user who has not confirmed yet (at most one a minute). */
export async function resendVerification(
  knex: Knex,
  userId: number,
  appUrl: string,
): Promise<void> {
  await knex.transaction(async (trx) => {
    const user = await trx("users")
      .where({ id: userId })
      .forUpdate()
      .first("id", "email", "display_name", "email_verified_at");
    if (!user || user.email_verified_at) return;
    await queueVerification(
      trx,
      { id: userId, email: user.email, name: user.display_name },
      appUrl,
      // At most one resend a minute, however often the button is pressed.
      `verify-${userId}-${new Date().toISOString().slice(0, 16)}`,
    );
  });
}
