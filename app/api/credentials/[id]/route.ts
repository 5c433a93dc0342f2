import { idSchema } from "@/lib/validation/id";
import { requireRole } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { HttpError } from "@/lib/data/errors";
import { errorResponse } from "@/lib/server/http";
import { getCredential } from "@/lib/data/reviewers";

/** One credential as JSON: for its reviewer and for admins only. */
export async function GET(_req: Request, ctx: { params: Promise<{ id: string }> }) {
  try {
    const user = await requireRole("reviewer", "admin");
    const id = idSchema.safeParse((await ctx.params).id);
    if (!id.success) throw new HttpError(400, "The credential id must be a positive whole number.");
    return Response.json(await getCredential(db(), user, id.data));
  } catch (err) {
    return errorResponse(err);
  }
}
