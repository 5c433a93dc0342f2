import { formatDate } from "@/lib/labels";
import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { pageUser, type CurrentUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { HttpError } from "@/lib/data/errors";
import {
  getRequestForHomeowner,
  getRequestForReviewer,
  listQuotesForHomeowner,
} from "@/lib/data/quotes";
import { runLoopCheck } from "@/lib/calc/loop-check";
import { regionName } from "@/lib/regions";
import {
  labelFor,
  PHOTO_TAG_LABELS,
  QUOTE_STATUS_LABELS,
  REQUEST_STATUS_LABELS,
  serviceLabel,
} from "@/lib/labels";
import { formatMoney } from "@/lib/money";
import { Card } from "@/components/ui/card";
import { ActionForm } from "@/components/ui/action-form";
import { Cautions } from "@/components/ui/caution";
import { LoopCheckResults } from "@/components/loop-check/loop-check-results";
import { QuoteForm } from "@/components/quotes/quote-form";
import { QuoteTable } from "@/components/quotes/quote-table";
import { takeBackQuote } from "@/components/quotes/actions";
import { MessageThread } from "@/components/quotes/message-thread";
import { PayoutNotice } from "@/components/quotes/payout-notice";
import { getPayoutAccount } from "@/lib/data/payments";

export const metadata: Metadata = { title: "Request" };

const orNotFound = (err: unknown): never => {
  if (err instanceof HttpError && (err.status === 404 || err.status === 403)) notFound();
  throw err;
};

export default async function RequestPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await pageUser(`/requests/${id}`, ["reviewer", "homeowner"]);
  if (!/^\d+$/.test(id)) notFound();
  return user.role === "reviewer" ? (
    <ReviewerView user={user} requestId={Number(id)} />
  ) : (
    <HomeownerView user={user} requestId={Number(id)} />
  );
}

async function ReviewerView({ user, requestId }: { user: CurrentUser; requestId: number }) {
  const r = await getRequestForReviewer(db(), user, requestId).catch(orNotFound);
  const payout = await getPayoutAccount(db(), user);
  const result = runLoopCheck(r.system);
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-bold">
        {serviceLabel(r.kind)} · {regionName(r.region)}
      </h1>
      <Card>
        <p className="font-semibold">
          Budget {formatMoney(r.budgetMinMinor, r.currency)}–
          {formatMoney(r.budgetMaxMinor, r.currency)}
          {r.windowStart
            ? ` · visit between ${formatDate(r.windowStart)} and ${formatDate(r.windowEnd)}`
            : ""}
        </p>
        <h2 className="mt-3 text-lg font-bold">The homeowner asks</h2>
        <p className="whitespace-pre-line">{r.questions}</p>
        {r.accessNotes ? (
          <p className="mt-2 text-sm text-slate-700">Access: {r.accessNotes}</p>
        ) : null}
        <p className="mt-3 text-sm text-slate-600">
          Keep payment on Loopwright: payments outside it lose the held-funds protection.
        </p>
      </Card>
      <Card>
        <h2 className="mb-3 text-xl font-bold">Sketch and photos</h2>
        <ul className="grid grid-cols-2 gap-3 sm:grid-cols-3">
          {r.files.map((f) => (
            <li key={f.id}>
              <a
                className="group block space-y-1"
                href={`/api/files/${f.id}`}
                target="_blank"
                rel="noreferrer"
              >
                {f.mimeType.startsWith("image/") ? (
                  // eslint-disable-next-line @next/next/no-img-element -- a private file served by our own route
                  <img
                    src={`/api/files/${f.id}?variant=thumbnail`}
                    alt={f.purpose === "sketch" ? "System sketch" : (f.caption ?? f.fileName)}
                    loading="lazy"
                    className="aspect-[4/3] w-full rounded-lg border border-slate-200 bg-slate-100 object-cover"
                  />
                ) : null}
                <span className="block font-semibold underline">
                  {f.purpose === "sketch" ? "System sketch" : (f.caption ?? f.fileName)}
                </span>
              </a>
              <span className="text-sm text-slate-600">{labelFor(PHOTO_TAG_LABELS, f.tag)}</span>
            </li>
          ))}
          {r.files.length === 0 ? <li>No files uploaded.</li> : null}
        </ul>
      </Card>
      <Card>
        <h2 className="mb-3 text-xl font-bold">
          {r.myQuote
            ? `Your quote (${labelFor(QUOTE_STATUS_LABELS, r.myQuote.status).toLowerCase()})`
            : "Quote"}
        </h2>
        {r.myQuote?.status === "accepted" ? (
          <p className="text-level-ok">The homeowner accepted your quote.</p>
        ) : r.myQuote?.status === "declined" ? (
          <div className="space-y-2" data-testid="quote-declined">
            <p className="font-semibold">
              {r.status === "awarded"
                ? "The homeowner chose another quote."
                : "The homeowner declined your quote."}
            </p>
            {r.myQuote.declineReason ? <p>Their reason: “{r.myQuote.declineReason}”</p> : null}
            <p className="text-sm text-slate-700">
              Your messages with them stay below.{" "}
              <Link className="underline" href="/board">
                Find other requests on the board
              </Link>
              .
            </p>
          </div>
        ) : (
          <>
            <div className="mb-3">
              <PayoutNotice ready={payout.ready} />
            </div>
            <QuoteForm
              requestId={r.id}
              siteVisit={r.kind === "site_visit"}
              current={r.myQuote}
              currency={r.currency}
            />
            {r.myQuote ? (
              <ActionForm
                action={takeBackQuote}
                fields={{ requestId: r.id, quoteId: r.myQuote.id }}
                submitLabel="Withdraw my quote"
                pendingLabel="Withdrawing…"
                confirm="Withdraw your quote? The homeowner will no longer see it."
                className="mt-3"
              />
            ) : null}
          </>
        )}
      </Card>
      {r.myQuote ? (
        <Card>
          <MessageThread requestId={r.id} title="Messages with the homeowner" />
        </Card>
      ) : null}
      <Cautions compact />
      <LoopCheckResults result={result} />
    </div>
  );
}

async function HomeownerView({ user, requestId }: { user: CurrentUser; requestId: number }) {
  const request = await getRequestForHomeowner(db(), user, requestId).catch(orNotFound);
  const quotes = await listQuotesForHomeowner(db(), user, requestId);
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-bold">Quotes</h1>
      <p>
        <Link className="underline" href={`/projects/${request.projectId}`}>
          Back to the project
        </Link>{" "}
        · {labelFor(REQUEST_STATUS_LABELS, request.status)}
      </p>
      {quotes.length === 0 ? (
        <Card>
          <p>No quotes yet. You will get an e-mail for each one.</p>
        </Card>
      ) : null}
      {quotes.length ? (
        <QuoteTable
          requestId={requestId}
          quotes={quotes}
          open={request.status === "open"}
          kind={request.kind}
        />
      ) : null}
      {quotes.map((q) => (
        <Card key={`thread-${q.id}`}>
          <MessageThread
            requestId={requestId}
            reviewerId={q.reviewerId}
            title={`Messages with ${q.tradingName}`}
          />
        </Card>
      ))}
    </div>
  );
}
