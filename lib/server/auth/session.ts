import "server-only";
import { getServerSession } from "next-auth";
import { cookies } from "next/headers";
import { forbidden as forbiddenPage, redirect } from "next/navigation";
import { getSessionUser, type SessionUser } from "@/lib/data/accounts";
import { forbidden, unauthorized } from "@/lib/data/errors";
import type { Actor, Role } from "@/lib/data/actor";
import { db } from "../db";
import { authOptions } from "./options";
import { decodeSessionToken } from "./jwt";

export type CurrentUser = SessionUser;

/** The signed-in user, read fresh from the database, or null. */
export async function getCurrentUser(): Promise<CurrentUser | null> {
  const session = await getServerSession(authOptions());
  const user = session?.user as { id?: number; sv?: number } | undefined;
  if (!user?.id) return null;
  // The same one-row read as before, now also matching the session version.
  return getSessionUser(db(), user.id, user.sv ?? 0);
}

/** For route handlers and actions: 401 when signed out. */
export async function requireUser(): Promise<CurrentUser> {
  const user = await getCurrentUser();
  if (!user) throw unauthorized();
  return user;
}

/** For route handlers and actions: 401 when signed out, 403 for another role. */
export async function requireRole(...roles: Role[]): Promise<CurrentUser> {
  const user = await requireUser();
  if (!roles.includes(user.role)) throw forbidden();
  return user;
}

/**
 * For pages: signed-out visitors go to sign-in and come back; a wrong role gets our 403 page
 * (app/(app)/forbidden.tsx) with status 403.
 */
export async function pageUser(path: string, roles?: readonly Role[]): Promise<CurrentUser> {
  const user = await getCurrentUser();
  if (!user) redirect(`/sign-in?callbackUrl=${encodeURIComponent(path)}`);
  if (roles && !roles.includes(user.role)) forbiddenPage();
  return user;
}

/**
 * The cheap session check for JSON routes whose data function reads the user's row itself (the
 * board reads role, suspension and credentials in its own query): the session cookie's token is
 * decrypted and its expiry checked, with no database read and without running next-auth's session
 * handler (which also re-issues the cookie). 401 when signed out, 403 for another role.
 */
export async function requireTokenActor(...roles: Role[]): Promise<Actor> {
  const options = authOptions();
  const name = `${options.useSecureCookies ? "__Secure-" : ""}next-auth.session-token`;
  const jar = await cookies();
  // next-auth splits a large token into name.0, name.1, …
  const raw =
    jar.get(name)?.value ??
    jar
      .getAll()
      .filter((c) => c.name.startsWith(`${name}.`))
      .sort((a, b) => Number(a.name.slice(name.length + 1)) - Number(b.name.slice(name.length + 1)))
      .map((c) => c.value)
      .join("");
  if (!raw) throw unauthorized();
  const token = await decodeSessionToken({ token: raw, secret: options.secret! }).catch(() => null);
  if (!token?.uid || !token.role) throw unauthorized();
  if (!roles.includes(token.role)) throw forbidden();
  // The caller's data function compares the version with the database (see Actor).
  return { id: Number(token.uid), role: token.role, sessionVersion: Number(token.sv ?? 0) };
}
