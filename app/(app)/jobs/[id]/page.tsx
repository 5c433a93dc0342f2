import { SERVICE_LABELS } from "@/lib/labels";
import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { HttpError, parseId } from "@/lib/data/errors";
import { getJob, syncCheckout, TRANSITION_LABELS, type JobView } from "@/lib/data/jobs";
import { STATE_DESCRIPTIONS, STATE_LABELS, type ViewerRole } from "@/lib/jobs";
import { formatMoney } from "@/lib/money";
import { pageUser, type CurrentUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { Card } from "@/components/ui/card";
import { ButtonLink } from "@/components/ui/button";
import { ActionForm } from "@/components/ui/action-form";
import { Cautions } from "@/components/ui/caution";
import { JobStateBadge } from "@/components/jobs/job-state-badge";
import { SiteVisitCard } from "@/components/jobs/site-visit";
import { DisputeCard } from "@/components/jobs/dispute-card";
import { ReceiptsLink, visitTimelineWords } from "@/components/jobs/job-extras";
import {
  cancelForRefundAction,
  cancelJobAction,
  payForJob,
  releaseAction,
  settleAction,
} from "@/components/jobs/actions";
import { getJobRating, RATEABLE_STATES } from "@/lib/data/ratings";
import { FIRST_FILL_STATES } from "@/lib/data/first-fill";
import { JobAftercare } from "@/components/aftercare/job-aftercare";

export const metadata: Metadata = { title: "Job" };

const orNotFound = (err: unknown): never => {
  if (err instanceof HttpError && (err.status === 404 || err.status === 403)) notFound();
  throw err;
};

const day = (s: string | null) =>
  s
    ? new Intl.DateTimeFormat("en-GB", {
        dateStyle: "medium",
        timeStyle: "short",
        timeZone: "UTC",
      }).format(new Date(`${s.replace(" ", "T")}Z`))
    : "";

export default async function JobPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<{ checkout?: string }>;
}) {
  const { id } = await params;
  const { checkout } = await searchParams;
  const user = await pageUser(`/jobs/${id}`);
  const jobId = (() => {
    try {
      return parseId(id, "job");
    } catch {
      notFound();
    }
  })();
  let notice: string | null = null;
  if (checkout === "done" && user.role === "homeowner") {
    // The redirect proves nothing: ask the payment service, and fund from its answer.
    const synced = await syncCheckout(db(), user, jobId).catch(() => "unpaid" as const);
    notice =
      synced === "unpaid"
        ? "We have not received the payment yet. If you paid, this page updates in a moment; if the card was declined, try again."
        : null;
  } else if (checkout === "cancelled") {
    notice = "The payment was not completed. Nothing was charged; you can try again.";
  }
  const job = await getJob(db(), user, jobId).catch(orNotFound);
  const viewer = user.role as ViewerRole;
  const rating = await getJobRating(db(), user, jobId);
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-3xl font-bold">
          {SERVICE_LABELS[job.kind]}: {job.projectTitle}
        </h1>
        <JobStateBadge state={job.state} viewer={viewer} />
      </div>
      {notice ? (
        <p role="status" className="rounded-lg bg-level-note-bg p-3 font-semibold">
          {notice}
        </p>
      ) : null}
      <p className="text-lg text-slate-700">{STATE_DESCRIPTIONS[viewer][job.state]}</p>
      <NextStep job={job} user={user} />
      <SiteVisitCard job={job} role={user.role} />
      <JobAftercare
        jobId={job.id}
        projectId={job.projectId}
        role={viewer}
        reviewerName={job.reviewerName}
        rateable={RATEABLE_STATES.includes(job.state)}
        firstFillOpen={FIRST_FILL_STATES.includes(job.state)}
        rating={rating}
      />
      <div className="grid gap-6 lg:grid-cols-2">
        <Money job={job} viewer={viewer} />
        <Timeline job={job} />
      </div>
      {job.dispute ? (
        <Card>
          <h2 className="text-xl font-bold">Dispute</h2>
          <p className="mt-2 whitespace-pre-line">{job.dispute.reason}</p>
          <p className="mt-2 text-sm text-slate-600">
            Opened {day(job.dispute.openedAt)} ·{" "}
            {job.dispute.status === "open" ? "waiting for the Loopwright team" : "settled"}
          </p>
          {job.dispute.note ? (
            <p className="mt-2">Note from the Loopwright team: {job.dispute.note}</p>
          ) : null}
        </Card>
      ) : null}
      <p className="flex flex-wrap gap-4">
        {user.role === "homeowner" ? (
          <Link
            className="inline-flex min-h-11 items-center font-semibold text-copper-700 underline"
            href={`/projects/${job.projectId}`}
          >
            The project
          </Link>
        ) : null}
        <Link
          className="inline-flex min-h-11 items-center font-semibold text-copper-700 underline"
          href={`/requests/${job.requestId}`}
        >
          The request and messages
        </Link>
        {user.role !== "homeowner" && job.reviewStartedAt ? (
          <Link
            className="inline-flex min-h-11 items-center font-semibold text-copper-700 underline"
            href={`/jobs/${job.id}/review`}
          >
            The review workspace
          </Link>
        ) : null}
        {job.deliveredAt ? (
          <Link
            className="inline-flex min-h-11 items-center font-semibold text-copper-700 underline"
            href={`/jobs/${job.id}/report`}
          >
            Read the report
          </Link>
        ) : null}
        <ReceiptsLink job={job} role={user.role} />
      </p>
      <Cautions compact />
    </div>
  );
}

