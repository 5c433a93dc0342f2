import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { db } from "@/lib/server/db";
import { getCurrentUser } from "@/lib/server/auth/session";
import { getReviewerProfile, getVerificationStatus, listVerifiedKinds } from "@/lib/data/reviewers";
import { credentialName } from "@/lib/credentials";
import { regionName } from "@/lib/regions";
import { SPECIALISMS } from "@/lib/validation/reviewer";
import { Card } from "@/components/ui/card";
import { CredentialStatus } from "@/components/reviewer/credential-status";

export const metadata: Metadata = { title: "Reviewer" };

export default async function PublicReviewerPage({ params }: { params: Promise<{ id: string }> }) {
  const id = Number((await params).id);
  if (!Number.isInteger(id) || id <= 0) notFound();
  // The public view: a suspended reviewer's profile is not shown, even to themself here.
  const viewer = await getCurrentUser();
  const profile = await getReviewerProfile(db(), viewer, id);
  if (!profile || profile.suspendedAt) notFound();
  const [status, badges] = await Promise.all([
    getVerificationStatus(db(), id),
    listVerifiedKinds(db(), id),
  ]);
  return (
    <div className="max-w-3xl space-y-4">
      <h1 className="text-3xl font-bold">{profile.tradingName}</h1>
      <p className="text-slate-700">
        {regionName(profile.region)} · {profile.yearsInTrade} years in the trade{" "}
        {status.verified ? "· verified by Loopwright" : "· not yet verified"}
      </p>
      <Card>
        <p className="whitespace-pre-line">{profile.bio}</p>
        <p className="mt-3 text-sm text-slate-600">
          Works on:{" "}
          {profile.specialisms
            .map((s) => SPECIALISMS.find((x) => x.id === s)?.label ?? s)
            .join(", ") || "—"}
        </p>
      </Card>
      <Card>
        <h2 className="text-xl font-bold">Verified credentials</h2>
        <ul className="mt-2 space-y-2">
          {badges.length === 0 ? (
            <li>None yet.</li>
          ) : (
            badges.map((b) => (
              <li key={b} className="flex items-center gap-2">
                <CredentialStatus status="verified" /> {credentialName(b)}
              </li>
            ))
          )}
        </ul>
      </Card>
    </div>
  );
}
