import { saveReportDraft } from "@/lib/data/review";
import { requireRole } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { jobIdOf, jsonBody, jsonRoute } from "@/lib/server/json-route";

/** Autosave the report's outcome, summary and required changes, with `expectedVersion`. */
export async function PUT(req: Request, ctx: { params: Promise<{ id: string }> }) {
  return jsonRoute(async () => {
    const user = await requireRole("reviewer", "admin");
    const jobId = await jobIdOf(ctx);
    const body = await jsonBody(req, '{ "summaryMd": "…", "expectedVersion": 0 }');
    return saveReportDraft(db(), user, jobId, body);
  });
}
