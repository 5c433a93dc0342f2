"use client";

import { formatDate } from "@/lib/labels";

import { useState } from "react";
import Link from "next/link";
import { Markdown } from "@/components/ui/markdown";
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from "@tanstack/react-table";
import type { QuoteForHomeowner } from "@/lib/types/quotes";
import { formatMoney } from "@/lib/money";
import { plural, serviceLabel } from "@/lib/labels";
import { ActionForm } from "@/components/ui/action-form";
import { AcceptButton } from "./accept-button";
import { declineQuoteAction } from "./actions";

const col = createColumnHelper<QuoteForHomeowner>();

/** The quotes on a request, side by side: sortable by price, turnaround and rating. */
export function QuoteTable({
  requestId,
  quotes,
  open,
  kind,
}: {
  requestId: number;
  quotes: QuoteForHomeowner[];
  open: boolean;
  /** The service asked for (remote_check or site_visit), named in the confirmation. */
  kind: string;
}) {
  const [sorting, setSorting] = useState<SortingState>([]);
  const columns = [
    col.accessor("tradingName", {
      header: "Reviewer",
      enableSorting: false,
      cell: (c) => (
        <>
          <Link
            className="font-semibold underline"
            href={`/reviewers/${c.row.original.reviewerId}`}
          >
            {c.getValue()}
          </Link>
          <div className="text-sm text-slate-600">
            {c.row.original.yearsInTrade} years · verified credentials on the profile
          </div>
        </>
      ),
    }),
    col.accessor("priceMinor", {
      id: "price",
      header: "Price",
      // Cheapest first on the first click.
      sortDescFirst: false,
      cell: (c) => (
        <span className="font-mono">{formatMoney(c.getValue(), c.row.original.currency)}</span>
      ),
    }),
    col.accessor("turnaroundDays", {
      id: "turnaround",
      header: "Turnaround",
      sortDescFirst: false,
      cell: (c) => (
        <>
          {plural(c.getValue(), "day")}
          {c.row.original.proposedVisitDate ? (
            <div className="whitespace-nowrap text-sm">
              visit {formatDate(c.row.original.proposedVisitDate)}
            </div>
          ) : null}
        </>
      ),
    }),
    col.accessor((q) => q.rating ?? -1, {
      id: "rating",
      header: "Rating",
      cell: (c) =>
        c.row.original.rating ? (
          <>
            {c.row.original.rating.toFixed(1)} / 5
            <div className="text-sm text-slate-600">
              from {c.row.original.ratingCount}{" "}
              {c.row.original.ratingCount === 1 ? "rating" : "ratings"}
            </div>
          </>
        ) : (
          "No ratings yet"
        ),
    }),
    col.accessor((q) => q.distanceKm ?? Number.MAX_SAFE_INTEGER, {
      id: "distance",
      header: "Distance",
      sortDescFirst: false,
      cell: (c) => (c.row.original.distanceKm !== null ? `${c.row.original.distanceKm} km` : "—"),
    }),
    col.accessor("scopeMd", {
      header: "Scope",
      enableSorting: false,
      cell: (c) => (
        <div className="prose prose-sm max-w-md">
          <Markdown>{c.getValue()}</Markdown>
        </div>
      ),
    }),
    col.display({
      id: "actions",
      header: "",
      cell: (c) => {
        const q = c.row.original;
        if (q.status === "accepted")
          return <span className="font-semibold text-level-ok">Accepted</span>;
        if (!open) return null;
        return (
          <div className="space-y-2">
            <AcceptButton
              requestId={requestId}
              quoteId={q.id}
              label={q.tradingName}
              price={formatMoney(q.priceMinor, q.currency)}
              serviceName={serviceLabel(kind)}
            />
            <ActionForm
              action={declineQuoteAction}
              fields={{ requestId, quoteId: q.id }}
              submitLabel="Decline"
              pendingLabel="Declining…"
              buttonAriaLabel={`Decline the quote from ${q.tradingName}`}
            >
              <label className="block text-xs text-slate-600">
                Reason (optional, sent to the reviewer)
                <input
                  name="reason"
                  maxLength={1000}
                  className="mt-1 block w-full rounded border border-slate-300 px-2 py-1 text-sm"
                />
              </label>
            </ActionForm>
          </div>
        );
      },
    }),
  ];
  // TanStack Table hands back functions the React Compiler cannot memoise; nothing here is compiled.
  // eslint-disable-next-line react-hooks/incompatible-library
  const table = useReactTable({
    data: quotes,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });
  const byId = (id: string) => table.getColumn(id);
  return (
    <>
      {/* Phones: one card per quote, the Accept button in view; sorting by the same columns. */}
      <div className="space-y-3 md:hidden" data-testid="quote-cards">
        <label className="flex items-center gap-2 text-sm font-semibold">
          Sort by
          <select
            className="min-h-11 rounded-lg border border-slate-300 bg-white px-2"
            value={sorting[0] ? `${sorting[0].id}:${sorting[0].desc ? "desc" : "asc"}` : ""}
            onChange={(e) => {
              const [id, dir] = e.target.value.split(":");
              setSorting(id ? [{ id: id!, desc: dir === "desc" }] : []);
            }}
          >
            <option value="">As listed</option>
            <option value="price:asc">Price, lowest first</option>
            <option value="turnaround:asc">Turnaround, quickest first</option>
            <option value="rating:desc">Rating, highest first</option>
            <option value="distance:asc">Distance, nearest first</option>
          </select>
        </label>
        {table.getRowModel().rows.map((row) => (
          <article
            key={row.id}
            data-quote={row.original.status}
            className="space-y-2 rounded-card border border-slate-200 bg-white p-4"
          >
            {(["tradingName", "price", "turnaround", "rating", "distance"] as const).map((id) => {
              const cell = row.getVisibleCells().find((c) => c.column.id === id);
              if (!cell) return null;
              const header = byId(id)?.columnDef.header;
              return (
                <div key={id} className="flex flex-wrap items-baseline justify-between gap-2">
                  {id === "tradingName" ? null : (
                    <span className="text-sm text-slate-600">{String(header)}</span>
                  )}
                  <div>{flexRender(cell.column.columnDef.cell, cell.getContext())}</div>
                </div>
              );
            })}
            <details className="text-sm">
              <summary className="min-h-11 cursor-pointer py-2 font-semibold">Scope</summary>
              <div className="prose prose-sm">
                <Markdown>{row.original.scopeMd}</Markdown>
              </div>
            </details>
            {(() => {
              const cell = row.getVisibleCells().find((c) => c.column.id === "actions");
              return cell ? flexRender(cell.column.columnDef.cell, cell.getContext()) : null;
            })()}
          </article>
        ))}
      </div>
      <div className="hidden overflow-x-auto rounded-card border border-slate-200 bg-white md:block">
        <table className="w-full text-left" aria-label="Quotes">
          <thead className="border-b border-slate-200 text-sm text-slate-600">
            {table.getHeaderGroups().map((g) => (
              <tr key={g.id}>
                {g.headers.map((h) => {
                  const sorted = h.column.getIsSorted();
                  return (
                    <th
                      key={h.id}
                      scope="col"
                      className="p-3"
                      aria-sort={
                        sorted === "asc"
                          ? "ascending"
                          : sorted === "desc"
                            ? "descending"
                            : undefined
                      }
                    >
                      {h.column.getCanSort() ? (
                        <button
                          type="button"
                          onClick={h.column.getToggleSortingHandler()}
                          className="min-h-11 min-w-11 font-semibold underline-offset-2 hover:underline"
                        >
                          {flexRender(h.column.columnDef.header, h.getContext())}{" "}
                          {sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : ""}
                        </button>
                      ) : (
                        flexRender(h.column.columnDef.header, h.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((row) => (
              <tr
                key={row.id}
                className="border-b border-slate-100 align-top"
                data-quote={row.original.status}
              >
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="p-3">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </>
  );
}
