import type { Knex } from "knex";
import type { BoardQuery } from "@/lib/validation/board";
import { DAY_MS, sqlDateTime } from "@/lib/time";
import type { Actor } from "./actor";
import type { Db } from "./db";
import { forbidden, unprocessable } from "./errors";
import { isVerifiedReviewer } from "./reviewers";
import type { BoardItem, BoardPage } from "@/lib/types/board";

export type { BoardItem, BoardPage } from "@/lib/types/board";

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
  distance_km: number | string | null;
}

/**
 * The request board: open, unexpired requests, newest first (or by budget), keyset-paginated so
 * page 50 costs what page 1 does. Only verified reviewers see it, and it carries no name, address
 * or e-mail of the homeowner. Served by the requests_board_* indexes (see the EXPLAIN test).
 */
export async function listBoard(db: Db, actor: Actor, q: BoardQuery): Promise<BoardPage> {
  if (actor.role !== "reviewer" || !(await isVerifiedReviewer(db, actor.id)))
    throw forbidden("The board is open to verified reviewers.");
  const limit = q.limit ?? 20;
  const profile = await db("reviewer_profiles")
    .where({ user_id: actor.id })
    .first("centre_lat", "centre_lng");
  const centre =
    profile?.centre_lat != null && profile?.centre_lng != null
      ? { lat: Number(profile.centre_lat), lng: Number(profile.centre_lng) }
      : null;
  if ((q.withinKm || q.sort === "distance") && !centre) {
    throw unprocessable(
      "Set your site-visit centre point in your profile to filter or sort by distance.",
      { withinKm: ["Needs your centre point"] },
    );
  }
  const query = buildBoardQuery(db, q, limit, centre);
  const rows = (await query) as BoardRow[];
  const page = rows.slice(0, limit);
  // The loop-check level comes from the projects in a second, primary-key lookup, so the board
  // query itself touches only the requests_board_* indexes.
  const levels = new Map<number, string | null>(
    (
      await db("projects")
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
      distanceKm: r.distance_km === null ? null : Math.round(Number(r.distance_km) * 10) / 10,
    })),
    nextCursor:
      rows.length > limit && last
        ? q.sort === "distance" || q.sort === "soonest"
          ? `o:${(q.cursor?.startsWith("o:") ? Number(q.cursor.slice(2)) : 0) + limit}`
          : `${q.sort === "budget" ? last.budget_max_minor : last.created_at}|${last.id}`
        : null,
  };
}

/** The board's query on its own, so tests can EXPLAIN exactly what the route runs. */
export interface Centre {
  lat: number;
  lng: number;
}

/** Great-circle distance in km from the centre (haversine, mean Earth radius 6371 km). */
function distanceSql(db: Db, c: Centre) {
  return db.raw(
    "6371 * 2 * ASIN(SQRT(POWER(SIN(RADIANS(r.site_lat - ?) / 2), 2) + COS(RADIANS(?)) * COS(RADIANS(r.site_lat)) * POWER(SIN(RADIANS(r.site_lng - ?) / 2), 2)))",
    [c.lat, c.lat, c.lng],
  );
}

/**
 * The board's query on its own, so tests can EXPLAIN exactly what the route runs. Newest and
 * budget use keyset cursors; distance and soonest-visit (site visits only, a small set) use an
 * offset cursor `o:N`.
 */
export function buildBoardQuery(
  db: Db,
  q: BoardQuery,
  limit: number,
  centre: Centre | null = null,
): Knex.QueryBuilder {
  const keyset = q.sort === "newest" || q.sort === "budget";
  const sortColumn = q.sort === "budget" ? "r.budget_max_minor" : "r.created_at";
  const b = db("requests as r")
    .where("r.status", "open")
    .andWhere("r.expires_at", ">", sqlDateTime());
  if (q.kind) b.where("r.kind", q.kind);
  if (q.region) b.where("r.region", q.region);
  if (q.collectorType) b.where("r.collector_type", q.collectorType);
  if (q.budgetMin !== undefined) b.where("r.budget_max_minor", ">=", Math.round(q.budgetMin * 100));
  if (q.budgetMax !== undefined) b.where("r.budget_min_minor", "<=", Math.round(q.budgetMax * 100));
  if (q.postedWithinDays)
    b.where("r.created_at", ">=", sqlDateTime(new Date(), -q.postedWithinDays * DAY_MS));
  if (q.withinKm && centre)
    b.whereNotNull("r.site_lat").where(distanceSql(db, centre), "<=", q.withinKm);
  if (q.sort === "distance") b.whereNotNull("r.site_lat");
  if (q.sort === "soonest") b.whereNotNull("r.window_start");
  if (q.cursor && keyset && q.cursor.includes("|")) {
    const [value, id] = q.cursor.split("|") as [string, string];
    // Written out as OR: MariaDB does not use a row comparison as an index range.
    b.where((w) =>
      w
        .where(sortColumn, "<", value)
        .orWhere((x) => x.where(sortColumn, value).andWhere("r.id", "<", Number(id))),
    );
  }
  if (q.sort === "distance" && centre)
    b.orderByRaw("? ASC", [distanceSql(db, centre)]).orderBy("r.id", "desc");
  else if (q.sort === "soonest")
    b.orderBy([
      { column: "r.window_start", order: "asc" },
      { column: "r.id", order: "desc" },
    ]);
  else
    b.orderBy([
      { column: sortColumn, order: "desc" },
      { column: "r.id", order: "desc" },
    ]);
  if (!keyset && q.cursor?.startsWith("o:")) b.offset(Number(q.cursor.slice(2)));
  return b
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
      centre
        ? db.raw("? AS distance_km", [distanceSql(db, centre)])
        : db.raw("NULL AS distance_km"),
    );
}
