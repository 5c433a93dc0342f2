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
import { listReviewerRatings, ratingSummary } from "@/lib/data/ratings";
import { RatingLine, Stars } from "@/components/aftercare/stars";
import { Markdown } from "@/components/ui/markdown";

export const metadata: Metadata = { title: "Reviewer" };

export default async function PublicReviewerPage({ params }: { params: Promise<{ id: string }> }) {
  const id = Number((await params).id);
  if (!Number.isInteger(id) || id <= 0) notFound();
  // The public view: a suspended reviewer's profile is not shown, even to themself here.
  const viewer = await getCurrentUser();
  const profile = await getReviewerProfile(db(), viewer, id);
  if (!profile || profile.suspendedAt) notFound();
  const [status, badges, summary, ratings] = await Promise.all([
    getVerificationStatus(db(), id),
    listVerifiedKinds(db(), id),
    ratingSummary(db(), id),
    listReviewerRatings(db(), id),
  ]);
  return (
    <div className="max-w-3xl space-y-4">
      <h1 className="text-3xl font-bold">{profile.tradingName}</h1>
      <p className="text-slate-700">
        {regionName(profile.region)} · {profile.yearsInTrade} years in the trade{" "}
        {status.verified ? "· verified by Loopwright" : "· not yet verified"}
      </p>
      <p data-testid="profile-rating">
        <RatingLine summary={summary} />
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
      {ratings.length ? (
        <Card>
          <h2 className="text-xl font-bold">What homeowners said</h2>
          <ul className="mt-2 divide-y divide-slate-100">
            {ratings.map((r) => (
              <li key={r.jobId} className="py-3">
                <Stars stars={r.stars} />
                <span className="ml-2 text-sm text-slate-600">{r.createdAt.slice(0, 10)}</span>
                {r.comment ? <p className="mt-1 whitespace-pre-line">{r.comment}</p> : null}
                {r.replyMd ? (
                  <div className="mt-2 border-l-4 border-slate-200 pl-3 text-sm">
                    <p className="font-semibold">Reply</p>
                    <Markdown>{r.replyMd}</Markdown>
                  </div>
                ) : null}
              </li>
            ))}
          </ul>
        </Card>
      ) : null}
    </div>
  );
}
