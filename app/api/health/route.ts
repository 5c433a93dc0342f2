import { NextResponse } from "next/server";
import { getHealth } from "@/lib/data/health";

export const dynamic = "force-dynamic";

export async function GET() {
  const health = await getHealth();
  return NextResponse.json(health, {
    status: health.database === "up" ? 200 : 503,
    headers: { "cache-control": "no-store" },
  });
}
