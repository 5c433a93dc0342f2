import { askForItem } from "@/lib/data/review";
import { requireRole } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { jobIdOf, jsonBody, jsonRoute } from "@/lib/server/json-route";

/** The reviewer asks the homeowner for a photo or a fact about one item. */
export async function POST(req: Request, ctx: { params: Promise<{ id: string }> }) {
  return jsonRoute(async () => {
    const user = await requireRole("reviewer", "admin");
    const jobId = await jobIdOf(ctx);
    const body = await jsonBody(
      req,
      '{ "itemKey": "vessel-rating", "kind": "photo", "questionMd": "…" }',
    );
    return askForItem(db(), user, jobId, body);
  }, 201);
}
