import "server-only";
import { getServerSession } from "next-auth";
import { redirect } from "next/navigation";
import { db } from "../db";
import { forbidden, unauthorized } from "../errors";
import type { Role } from "../accounts";
import { authOptions } from "./options";

export interface CurrentUser {
  id: number;
  email: string;
  role: Role;
  displayName: string;
  emailVerified: boolean;
  suspended: boolean;
}

/** The signed-in user, read fresh from the database, or null. */
export async function getCurrentUser(): Promise<CurrentUser | null> {
  const session = await getServerSession(authOptions());
  const id = (session?.user as { id?: number } | undefined)?.id;
  if (!id) return null;
  const row = await db()("users as u")
    .leftJoin("reviewer_profiles as rp", "rp.user_id", "u.id")
    .where("u.id", id)
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

/** For pages: signed-out visitors go to sign-in and come back; a wrong role gets `null` (show a 403). */
export async function pageUser(path: string, roles?: Role[]): Promise<CurrentUser | null> {
  const user = await getCurrentUser();
  if (!user) redirect(`/sign-in?callbackUrl=${encodeURIComponent(path)}`);
  if (roles && !roles.includes(user.role)) return null;
  return user;
}
