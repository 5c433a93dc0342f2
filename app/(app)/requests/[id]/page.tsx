import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import ReactMarkdown from "react-markdown";
import { pageUser, type CurrentUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { HttpError } from "@/lib/server/errors";
import { getRequestForReviewer, listQuotesForHomeowner } from "@/lib/server/quotes";
import { runLoopCheck } from "@/lib/calc/loop-check";
import { regionName } from "@/lib/regions";
import { formatMoney } from "@/lib/money";
import { Card } from "@/components/ui/card";
import { Button } from "@/components/ui/button";
import { Forbidden } from "@/components/ui/forbidden";
import { Cautions } from "@/components/ui/caution";
import { LoopCheckResults } from "@/components/loop-check/loop-check-results";
import { QuoteForm } from "@/components/quotes/quote-form";
import { AcceptButton } from "@/components/quotes/accept-button";
import { declineQuoteAction, takeBackQuote } from "@/components/quotes/actions";
import { MessageThread } from "@/components/quotes/message-thread";

export const metadata: Metadata = { title: "Request" };

const orNotFound = (err: unknown): never => {
  if (err instanceof HttpError && (err.status === 404 || err.status === 403)) notFound();
  throw err;
};

export default async function RequestPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await pageUser(`/requests/${id}`, ["reviewer", "homeowner"]);
  if (!user) return <Forbidden />;
  if (!/^\d+$/.test(id)) notFound();
  return user.role === "reviewer" ? (
    <ReviewerView user={user} requestId={Number(id)} />
  ) : (
    <HomeownerView user={user} requestId={Number(id)} />
  );
}

async function ReviewerView({ user, requestId }: { user: CurrentUser; requestId: number }) {
  const r = await getRequestForReviewer(db(), user, requestId).catch(orNotFound);
  const result = runLoopCheck(r.system);
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-bold">
        {r.kind === "site_visit" ? "Site visit" : "Remote design check"} · {regionName(r.region)}
      </h1>
      <Card>
        <p className="font-semibold">
          Budget {formatMoney(r.budgetMinMinor, r.currency)}–
          {formatMoney(r.budgetMaxMinor, r.currency)}
          {r.windowStart ? ` · visit between ${r.windowStart} and ${r.windowEnd}` : ""}
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
        <ul className="grid gap-3 sm:grid-cols-3">
          {r.files.map((f) => (
            <li key={f.id}>
              <a className="underline" href={`/api/files/${f.id}`} target="_blank" rel="noreferrer">
                {f.purpose === "sketch" ? "System sketch" : (f.caption ?? f.fileName)}
              </a>
              <span className="ml-1 text-sm text-slate-600">{f.tag ?? ""}</span>
            </li>
          ))}
          {r.files.length === 0 ? <li>No files uploaded.</li> : null}
        </ul>
      </Card>
      <Card>
        <h2 className="mb-3 text-xl font-bold">
          {r.myQuote ? `Your quote (${r.myQuote.status})` : "Quote"}
        </h2>
        {r.myQuote?.status === "accepted" ? (
          <p className="text-level-ok">The homeowner accepted your quote.</p>
        ) : (
          <>
            <QuoteForm requestId={r.id} siteVisit={r.kind === "site_visit"} current={r.myQuote} />
            {r.myQuote ? (
              <form action={takeBackQuote.bind(null, r.id, r.myQuote.id)} className="mt-3">
                <Button type="submit" variant="ghost">
                  Withdraw my quote
                </Button>
              </form>
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
  const request = await db()("requests")
    .where({ id: requestId, homeowner_id: user.id })
    .first("id", "project_id", "status", "kind");
  if (!request) notFound();
  const quotes = await listQuotesForHomeowner(db(), user, requestId);
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-bold">Quotes</h1>
      <p>
        <Link className="underline" href={`/projects/${request.project_id}`}>
          Back to the project
        </Link>{" "}
        · request {request.status}
      </p>
      {quotes.length === 0 ? (
        <Card>
          <p>No quotes yet. You will get an e-mail for each one.</p>
        </Card>
      ) : null}
      <div className="overflow-x-auto rounded-card border border-slate-200 bg-white">
        <table className="w-full text-left" aria-label="Quotes, cheapest first">
          <thead className="border-b border-slate-200 text-sm text-slate-600">
            <tr>
              <th className="p-3">Reviewer</th>
              <th className="p-3">Price</th>
              <th className="p-3">Turnaround</th>
              <th className="p-3">Rating</th>
              <th className="p-3">Scope</th>
              <th className="p-3"> </th>
            </tr>
          </thead>
          <tbody>
            {quotes.map((q) => (
              <tr key={q.id} className="border-b border-slate-100 align-top" data-quote={q.status}>
                <td className="p-3">
                  <Link className="font-semibold underline" href={`/reviewers/${q.reviewerId}`}>
                    {q.tradingName}
                  </Link>
                  <div className="text-sm text-slate-600">{q.yearsInTrade} years</div>
                </td>
                <td className="p-3 font-mono">{formatMoney(q.priceMinor, q.currency)}</td>
                <td className="p-3">
                  {q.turnaroundDays} days
                  {q.proposedVisitDate ? (
                    <div className="text-sm">visit {q.proposedVisitDate}</div>
                  ) : null}
                </td>
                <td className="p-3">{q.rating ? `${q.rating.toFixed(1)} / 5` : "—"}</td>
                <td className="prose prose-sm max-w-md p-3">
                  <ReactMarkdown>{q.scopeMd}</ReactMarkdown>
                </td>
                <td className="space-y-2 p-3">
                  {q.status === "accepted" ? (
                    <span className="font-semibold text-level-ok">Accepted</span>
                  ) : request.status === "open" ? (
                    <>
                      <AcceptButton requestId={requestId} quoteId={q.id} label={q.tradingName} />
                      <form action={declineQuoteAction.bind(null, requestId, q.id)}>
                        <Button type="submit" variant="ghost" className="min-h-11">
                          Decline
                        </Button>
                      </form>
                    </>
                  ) : null}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
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
