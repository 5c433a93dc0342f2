import "server-only";
import type { Knex } from "knex";
import type { BoardQuery } from "@/lib/validation/board";
import { forbidden } from "./errors";
import { isVerifiedReviewer, type Actor } from "./reviewers";

export interface BoardItem {
  id: number;
  kind: "remote_check" | "site_visit";
  region: string;
  collectorType: string | null;
  budgetMinMinor: number;
  budgetMaxMinor: number;
  currency: string;
  windowStart: string | null;
  windowEnd: string | null;
  createdAt: string;
  expiresAt: string;
  worstLevel: string | null;
}

export interface BoardPage {
  items: BoardItem[];
  nextCursor: string | null;
}

interface BoardRow {
  id: number;
  kind: BoardItem["kind"];
  region: string;
  collector_type: string | null;
  budget_min_minor: number;
  budget_max_minor: number;
  currency: string;
  window_start: string | null;
  window_end: string | null;
  created_at: string;
  expires_at: string;
  project_id: number;
}

const sqlNow = (offsetMs = 0) =>
  new Date(Date.now() + offsetMs).toISOString().slice(0, 23).replace("T", " ");

/**
 * The request board: open, unexpired requests, newest first (or by budget), keyset-paginated so
 * page 50 costs what page 1 does. Only verified reviewers see it, and it carries no name, address
 * or e-mail of the homeowner. Served by the requests_board_* indexes (see the EXPLAIN test).
 */
export async function listBoard(knex: Knex, actor: Actor, q: BoardQuery): Promise<BoardPage> {
  if (actor.role !== "reviewer" || !(await isVerifiedReviewer(knex, actor.id)))
    throw forbidden("The board is open to verified reviewers.");
  const limit = q.limit ?? 20;
  const query = buildBoardQuery(knex, q, limit);
  const rows = (await query) as BoardRow[];
  const page = rows.slice(0, limit);
  // The loop-check level comes from the projects in a second, primary-key lookup, so the board
  // query itself touches only the requests_board_* indexes.
  const levels = new Map<number, string | null>(
    (
      await knex("projects")
        .whereIn("id", [...new Set(page.map((r) => r.project_id))])
        .select("id", "worst_level")
    ).map((p) => [Number(p.id), p.worst_level]),
  );
  const last = page.at(-1);
  return {
    items: page.map((r) => ({
      id: Number(r.id),
      kind: r.kind,
      region: r.region,
      collectorType: r.collector_type,
      budgetMinMinor: r.budget_min_minor,
      budgetMaxMinor: r.budget_max_minor,
      currency: r.currency,
      windowStart: r.window_start,
      windowEnd: r.window_end,
      createdAt: r.created_at,
      expiresAt: r.expires_at,
      worstLevel: levels.get(Number(r.project_id)) ?? null,
    })),
    nextCursor:
      rows.length > limit && last
        ? `${q.sort === "budget" ? last.budget_max_minor : last.created_at}|${last.id}`
        : null,
  };
}

/** The board's query on its own, so tests can EXPLAIN exactly what the route runs. */
export function buildBoardQuery(knex: Knex, q: BoardQuery, limit: number): Knex.QueryBuilder {
  const sortColumn = q.sort === "budget" ? "r.budget_max_minor" : "r.created_at";
  return knex("requests as r")
    .where("r.status", "open")
    .andWhere("r.expires_at", ">", sqlNow())
    .modify((b) => {
      if (q.kind) b.where("r.kind", q.kind);
      if (q.region) b.where("r.region", q.region);
      if (q.collectorType) b.where("r.collector_type", q.collectorType);
      if (q.budgetMin !== undefined)
        b.where("r.budget_max_minor", ">=", Math.round(q.budgetMin * 100));
      if (q.budgetMax !== undefined)
        b.where("r.budget_min_minor", "<=", Math.round(q.budgetMax * 100));
      if (q.postedWithinDays)
        b.where("r.created_at", ">=", sqlNow(-q.postedWithinDays * 86_400_000));
      if (q.cursor) {
        const [value, id] = q.cursor.split("|") as [string, string];
        // Written out as OR: MariaDB does not use a row comparison as an index range.
        b.where((w) =>
          w
            .where(sortColumn, "<", value)
            .orWhere((x) => x.where(sortColumn, value).andWhere("r.id", "<", Number(id))),
        );
      }
    })
    .orderBy([
      { column: sortColumn, order: "desc" },
      { column: "r.id", order: "desc" },
    ])
    .limit(limit + 1)
    .select(
      "r.id",
      "r.kind",
      "r.region",
      "r.collector_type",
      "r.budget_min_minor",
      "r.budget_max_minor",
      "r.currency",
      "r.window_start",
      "r.window_end",
      "r.created_at",
      "r.expires_at",
      "r.project_id",
    );
}
