import { NextResponse, type NextRequest } from "next/server";
import { findTowns, townLabel } from "@/lib/towns";

export const dynamic = "force-dynamic";

/** Towns matching ?q= (at least two letters), from the packaged gazetteer: no outside geocoder. */
export async function GET(req: NextRequest) {
  const q = (req.nextUrl.searchParams.get("q") ?? "").slice(0, 80);
  const towns = findTowns(q).map((t) => ({ id: t.id, label: townLabel(t) }));
  return NextResponse.json({ towns }, { headers: { "cache-control": "no-store" } });
}
