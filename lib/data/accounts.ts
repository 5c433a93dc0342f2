import bcrypt from "bcryptjs";
import { signUpSchema, resetPasswordSchema } from "@/lib/validation/auth";
import { isCommonPassword } from "@/lib/passwords";
import { sqlDateTime } from "@/lib/time";
import type { Actor, Role } from "./actor";
import { audit } from "./audit";
import type { Db, Trx } from "./db";
import { parseInput, unprocessable } from "./errors";
import { enqueueEmail } from "./outbox";
import { limitPasswordReset, limitSignUp } from "./rate-limit";
import { consumeToken, issueToken } from "./tokens";

export type { Role } from "./actor";

const BCRYPT_ROUNDS = 11;
// Compared against when the address is unknown, so a wrong address takes as long as a wrong password.
const DUMMY_HASH = bcrypt.hashSync("not-a-real-password-0000", BCRYPT_ROUNDS);

export interface AuthUser {
  id: number;
  email: string;
  role: Role;
  displayName: string;
  sessionVersion: number;
}

function refuseCommonPassword(password: string): void {
  if (isCommonPassword(password))
    throw unprocessable("Some details need attention.", {
      password: ["This password is on a list of common passwords: choose another"],
    });
}

/** A fresh single-use verification link, e-mailed in the caller's transaction. */
async function queueVerification(
  trx: Trx,
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

/**
 * Sign-up: the account, and the verification e-mail in the same transaction. Limited per client
 * address and per e-mail address (lib/data/rate-limit.ts); the limit counts valid attempts only.
 */
export async function createAccount(
  db: Db,
  input: unknown,
  appUrl: string,
  clientAddress: string,
): Promise<AuthUser> {
  const v = parseInput(signUpSchema, input);
  refuseCommonPassword(v.password);
  await limitSignUp(db, clientAddress, v.email);
  const hash = await bcrypt.hash(v.password, BCRYPT_ROUNDS);
  try {
    return await db.transaction(async (trx) => {
      const [id] = await trx("users").insert({
        email: v.email,
        password_hash: hash,
        role: v.role,
        display_name: v.displayName,
      });
      const userId = Number(id);
      await queueVerification(trx, { id: userId, email: v.email, name: v.displayName }, appUrl);
      await audit(trx, userId, "user.signed_up", "user", userId, { role: v.role });
      return {
        id: userId,
        email: v.email,
        role: v.role,
        displayName: v.displayName,
        sessionVersion: 0,
      };
    });
  } catch (err) {
    if ((err as { code?: string }).code === "ER_DUP_ENTRY") {
      throw unprocessable("Some details need attention.", {
        email: ["An account with this e-mail already exists: sign in or reset the password"],
      });
    }
    throw err;
  }
}

/**
 * An admin account, made by the operator from the command line (`npm run admin:create`) or by
 * the demo seed: there is no sign-up for admins. The address counts as confirmed, since the
 * operator typed it.
 */
export async function createAdminAccount(db: Db, input: unknown): Promise<AuthUser> {
  const v = parseInput(signUpSchema.omit({ role: true }), input);
  refuseCommonPassword(v.password);
  const hash = await bcrypt.hash(v.password, BCRYPT_ROUNDS);
  try {
    return await db.transaction(async (trx) => {
      const [id] = await trx("users").insert({
        email: v.email,
        password_hash: hash,
        role: "admin",
        display_name: v.displayName,
        email_verified_at: sqlDateTime(),
      });
      const userId = Number(id);
      await audit(trx, null, "user.admin_created", "user", userId);
      return {
        id: userId,
        email: v.email,
        role: "admin" as const,
        displayName: v.displayName,
        sessionVersion: 0,
      };
    });
  } catch (err) {
    if ((err as { code?: string }).code === "ER_DUP_ENTRY")
      throw unprocessable("Some details need attention.", {
        email: ["An account with this e-mail already exists"],
      });
    throw err;
  }
}

/** Check a password; null for an unknown address or a wrong password (the caller cannot tell which). */
export async function authenticate(
  db: Db,
  email: string,
  password: string,
): Promise<AuthUser | null> {
  const row = await db("users")
    .where({ email: email.trim().toLowerCase() })
    .first("id", "email", "role", "display_name", "password_hash", "session_version");
  const ok = await bcrypt.compare(password, row?.password_hash ?? DUMMY_HASH);
  if (!row || !ok) return null;
  return {
    id: Number(row.id),
    email: row.email,
    role: row.role,
    displayName: row.display_name,
    sessionVersion: Number(row.session_version),
  };
}

/**
 * End every session of a user: the version in their tokens no longer matches. With `from`, only
 * when the version is still that one (a second sign-out of an old cookie changes nothing).
 */
export async function endSessions(db: Db, userId: number, from?: number): Promise<void> {
  const q = db("users").where({ id: userId });
  if (from !== undefined) q.where({ session_version: from });
  await q.increment("session_version", 1);
}

/** Confirm an address with the link's token; false when the link is unknown, used or expired. */
export async function verifyEmail(db: Db, token: string): Promise<boolean> {
  if (!/^[A-Za-z0-9_-]{20,100}$/.test(token)) return false;
  return db.transaction(async (trx) => {
    const userId = await consumeToken(trx, token, "verify_email");
    if (!userId) return false;
    await trx("users").where({ id: userId }).update({ email_verified_at: sqlDateTime() });
    await audit(trx, userId, "user.email_verified", "user", userId);
    return true;
  });
}

/**
 * Always succeeds from the caller's view: whether the address exists is never revealed. Limited
 * per client address and per typed e-mail address, known or not (429, lib/data/rate-limit.ts).
 */
export async function requestPasswordReset(
  db: Db,
  email: string,
  appUrl: string,
  clientAddress: string,
): Promise<void> {
  await limitPasswordReset(db, clientAddress, email);
  await db.transaction(async (trx) => {
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

/** A new password from a reset link; the link is used up, whatever happens next. */
export async function resetPassword(db: Db, input: unknown): Promise<void> {
  const v = parseInput(resetPasswordSchema, input);
  refuseCommonPassword(v.password);
  const hash = await bcrypt.hash(v.password, BCRYPT_ROUNDS);
  await db.transaction(async (trx) => {
    const userId = await consumeToken(trx, v.token, "reset_password");
    if (!userId)
      throw unprocessable("This link has expired or was already used.", {
        token: ["This link has expired or was already used: ask for a new one"],
      });
    await trx("users").where({ id: userId }).update({ password_hash: hash });
    // Whoever knew the old password may hold a session: the new hash bumps users.session_version
    // (a trigger, db/migrations/20261202_0021_session_version.ts), which ends it.
    await audit(trx, userId, "user.password_reset", "user", userId);
  });
}

/** A fresh verification link for a signed-in user who has not confirmed yet (at most one a minute). */
export async function resendVerification(db: Db, actor: Actor, appUrl: string): Promise<void> {
  const userId = actor.id;
  await db.transaction(async (trx) => {
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

/** The signed-in person as every page, action and route handler sees them. */
export interface SessionUser {
  id: number;
  email: string;
  role: Role;
  displayName: string;
  emailVerified: boolean;
  suspended: boolean;
}

/**
 * The user a session names, read fresh, so a suspension or role change takes effect at once;
 * null when the session's version is older than the user's (an ended session).
 */
export async function getSessionUser(
  db: Db,
  id: number,
  sessionVersion: number,
): Promise<SessionUser | null> {
  const row = await db("users as u")
    .leftJoin("reviewer_profiles as rp", "rp.user_id", "u.id")
    .where("u.id", id)
    .where("u.session_version", sessionVersion)
    .first("u.id", "u.email", "u.role", "u.display_name", "u.email_verified_at", "rp.suspended_at");
  if (!row) return null;
  return {
    id: Number(row.id),
    email: row.email,
    role: row.role,
    displayName: row.display_name,
    emailVerified: row.email_verified_at !== null,
    suspended: row.suspended_at !== null && row.suspended_at !== undefined,
  };
}
