"use server";

import { revalidatePath } from "next/cache";
import { HttpError } from "@/lib/server/errors";
import { getCurrentUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { decideCredential, setSuspension } from "@/lib/server/reviewers";
import { env } from "@/lib/env";

export interface AdminFormState {
  ok: boolean;
  message?: string;
  fieldErrors?: Record<string, string[]>;
}

async function asAdmin(
  work: (actor: { id: number; role: "admin" }) => Promise<void>,
  paths: string[],
  done: string,
): Promise<AdminFormState> {
  const user = await getCurrentUser();
  if (!user || user.role !== "admin") return { ok: false, message: "Only admins can do this." };
  try {
    await work({ id: user.id, role: "admin" });
  } catch (err) {
    if (err instanceof HttpError)
      return { ok: false, message: err.message, fieldErrors: err.fieldErrors };
    console.error(err);
    return { ok: false, message: "Something went wrong on our side. Please try again." };
  }
  for (const p of paths) revalidatePath(p);
  return { ok: true, message: done };
}

export async function decideCredentialAction(
  _prev: AdminFormState,
  formData: FormData,
): Promise<AdminFormState> {
  const decision = String(formData.get("decision"));
  const input =
    decision === "verify"
      ? {
          decision: "verify" as const,
          credentialId: Number(formData.get("credentialId")),
          expiresOn: String(formData.get("expiresOn") ?? ""),
        }
      : {
          decision: "reject" as const,
          credentialId: Number(formData.get("credentialId")),
          reason: String(formData.get("reason") ?? ""),
        };
  return asAdmin(
    (actor) => decideCredential(db(), actor, input, env().APP_URL),
    ["/admin/credentials"],
    decision === "verify" ? "Verified." : "Rejected.",
  );
}

export async function suspensionAction(
  _prev: AdminFormState,
  formData: FormData,
): Promise<AdminFormState> {
  const reviewerId = Number(formData.get("reviewerId"));
  const suspend = formData.get("suspend") === "1";
  return asAdmin(
    (actor) =>
      setSuspension(db(), actor, {
        reviewerId,
        suspend,
        reason: String(formData.get("reason") ?? ""),
      }),
    [`/admin/reviewers/${reviewerId}`],
    suspend ? "Reviewer suspended." : "Reviewer reinstated.",
  );
}
