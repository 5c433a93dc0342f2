"use server";

import { revalidatePath } from "next/cache";
import { HttpError } from "@/lib/server/errors";
import { getCurrentUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { addCredential, saveReviewerProfile } from "@/lib/server/reviewers";

export interface FormState {
  ok: boolean;
  message?: string;
  fieldErrors?: Record<string, string[]>;
  values?: Record<string, string | string[]>;
}

function formValues(formData: FormData): Record<string, string | string[]> {
  const out: Record<string, string | string[]> = {};
  for (const key of new Set(formData.keys())) {
    if (key.startsWith("$")) continue;
    const all = formData.getAll(key).map(String);
    out[key] = key === "specialisms" ? all : (all[0] ?? "");
  }
  return out;
}

async function run(
  values: Record<string, string | string[]>,
  work: (actor: { id: number; role: "reviewer" | "homeowner" | "admin" }) => Promise<unknown>,
  path: string,
  done: string,
): Promise<FormState> {
  const user = await getCurrentUser();
  if (!user) return { ok: false, message: "Your session has ended: sign in again.", values };
  try {
    await work(user);
  } catch (err) {
    if (err instanceof HttpError)
      return { ok: false, message: err.message, fieldErrors: err.fieldErrors, values };
    console.error(err);
    return {
      ok: false,
      message: "Something went wrong on our side; nothing was lost. Please try again.",
      values,
    };
  }
  revalidatePath(path);
  return { ok: true, message: done };
}

export async function saveProfile(_prev: FormState, formData: FormData): Promise<FormState> {
  const v = formValues(formData);
  return run(
    v,
    (actor) =>
      saveReviewerProfile(db(), actor, {
        tradingName: String(v.tradingName ?? ""),
        bio: String(v.bio ?? ""),
        yearsInTrade: String(v.yearsInTrade ?? "") as unknown as number,
        specialisms: (v.specialisms as string[] | undefined) ?? [],
        region: String(v.region ?? "") as never,
        centreLat: v.centreLat as never,
        centreLng: v.centreLng as never,
        travelRadiusKm: v.travelRadiusKm as never,
        hourlyRatePounds: v.hourlyRatePounds as never,
      }),
    "/reviewer/profile",
    "Profile saved.",
  );
}

export async function submitCredential(_prev: FormState, formData: FormData): Promise<FormState> {
  const v = formValues(formData);
  return run(
    v,
    (actor) =>
      addCredential(db(), actor, {
        kind: String(v.kind) as never,
        issuer: String(v.issuer ?? ""),
        number: String(v.number ?? ""),
        expiresOn: String(v.expiresOn ?? ""),
      }),
    "/reviewer/credentials",
    "Credential submitted: an admin will check it.",
  );
}
