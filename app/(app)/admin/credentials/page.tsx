import { formatDate } from "@/lib/labels";
import { CREDENTIAL_STATUS_LABELS, plural } from "@/lib/labels";
import type { Metadata } from "next";
import Link from "next/link";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import {
  listCredentialQueue,
  QUEUE_PAGE_SIZE,
  queueQuerySchema,
  type QueueQuery,
} from "@/lib/data/reviewers";
import { CREDENTIAL_KINDS, credentialName } from "@/lib/credentials";
import { Card } from "@/components/ui/card";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import { CredentialStatus } from "@/components/reviewer/credential-status";
import { CredentialDecision } from "@/components/admin/decision-forms";

export const metadata: Metadata = { title: "Verification queue" };

type Search = Record<string, string | undefined>;

function href(q: QueueQuery, change: Partial<QueueQuery>): string {
  const next = { ...q, ...change };
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(next))
    if (v !== undefined && v !== "") params.set(k, String(v));
  return `/admin/credentials?${params}`;
}

export default async function CredentialQueuePage({
  searchParams,
}: {
  searchParams: Promise<Search>;
}) {
  const user = await pageUser("/admin/credentials", ["admin"]);
  const parsed = queueQuerySchema.safeParse(await searchParams);
  const query = parsed.success ? parsed.data : queueQuerySchema.parse({});
  const { rows, total } = await listCredentialQueue(db(), user, query);
  const pages = Math.max(1, Math.ceil(total / QUEUE_PAGE_SIZE));
  const sortLink = (col: QueueQuery["sort"], label: string) => {
    const active = query.sort === col;
    const dir = active && query.dir === "asc" ? "desc" : "asc";
    return (
      <th
        scope="col"
        aria-sort={active ? (query.dir === "asc" ? "ascending" : "descending") : "none"}
        className="py-2 pr-3"
      >
        <Link
          className="underline-offset-2 hover:underline"
          href={href(query, { sort: col, dir, page: 1 })}
        >
          {label} {active ? (query.dir === "asc" ? "▲" : "▼") : ""}
        </Link>
      </th>
    );
  };
  return (
    <div className="space-y-4">
      <h1 className="text-3xl font-bold">Verification queue</h1>
      {!parsed.success ? (
        <p role="alert" className="text-level-stop">
          Some filters were not valid and were reset.
        </p>
      ) : null}
      <Card>
        <form
          method="get"
          className="flex flex-wrap items-end gap-3"
          aria-label="Filter credentials"
        >
          <label className="text-sm font-semibold">
            Status
            <select name="status" defaultValue={query.status} className={inputClass}>
              {(["pending", "verified", "rejected", "expired"] as const).map((s) => (
                <option key={s} value={s}>
                  {CREDENTIAL_STATUS_LABELS[s]}
                </option>
              ))}
              <option value="all">All</option>
            </select>
          </label>
          <label className="text-sm font-semibold">
            Kind
            <select name="kind" defaultValue={query.kind ?? ""} className={inputClass}>
              <option value="">any</option>
              {CREDENTIAL_KINDS.map((k) => (
                <option key={k} value={k}>
                  {credentialName(k)}
                </option>
              ))}
            </select>
          </label>
          <label className="text-sm font-semibold">
            Search
            <input
              name="q"
              defaultValue={query.q ?? ""}
              placeholder="name or number"
              className={inputClass}
            />
          </label>
          <Button type="submit" variant="secondary">
            Filter
          </Button>
        </form>
      </Card>
      <p className="text-slate-600">
        {plural(total, "credential")} · page {query.page} of {pages}
      </p>
      <div className="overflow-x-auto rounded-card border border-slate-200 bg-white">
        {/* On phones each row stacks into a block, so the decision is never off-screen. */}
        <table className="w-full text-left max-md:block">
          <thead className="border-b border-slate-200 text-sm text-slate-600 max-md:hidden">
            <tr>
              <th scope="col" className="py-2 pl-4 pr-3">
                Reviewer
              </th>
              {sortLink("kind", "Kind")}
              <th scope="col" className="py-2 pr-3">
                Issuer and number
              </th>
              {sortLink("expires_on", "Expires")}
              {sortLink("status", "Status")}
              {sortLink("created_at", "Submitted")}
              <th scope="col" className="py-2 pr-4">
                Decision
              </th>
            </tr>
          </thead>
          <tbody className="max-md:block">
            {rows.length === 0 ? (
              <tr>
                <td colSpan={7} className="p-4">
                  Nothing matches.
                </td>
              </tr>
            ) : (
              rows.map((c) => (
                <tr
                  key={c.id}
                  className="border-b border-slate-100 align-top max-md:block max-md:py-2"
                  data-credential={c.id}
                >
                  <td className="py-3 pl-4 pr-3 max-md:block max-md:py-1">
                    <Link
                      className="font-semibold underline"
                      href={`/admin/reviewers/${c.reviewerId}`}
                    >
                      {c.tradingName ?? c.reviewerName}
                    </Link>
                    <div className="text-sm text-slate-600">{c.reviewerEmail}</div>
                  </td>
                  <td className="py-3 pr-3 max-md:block max-md:px-4 max-md:py-1">
                    {credentialName(c.kind)}
                  </td>
                  <td className="py-3 pr-3 max-md:block max-md:px-4 max-md:py-1">
                    {c.issuer}
                    <div className="font-mono text-sm">{c.number}</div>
                    {c.evidenceAttachmentId ? (
                      <a
                        className="text-sm underline"
                        href={`/api/files/${c.evidenceAttachmentId}`}
                        target="_blank"
                        rel="noreferrer"
                      >
                        View evidence
                      </a>
                    ) : (
                      <div className="text-xs text-slate-500">no document uploaded</div>
                    )}
                  </td>
                  <td className="whitespace-nowrap py-3 pr-3 max-md:block max-md:px-4 max-md:py-1">
                    <span className="md:hidden">Expires </span>
                    {formatDate(c.expiresOn)}
                  </td>
                  <td className="py-3 pr-3 max-md:block max-md:px-4 max-md:py-1">
                    <CredentialStatus status={c.status} />
                    {c.adminReason ? <div className="mt-1 text-sm">{c.adminReason}</div> : null}
                  </td>
                  <td className="whitespace-nowrap py-3 pr-3 text-sm max-md:block max-md:px-4 max-md:py-1">
                    <span className="md:hidden">Submitted </span>
                    {c.createdAt.slice(0, 16)}
                  </td>
                  <td className="py-3 pr-4 max-md:block max-md:px-4 md:min-w-72">
                    {c.status === "pending" ? (
                      <CredentialDecision
                        credentialId={c.id}
                        expiresOn={c.expiresOn}
                        label={`${credentialName(c.kind)} of ${c.reviewerName}`}
                      />
                    ) : (
                      <span className="text-sm text-slate-600">
                        {CREDENTIAL_STATUS_LABELS[c.status]}: no decision waiting
                      </span>
                    )}
                  </td>
                </tr>
              ))
            )}
          </tbody>
        </table>
      </div>
      <nav aria-label="Pages" className="flex gap-3">
        {query.page > 1 ? (
          <Link className="underline" href={href(query, { page: query.page - 1 })}>
            ← Previous
          </Link>
        ) : null}
        {query.page < pages ? (
          <Link className="underline" href={href(query, { page: query.page + 1 })}>
            Next →
          </Link>
        ) : null}
      </nav>
    </div>
  );
}
