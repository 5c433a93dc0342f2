import { saveAnswer } from "@/lib/data/review";
import { requireRole } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { jobIdOf, jsonBody, jsonRoute } from "@/lib/server/json-route";

/** Autosave one checklist item: `{ verdict?, noteMd?, pins?, expectedVersion }`. */
export async function PUT(req: Request, ctx: { params: Promise<{ id: string; itemKey: string }> }) {
  return jsonRoute(async () => {
    const user = await requireRole("reviewer", "admin");
    const jobId = await jobIdOf(ctx);
    const { itemKey } = await ctx.params;
    const body = await jsonBody(req, '{ "verdict": "sound", "expectedVersion": 0 }');
    return saveAnswer(db(), user, jobId, decodeURIComponent(itemKey), body);
  });
}
