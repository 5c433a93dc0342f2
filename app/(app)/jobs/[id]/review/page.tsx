import type { Metadata } from "next";
import Link from "next/link";
import { forbidden, notFound } from "next/navigation";
import { HttpError, parseId } from "@/lib/data/errors";
import { getReviewWorkspace } from "@/lib/data/review";
import { LEVEL_LABELS } from "@/lib/calc/findings";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { Card } from "@/components/ui/card";
import { ActionForm } from "@/components/ui/action-form";
import { Cautions } from "@/components/ui/caution";
import { ButtonLink } from "@/components/ui/button";
import { ReviewWorkspace } from "@/components/review/review-workspace";
import { startReviewAction } from "@/components/review/actions";

export const metadata: Metadata = { title: "Review workspace" };

const SERVICE = { remote_check: "Remote design check", site_visit: "Site visit" } as const;

export default async function ReviewPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await pageUser(`/jobs/${id}/review`, ["reviewer", "admin"]);
  const jobId = (() => {
    try {
      return parseId(id, "job");
    } catch {
      notFound();
    }
  })();
  const ws = await getReviewWorkspace(db(), user, jobId).catch((err: unknown) => {
    if (err instanceof HttpError && err.status === 404) notFound();
    if (err instanceof HttpError && err.status === 403) forbidden();
    throw err;
  });
  const delivered = ws.reportDelivered;
  const canEdit = user.role === "reviewer" && ws.state === "in_review";
  return (
    <div className="space-y-6">
      <div>
        <p className="text-sm text-slate-600">
          <Link href={`/jobs/${ws.jobId}`} className="underline">
            The job
          </Link>{" "}
          · Checklist {ws.catalogueVersion} · loop check worst level: {LEVEL_LABELS[ws.worst]}
        </p>
        <h1 className="text-3xl font-bold">
          {SERVICE[ws.kind]}: {ws.projectTitle}
        </h1>
        <p className="mt-1 text-slate-700">For {ws.homeownerName}. Their questions:</p>
        <blockquote className="mt-1 whitespace-pre-line border-l-4 border-copper-700 pl-3">
          {ws.questions}
        </blockquote>
      </div>
      {ws.state === "funded" ? (
        <Card>
          <h2 className="text-xl font-bold">Start the review</h2>
          <p className="mt-1">
            Starting tells the homeowner you are at work; from then on they can no longer cancel for
            a refund. The checklist below is the one made when the request was posted.
          </p>
          {user.role === "reviewer" ? (
            <ActionForm
              action={startReviewAction}
              fields={{ jobId: ws.jobId }}
              submitLabel="Start the review"
              pendingLabel="Starting…"
              variant="primary"
              className="mt-3"
            />
          ) : null}
        </Card>
      ) : null}
      {ws.state === "awaiting_payment" ? (
        <Card>
          <p className="font-semibold">
            The review can start once the homeowner has paid into held funds.
          </p>
        </Card>
      ) : null}
      {!delivered && ["cancelled", "refunded"].includes(ws.state) ? (
        <Card>
          <p className="font-semibold">This job was cancelled before the review started.</p>
        </Card>
      ) : null}
      {delivered ? (
        <Card>
          <p className="font-semibold">The report is delivered and can no longer be changed.</p>
          <ButtonLink className="mt-3" href={`/jobs/${ws.jobId}/report`}>
            Read the report
          </ButtonLink>
        </Card>
      ) : null}
      {user.role === "admin" ? (
        <p className="rounded-lg bg-level-note-bg p-3">
          You are reading this review as an admin; nothing here can be changed.
        </p>
      ) : null}
      <ReviewWorkspace initial={ws} canEdit={canEdit} />
      <Cautions compact />
    </div>
  );
}
