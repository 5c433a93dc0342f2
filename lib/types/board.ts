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
