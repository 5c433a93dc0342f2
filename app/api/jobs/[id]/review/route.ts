import { getReviewState } from "@/lib/data/review";
import { requireRole } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { jobIdOf, jsonRoute } from "@/lib/server/json-route";

/** The review's saved answers, draft and questions, refetched by the workspace. */
export async function GET(_req: Request, ctx: { params: Promise<{ id: string }> }) {
  return jsonRoute(async () => {
    const user = await requireRole("reviewer", "admin");
    return getReviewState(db(), user, await jobIdOf(ctx));
  });
}
