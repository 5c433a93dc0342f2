import { formatDate } from "@/lib/labels";
import type { Metadata } from "next";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { getVerificationStatus, listOwnCredentials } from "@/lib/data/reviewers";
import { credentialName } from "@/lib/credentials";
import { Card } from "@/components/ui/card";
import { CredentialForm } from "@/components/reviewer/credential-form";
import { CredentialStatus } from "@/components/reviewer/credential-status";
import { EvidenceUpload } from "@/components/uploads/evidence-upload";

export const metadata: Metadata = { title: "Your credentials" };

export default async function CredentialsPage() {
  const user = await pageUser("/reviewer/credentials", ["reviewer"]);
  const actor = { id: user.id, role: user.role };
  const [credentials, status] = await Promise.all([
    listOwnCredentials(db(), actor),
    getVerificationStatus(db(), user.id),
  ]);
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-bold">Your credentials</h1>
      <p className="text-slate-700">
        {status.verified
          ? "You are verified. Keep each credential current: we e-mail you 30 days before one expires."
          : `Still needed before you can quote: ${status.missing.map(credentialName).join(", ") || "a trade profile"}.`}
      </p>
      <Card>
        <h2 className="mb-3 text-xl font-bold">Submitted</h2>
        {credentials.length === 0 ? (
          <p>None yet.</p>
        ) : (
          <table className="w-full text-left">
            <thead>
              <tr className="border-b border-slate-200 text-sm text-slate-600">
                <th className="py-2">Kind</th>
                <th>Issuer and number</th>
                <th>Expires</th>
                <th>Status</th>
              </tr>
            </thead>
            <tbody>
              {credentials.map((c) => (
                <tr key={c.id} className="border-b border-slate-100 align-top">
                  <td className="py-2 font-medium">{credentialName(c.kind)}</td>
                  <td>
                    {c.issuer}
                    <br />
                    <span className="font-mono text-sm">{c.number}</span>
                  </td>
                  <td className="whitespace-nowrap">{formatDate(c.expiresOn)}</td>
                  <td>
                    <CredentialStatus status={c.status} />
                    {c.adminReason ? <p className="mt-1 text-sm">Reason: {c.adminReason}</p> : null}
                    {c.evidenceAttachmentId ? (
                      <a
                        className="mt-1 block text-sm underline"
                        href={`/api/files/${c.evidenceAttachmentId}`}
                        target="_blank"
                        rel="noreferrer"
                      >
                        View the uploaded document
                      </a>
                    ) : null}
                    <EvidenceUpload
                      credentialId={c.id}
                      hasEvidence={c.evidenceAttachmentId !== null}
                    />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </Card>
      <Card>
        <h2 className="mb-3 text-xl font-bold">Add a credential</h2>
        <p className="mb-3 text-sm text-slate-600">
          After adding it, upload the certificate or policy document beside it above. The admin
          checks it against the issuer&apos;s register before verifying.
        </p>
        <CredentialForm />
      </Card>
    </div>
  );
}
