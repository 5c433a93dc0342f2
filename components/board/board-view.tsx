"use client";

import { formatDate } from "@/lib/labels";

import { useInfiniteQuery } from "@tanstack/react-query";
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { REGIONS, regionName } from "@/lib/regions";
import { formatMoney } from "@/lib/money";
import { currencySymbol, SERVICE_LABELS, serviceLabel } from "@/lib/labels";
import { BOARD_FILTER_KEYS, type BoardPage } from "@/lib/types/board";
import type { Level } from "@/lib/calc/findings";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import { LevelBadge } from "@/components/loop-check/level-badge";

// Read from the shared schema, so a new filter cannot be dropped on its way to the route.
const FILTERS = BOARD_FILTER_KEYS;

/** A refused board query: the message, and each field's own message to show beside it. */
class BoardError extends Error {
  constructor(
    message: string,
    readonly fieldErrors: Record<string, string[]>,
  ) {
    super(message);
  }
}

async function fetchPage(params: URLSearchParams, cursor: string | null): Promise<BoardPage> {
  const q = new URLSearchParams(params);
  if (cursor) q.set("cursor", cursor);
  const res = await fetch(`/api/board?${q}`);
  const body = await res.json();
  if (!res.ok)
    throw new BoardError(body.error ?? "The board could not be loaded.", body.fieldErrors ?? {});
  return body as BoardPage;
}

/** The request board: filters live in the URL; pages are fetched in the client as you scroll on. */
export function BoardView({ currency }: { currency: string }) {
  const money = currencySymbol(currency);
  const router = useRouter();
  const pathname = usePathname();
  const search = useSearchParams();
  const params = new URLSearchParams();
  for (const f of FILTERS) {
    const v = search.get(f);
    if (v) params.set(f, v);
  }
  const key = params.toString();
  const board = useInfiniteQuery({
    queryKey: ["board", key],
    queryFn: ({ pageParam }) => fetchPage(params, pageParam),
    initialPageParam: null as string | null,
    getNextPageParam: (last) => last.nextCursor,
  });
  const apply = (form: FormData) => {
    const next = new URLSearchParams();
    for (const f of FILTERS) {
      const v = String(form.get(f) ?? "").trim();
      if (v) next.set(f, v);
    }
    router.replace(`${pathname}${next.size ? `?${next}` : ""}`);
  };
  const items = board.data?.pages.flatMap((p) => p.items) ?? [];
  const fieldErrors = board.error instanceof BoardError ? board.error.fieldErrors : {};
  const errorFor = (name: string) =>
    fieldErrors[name]?.[0] ? (
      <span id={`${name}-error`} className="mt-1 block font-normal text-level-stop">
        {fieldErrors[name][0]}
      </span>
    ) : null;
  const select = (name: string, label: string, options: [string, string][]) => (
    <label className="text-sm font-semibold">
      {label}
      <select name={name} defaultValue={search.get(name) ?? ""} className={inputClass}>
        <option value="">any</option>
        {options.map(([v, l]) => (
          <option key={v} value={v}>
            {l}
          </option>
        ))}
      </select>
    </label>
  );
  return (
    <div className="space-y-4">
      <form
        key={key}
        action={apply}
        className="grid gap-3 rounded-card border border-slate-200 bg-white p-4 sm:grid-cols-3 lg:grid-cols-4"
        aria-label="Filter requests"
      >
        {select("kind", "Service", Object.entries(SERVICE_LABELS))}
        {select("collectorType", "Collectors", [
          ["flat_plate", "Flat plate"],
          ["evacuated_tube", "Evacuated tube"],
        ])}
        {select(
          "region",
          "Region",
          REGIONS.map((r) => [r.id, r.name]),
        )}
        {select("postedWithinDays", "Posted within", [
          ["1", "1 day"],
          ["7", "7 days"],
          ["30", "30 days"],
        ])}
        <label className="text-sm font-semibold">
          Budget at least ({money})
          <input
            name="budgetMin"
            type="number"
            min={0}
            defaultValue={search.get("budgetMin") ?? ""}
            className={inputClass}
            aria-invalid={fieldErrors.budgetMin ? true : undefined}
            aria-describedby={fieldErrors.budgetMin ? "budgetMin-error" : undefined}
          />
          {errorFor("budgetMin")}
        </label>
        <label className="text-sm font-semibold">
          Budget at most ({money})
          <input
            name="budgetMax"
            type="number"
            min={0}
            defaultValue={search.get("budgetMax") ?? ""}
            className={inputClass}
            aria-invalid={fieldErrors.budgetMax ? true : undefined}
            aria-describedby={fieldErrors.budgetMax ? "budgetMax-error" : undefined}
          />
          {errorFor("budgetMax")}
        </label>
        <label className="text-sm font-semibold">
          Site visits within (km)
          <input
            name="withinKm"
            type="number"
            min={1}
            defaultValue={search.get("withinKm") ?? ""}
            className={inputClass}
            aria-invalid={fieldErrors.withinKm ? true : undefined}
            aria-describedby={fieldErrors.withinKm ? "withinKm-error" : undefined}
          />
          {errorFor("withinKm")}
        </label>
        <label className="text-sm font-semibold">
          Sort
          <select name="sort" defaultValue={search.get("sort") ?? "newest"} className={inputClass}>
            <option value="newest">Newest first</option>
            <option value="budget">Highest budget first</option>
            <option value="distance">Nearest site visits first</option>
            <option value="soonest">Soonest visit window first</option>
          </select>
        </label>
        <div className="flex items-end gap-2">
          <Button type="submit">Show requests</Button>
          <Button type="button" variant="ghost" onClick={() => router.replace(pathname)}>
            Clear
          </Button>
        </div>
      </form>
      {board.isPending ? <p role="status">Loading requests…</p> : null}
      {board.isError ? (
        <p role="alert" className="text-level-stop">
          {board.error.message}
        </p>
      ) : null}
      {board.isSuccess && items.length === 0 ? (
        <p role="status">No open requests match these filters. Try a wider region or budget.</p>
      ) : null}
      <ul className="space-y-3" aria-label="Open requests">
        {items.map((r) => (
          <li
            key={r.id}
            data-board-item={r.id}
            className="flex flex-wrap items-center gap-3 rounded-card border border-slate-200 bg-white p-4"
          >
            {r.worstLevel ? <LevelBadge level={r.worstLevel as Level} /> : null}
            <a className="font-semibold underline" href={`/requests/${r.id}`}>
              {serviceLabel(r.kind)}
            </a>
            <span>{regionName(r.region)}</span>
            <span>{r.collectorType === "evacuated_tube" ? "evacuated tube" : "flat plate"}</span>
            <span className="font-mono">
              {formatMoney(r.budgetMinMinor, r.currency)}–
              {formatMoney(r.budgetMaxMinor, r.currency)}
            </span>
            {r.distanceKm !== null ? <span className="text-sm">{r.distanceKm} km away</span> : null}
            {r.windowStart ? (
              <span className="text-sm">
                visit {formatDate(r.windowStart)} to {formatDate(r.windowEnd)}
              </span>
            ) : null}
            <span className="ml-auto text-sm text-slate-600">
              posted {r.createdAt.slice(0, 10)}
            </span>
          </li>
        ))}
      </ul>
      {board.hasNextPage ? (
        <Button
          type="button"
          variant="secondary"
          onClick={() => board.fetchNextPage()}
          disabled={board.isFetchingNextPage}
        >
          {board.isFetchingNextPage ? "Loading…" : "Show more"}
        </Button>
      ) : null}
    </div>
  );
}
