/** Shapes shared by lib/data/board.ts and the client components that show them. */

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
  distanceKm: number | null;
}

export interface BoardPage {
  items: BoardItem[];
  nextCursor: string | null;
}

/**
 * The filters a person sets on the board page: every field of the board query but the paging
 * ones. Kept here, free of zod, so the board page's script does not carry the schema library;
 * lib/validation/board.ts checks at compile time that it matches the schema's fields.
 */
export const BOARD_FILTER_KEYS = [
  "kind",
  "collectorType",
  "region",
  "budgetMin",
  "budgetMax",
  "postedWithinDays",
  "withinKm",
  "sort",
] as const;
