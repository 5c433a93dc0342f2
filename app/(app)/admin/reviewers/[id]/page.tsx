import { formatDate } from "@/lib/labels";
import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import {
  getReviewerProfile,
  getReviewerRecord,
  getVerificationStatus,
  listReviewerAudit,
} from "@/lib/data/reviewers";
import { credentialName } from "@/lib/credentials";
import { Card } from "@/components/ui/card";
import { CredentialStatus } from "@/components/reviewer/credential-status";
import { SuspensionForm } from "@/components/admin/decision-forms";

export const metadata: Metadata = { title: "Reviewer record" };

export default async function ReviewerRecordPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await pageUser(`/admin/reviewers/${id}`, ["admin"]);
  const reviewerId = Number(id);
  if (!Number.isInteger(reviewerId) || reviewerId <= 0) notFound();
  const record = await getReviewerRecord(db(), user, reviewerId);
  if (!record) notFound();
  const { account, credentials } = record;
  const [profile, status, audit] = await Promise.all([
    getReviewerProfile(db(), user, reviewerId),
    getVerificationStatus(db(), reviewerId),
    listReviewerAudit(db(), user, reviewerId),
  ]);
  return (
    <div className="space-y-5">
      <h1 className="text-3xl font-bold">{profile?.tradingName ?? account.displayName}</h1>
      <p className="text-slate-700">
        {account.displayName} · {account.email} · joined {account.createdAt.slice(0, 10)}
      </p>
      <Card>
        <h2 className="text-xl font-bold">Status</h2>
        <p className="mt-1">
          {status.suspended
            ? `Suspended: ${profile?.suspendedReason ?? ""}`
            : status.verified
              ? "Verified."
              : `Not verified: missing ${status.missing.map(credentialName).join(", ") || "a profile"}.`}
        </p>
        {profile ? (
          <div className="mt-3 max-w-lg">
            <SuspensionForm reviewerId={reviewerId} suspended={status.suspended} />
          </div>
        ) : (
          <p className="mt-2 text-sm">No profile yet, so nothing to suspend.</p>
        )}
      </Card>
      <Card>
        <h2 className="text-xl font-bold">Credentials</h2>
        <ul className="mt-2 divide-y divide-slate-100">
          {credentials.map((c) => (
            <li key={c.id} className="flex flex-wrap items-center gap-3 py-2">
              <CredentialStatus status={c.status} />{" "}
              <span className="font-medium">{credentialName(c.kind)}</span>
              <span className="text-sm text-slate-600">
                expires {formatDate(c.expiresOn)}
                {c.adminReason ? ` · ${c.adminReason}` : ""}
              </span>
            </li>
          ))}
        </ul>
      </Card>
      <Card>
        <h2 className="text-xl font-bold">Audit log</h2>
        <table className="mt-2 w-full text-left text-sm">
          <thead>
            <tr className="border-b border-slate-200 text-slate-600">
              <th className="py-1">When</th>
              <th>Who</th>
              <th>What</th>
              <th>Detail</th>
            </tr>
          </thead>
          <tbody>
            {audit.map((a) => (
              <tr key={a.id} className="border-b border-slate-100" data-audit={a.action}>
                <td className="py-1 pr-2">{a.createdAt.slice(0, 19)}</td>
                <td className="pr-2">{a.actorName ?? "system"}</td>
                <td className="pr-2 font-medium">{a.action}</td>
                <td className="font-mono text-xs">{JSON.stringify(a.detail)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </Card>
    </div>
  );
}
