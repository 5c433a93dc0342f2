import { deliverReport } from "@/lib/data/review";
import { requireRole } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { jobIdOf, jsonRoute } from "@/lib/server/json-route";

/** Deliver the report: the delivery rules must hold; freezes it and moves the job to delivered. */
export async function POST(_req: Request, ctx: { params: Promise<{ id: string }> }) {
  return jsonRoute(async () => {
    const user = await requireRole("reviewer", "admin");
    const snapshot = await deliverReport(db(), user, await jobIdOf(ctx));
    return { delivered: true, outcome: snapshot.outcome };
  });
}