function NextStep({ job, user }: { job: JobView; user: CurrentUser }) {
  const can = (t: (typeof job.actions)[number]) => job.actions.includes(t);
  const fields = { jobId: job.id };
  const price = formatMoney(job.money.amountMinor, job.currency);
  const items: React.ReactNode[] = [];
  if (user.role === "homeowner" && job.state === "awaiting_payment") {
    items.push(
      <Card key="pay">
        <h2 className="text-xl font-bold">Pay into held funds</h2>
        <p className="mt-1">
          {price} to {job.reviewerName}. Loopwright holds it; the reviewer is paid only when you
          release it after the report is delivered.
        </p>
        {!job.payoutAccountReady ? (
          <p className="mt-2 text-sm text-slate-600">
            The reviewer&apos;s payout account is not set up yet. You can pay now; the payment stays
            held until it is.
          </p>
        ) : null}
        <ActionForm
          action={payForJob}
          fields={fields}
          submitLabel={`Pay ${price}`}
          pendingLabel="Opening the payment page…"
          variant="primary"
          className="mt-3"
        />
      </Card>,
    );
  }
  if (user.role === "reviewer" && (job.state === "funded" || job.state === "in_review")) {
    items.push(
      <Card key="review">
        <h2 className="text-xl font-bold">
          {job.state === "funded" ? "Ready to start the review" : "The review"}
        </h2>
        <p className="mt-1">
          The checklist for this system, with the loop check and the photos beside each item.
        </p>
        <ButtonLink className="mt-3" href={`/jobs/${job.id}/review`}>
          {job.state === "funded" ? "Start the review" : "Open the review workspace"}
        </ButtonLink>
      </Card>,
    );
  }
  if (user.role === "reviewer" && !job.payoutAccountReady && job.state !== "cancelled") {
    items.push(
      <Card key="payout">
        <h2 className="text-xl font-bold">Set up your payout account</h2>
        <p className="mt-1">
          The payment for this job can only be released to you once it is ready.
        </p>
        <ButtonLink className="mt-3" variant="secondary" href="/reviewer/earnings">
          Set up your payout account
        </ButtonLink>
      </Card>,
    );
  }
  const buttons: React.ReactNode[] = [];
  if (can("release"))
    buttons.push(
      <ActionForm
        key="release"
        action={releaseAction}
        fields={fields}
        submitLabel={TRANSITION_LABELS.release}
        pendingLabel="Releasing…"
        variant="primary"
        confirm={`Release ${price} to ${job.reviewerName}? The platform fee is kept; this cannot be undone.`}
      />,
    );
  if (can("cancel"))
    buttons.push(
      <ActionForm
        key="cancel"
        action={cancelJobAction}
        fields={fields}
        submitLabel={TRANSITION_LABELS.cancel}
        confirm="Cancel this job? The quote is no longer accepted."
        variant="secondary"
      />,
    );
  if (can("cancelForRefund"))
    buttons.push(
      <ActionForm
        key="refund"
        action={cancelForRefundAction}
        fields={fields}
        submitLabel={TRANSITION_LABELS.cancelForRefund}
        confirm={`Cancel and refund ${price} in full?`}
        variant="secondary"
      />,
    );
  if (buttons.length)
    items.push(
      <Card key="buttons">
        <h2 className="text-xl font-bold">What you can do now</h2>
        <div className="mt-3 flex flex-wrap gap-4">{buttons}</div>
      </Card>,
    );
  if (can("openDispute"))
    items.push(<DisputeCard key="dispute" jobId={job.id} openUntil={day(job.releaseDueAt)} />);
  if (user.role === "admin" && job.state === "disputed")
    items.push(
      <Card key="settle">
        <h2 className="text-xl font-bold">Settle the dispute</h2>
        <ActionForm
          action={settleAction}
          fields={fields}
          submitLabel="Settle"
          variant="primary"
          className="mt-3 space-y-3"
        >
          <fieldset className="space-y-2">
            <legend className="font-semibold">Outcome</legend>
            {[
              ["release", "Pay the reviewer in full, less the fee"],
              ["partial_refund", "Refund part, pay the rest to the reviewer"],
              ["full_refund", "Refund the homeowner in full"],
            ].map(([v, l]) => (
              <label key={v} className="flex min-h-11 items-center gap-3">
                <input type="radio" name="resolution" value={v} required className="h-5 w-5" /> {l}
              </label>
            ))}
          </fieldset>
          <label className="block">
            <span className="font-semibold">Part refund amount ({job.currency})</span>
            <input
              name="refundAmount"
              inputMode="decimal"
              className="mt-1 block w-48 rounded-lg border border-slate-300 p-2"
            />
          </label>
          <label className="block">
            <span className="font-semibold">Note to both sides</span>
            <textarea
              name="note"
              rows={3}
              maxLength={4000}
              className="mt-1 w-full rounded-lg border border-slate-300 p-3"
            />
          </label>
        </ActionForm>
      </Card>,
    );
  return items.length ? <div className="space-y-4">{items}</div> : null;
}

