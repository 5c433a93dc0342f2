import type { Knex } from "knex";
import type { BoardQuery } from "@/lib/validation/board";
import { DAY_MS, sqlDateTime } from "@/lib/time";
import type { Actor } from "./actor";
import type { Db } from "./db";
import { forbidden, HttpError, unauthorized, unprocessable } from "./errors";
import { getBoardReviewer } from "./reviewers";
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
  worst_level: string | null;
  distance_km: number | string | null;
}

/**
 * The request board: open, unexpired requests, newest first (or by budget, distance or the
 * soonest visit window), keyset-paginated on every sort so page 200 costs what page 1 does. Only
 * verified reviewers see it, and it carries no name, address or e-mail of the homeowner.
 *
 * Two round trips per page: the reviewer's verified state and centre point in one query
 * (`getBoardReviewer`), then the board rows with the project's loop-check level joined by primary
 * key, read for the page's rows only. Served by the requests_board_* indexes (see the EXPLAIN test).
 */
export async function listBoard(db: Db, actor: Actor, q: BoardQuery): Promise<BoardPage> {
  if (actor.role !== "reviewer") throw forbidden("The board is open to verified reviewers.");
  const me = await getBoardReviewer(db, actor.id);
  if (!me) throw unauthorized();
  if (actor.sessionVersion !== undefined && actor.sessionVersion !== me.sessionVersion)
    throw unauthorized();
  if (!me.verified) throw forbidden("The board is open to verified reviewers.");
  const limit = q.limit ?? 20;
  const centre = me.centre;
  if ((q.withinKm || q.sort === "distance") && !centre) {
    throw unprocessable(
      "Set your site-visit centre point in your profile to filter or sort by distance.",
      { withinKm: ["Needs your centre point"] },
    );
  }
  const rows = (await buildBoardQuery(db, q, limit, centre)) as BoardRow[];
  return toBoardPage(rows, q.sort, limit);
}

/** Rows (limit + 1 of them) to the page the route answers; the extra row only says "more". */
export function toBoardPage(rows: BoardRow[], sort: BoardQuery["sort"], limit: number): BoardPage {
  const page = rows.slice(0, limit);
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
      worstLevel: r.worst_level ?? null,
      distanceKm: r.distance_km === null ? null : Math.round(Number(r.distance_km) * 10) / 10,
    })),
    nextCursor: rows.length > limit && last ? `${cursorValue(last, sort)}|${last.id}` : null,
  };
}

function cursorValue(r: BoardRow, sort: BoardQuery["sort"]): string {
  if (sort === "budget") return String(r.budget_max_minor);
  if (sort === "soonest") return r.window_start ?? "";
  // The exact double MariaDB computed, so the next page starts right after this row.
  if (sort === "distance") return String(Number(r.distance_km));
  return r.created_at;
}

/** The reviewer's site-visit centre point. */
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

/** km per degree of latitude on the haversine's sphere (6371 km × π / 180 = 111.195 km). */
const KM_PER_DEGREE_LAT = 111.19;

/**
 * The board's query on its own, so tests can EXPLAIN exactly what the route runs. Every sort
 * pages by a keyset cursor `<sort value>|<id>` (the row comparison written out as OR, which
 * MariaDB can use as an index range); no OFFSET. The distance filter adds the latitude band the
 * circle lies in (a site within k km is within k / 111.19 degrees of latitude), which changes no
 * result but narrows the index range before the distance is worked out.
 *
 * The newest, budget and soonest sorts read their index in order and stop after the page. The
 * distance sort and filter must work the distance out for every site visit in range, so they
 * run as a deferred join: the inner query picks the page's ids (and distances) from
 * requests_board_distance alone, an index that carries every column a filter reads, without
 * touching the wide request rows (each holds the system and loop-check snapshots); the outer
 * query then reads only those `limit + 1` rows by primary key.
 */
