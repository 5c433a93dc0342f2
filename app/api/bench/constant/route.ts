import type { BoardPage } from "@/lib/types/board";

export const dynamic = "force-dynamic";

/**
 * The framework's floor for `npm run bench`: a route in this app answering constant JSON the
 * size and shape of a board page, so the board's throughput can be read against what Next.js
 * itself costs. It exists only when the server runs with BENCH=1; otherwise it is a 404.
 */
const PAGE: BoardPage = {
  items: Array.from({ length: 20 }, (_, i) => ({
    id: 1_018_000 - i,
    kind: i % 3 ? "remote_check" : "site_visit",
    region: "south-west",
    collectorType: i % 2 ? "evacuated_tube" : "flat_plate",
    budgetMinMinor: 15000,
    budgetMaxMinor: 36000,
    currency: "GBP",
    windowStart: i % 3 ? null : "2026-12-19",
    windowEnd: i % 3 ? null : "2027-01-18",
    createdAt: "2026-12-02 10:05:21.123",
    expiresAt: "2026-12-20 10:05:21.123",
    worstLevel: "fix",
    distanceKm: null,
  })),
  nextCursor: "2026-12-02 09:05:21.123|1017980",
};
const BODY = JSON.stringify(PAGE);

export function GET() {
  if (process.env.BENCH !== "1") {
    return Response.json({ message: "Not found." }, { status: 404 });
  }
  return new Response(BODY, {
    headers: { "content-type": "application/json", "cache-control": "private, no-store" },
  });
}