function Money({ job, viewer }: { job: JobView; viewer: ViewerRole }) {
  const m = job.money;
  const f = (n: number) => formatMoney(n, job.currency);
  const rows: [string, string][] = [
    ["Price", f(m.amountMinor)],
    ["Paid in", f(m.chargedMinor)],
    ["Held by Loopwright now", f(m.heldMinor)],
  ];
  if (m.refundedMinor) rows.push(["Refunded", f(m.refundedMinor)]);
  if (viewer !== "homeowner" || m.paidOutMinor) {
    rows.push(["Platform fee", f(m.feeMinor || m.expectedFeeMinor)]);
    rows.push([
      m.paidOutMinor ? "Paid out to the reviewer" : "The reviewer's payout on release",
      f(m.paidOutMinor || m.expectedPayoutMinor),
    ]);
  }
  return (
    <Card>
      <h2 className="text-xl font-bold">Money</h2>
      <dl className="mt-3 divide-y divide-slate-100" data-testid="job-money">
        {rows.map(([k, v]) => (
          <div key={k} className="flex justify-between gap-4 py-2">
            <dt>{k}</dt>
            <dd className="font-semibold tabular-nums">{v}</dd>
          </div>
        ))}
      </dl>
    </Card>
  );
}

const ACTION_WORDS: Record<string, string> = {
  "quote.accepted": "Quote accepted",
  "job.checkout_started": "Payment page opened",
  "job.payment_failed": "A payment attempt failed",
};

function Timeline({ job }: { job: JobView }) {
  return (
    <Card>
      <h2 className="text-xl font-bold">Timeline</h2>
      <ol className="mt-3 space-y-2">
        {job.timeline.map((t, i) => (
          <li key={i} className="flex flex-wrap justify-between gap-2">
            <span>
              {t.to
                ? STATE_LABELS[t.to]
                : (visitTimelineWords(t) ?? ACTION_WORDS[t.action] ?? "Updated")}
            </span>
            <time className="whitespace-nowrap text-sm text-slate-600">{day(t.at)}</time>
          </li>
        ))}
      </ol>
    </Card>
  );
}
