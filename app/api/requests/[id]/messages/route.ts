import { idSchema } from "@/lib/validation/id";
import { requireRole } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { HttpError } from "@/lib/data/errors";
import { errorResponse } from "@/lib/server/http";
import { listMessages, postMessage } from "@/lib/data/messages";

const id = idSchema;

async function ids(req: Request, ctx: { params: Promise<{ id: string }> }) {
  const requestId = id.safeParse((await ctx.params).id);
  if (!requestId.success)
    throw new HttpError(400, "The request id must be a positive whole number.");
  const raw = new URL(req.url).searchParams.get("reviewer");
  const reviewer = raw === null ? undefined : id.safeParse(raw);
  if (reviewer && !reviewer.success)
    throw new HttpError(400, "reviewer must be a positive whole number.", {
      reviewer: ["Not a valid id"],
    });
  return { requestId: requestId.data, reviewerId: reviewer?.data };
}

/** The conversation on a request, polled by the thread view; admins may read it too. */
export async function GET(req: Request, ctx: { params: Promise<{ id: string }> }) {
  try {
    const user = await requireRole("homeowner", "reviewer", "admin");
    const { requestId, reviewerId } = await ids(req, ctx);
    return Response.json(await listMessages(db(), user, requestId, reviewerId), {
      headers: { "cache-control": "no-store" },
    });
  } catch (err) {
    return errorResponse(err);
  }
}

/** A new message: the homeowner, or a reviewer whose quote is live or accepted (lib/data). */
export async function POST(req: Request, ctx: { params: Promise<{ id: string }> }) {
  try {
    const user = await requireRole("homeowner", "reviewer", "admin");
    const { requestId, reviewerId } = await ids(req, ctx);
    const body = await req.json().catch(() => {
      throw new HttpError(400, 'Send JSON: { "body": "…" }');
    });
    return Response.json(
      { id: await postMessage(db(), user, requestId, body, reviewerId) },
      { status: 201 },
    );
  } catch (err) {
    return errorResponse(err);
  }
}
