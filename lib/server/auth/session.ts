import "server-only";
import { getServerSession } from "next-auth";
import { forbidden as forbiddenPage, redirect } from "next/navigation";
import { getSessionUser, type SessionUser } from "@/lib/data/accounts";
import { forbidden, unauthorized } from "@/lib/data/errors";
import type { Role } from "@/lib/data/actor";
import { db } from "../db";
import { authOptions } from "./options";

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