export function buildBoardQuery(
  db: Db,
  q: BoardQuery,
  limit: number,
  centre: Centre | null = null,
): Knex.QueryBuilder {
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
    b.whereBetween("r.site_lat", [
      centre.lat - q.withinKm / KM_PER_DEGREE_LAT,
      centre.lat + q.withinKm / KM_PER_DEGREE_LAT,
    ]).where(distanceSql(db, centre), "<=", q.withinKm);
  if (q.sort === "distance") b.whereNotNull("r.site_lat");
  if (q.sort === "soonest") b.whereNotNull("r.window_start");

  // The sort key, its direction (the id always breaks ties downwards) and the cursor's value.
  const key =
    q.sort === "budget"
      ? { col: "r.budget_max_minor", dir: "desc" as const }
      : q.sort === "soonest"
        ? { col: "r.window_start", dir: "asc" as const }
        : q.sort === "distance" && centre
          ? { col: distanceSql(db, centre), dir: "asc" as const }
          : { col: "r.created_at", dir: "desc" as const };
  const cursor = q.cursor?.includes("|") ? q.cursor.split("|") : null;
  if (cursor) {
    const [raw, id] = cursor as [string, string];
    const numeric = q.sort === "distance" || q.sort === "budget";
    const value: string | number = numeric ? Number(raw) : raw;
    if (numeric && !Number.isFinite(value))
      throw new HttpError(400, "Some filters are not valid.", {
        cursor: ["Not a valid page cursor"],
      });
    const beyond = key.dir === "desc" ? "<" : ">";
    // Written out as OR: MariaDB does not use a row comparison as an index range.
    const col = key.col;
    b.where((w) => {
      if (typeof col === "string") w.where(col, beyond, value);
      else w.where(col, beyond, value);
      w.orWhere((x) => {
        if (typeof col === "string") x.where(col, value);
        else x.where(col, "=", value);
        x.andWhere("r.id", "<", Number(id));
      });
    });
  }
  if (typeof key.col === "string") {
    b.orderBy([
      { column: key.col, order: key.dir },
      { column: "r.id", order: "desc" },
    ]);
  } else {
    // By the alias, so the distance is worked out once per row for the select and the sort.
    b.orderByRaw(`sort_key ${key.dir.toUpperCase()}`).orderBy("r.id", "desc");
  }
  const columns = (t: string) =>
    [
      "id",
      "kind",
      "region",
      "collector_type",
      "budget_min_minor",
      "budget_max_minor",
      "currency",
      "window_start",
      "window_end",
      "created_at",
      "expires_at",
    ].map((c) => `${t}.${c}`);
  // The newest, budget and soonest sorts read their index in order and stop at the page: one
  // query, the rows read by primary key as they are taken.
  if (!centre || (q.sort !== "distance" && !q.withinKm)) {
    return b
      .leftJoin("projects as p", "p.id", "r.project_id")
      .limit(limit + 1)
      .select(
        ...columns("r"),
        "p.worst_level",
        centre
          ? db.raw("? AS distance_km", [distanceSql(db, centre)])
          : db.raw("NULL AS distance_km"),
      );
  }
  const ids = b.limit(limit + 1).select(
    "r.id",
    db.raw("? AS sort_key", [typeof key.col === "string" ? db.ref(key.col) : key.col]),
    // Sorted by distance, the sort key is the distance; otherwise it is worked out here.
    q.sort !== "distance"
      ? db.raw("? AS distance_km", [distanceSql(db, centre)])
      : db.raw("NULL AS distance_km"),
  );
  return db
    .from(ids.as("page"))
    .join("requests as rq", "rq.id", "page.id")
    .leftJoin("projects as p", "p.id", "rq.project_id")
    .orderBy([
      { column: "page.sort_key", order: key.dir },
      { column: "page.id", order: "desc" },
    ])
    .select(
      ...columns("rq"),
      "p.worst_level",
      q.sort === "distance" ? "page.sort_key as distance_km" : "page.distance_km",
    );
}
