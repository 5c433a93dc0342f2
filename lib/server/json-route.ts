import "server-only";
import { HttpError, parseId } from "@/lib/data/errors";
import { StaleWriteError } from "@/lib/data/review";
import { errorResponse } from "./http";

/** The JSON body of a request, or 400 in plain words. */
export async function jsonBody(req: Request, example: string): Promise<unknown> {
  try {
    return await req.json();
  } catch {
    throw new HttpError(400, `Send JSON, such as ${example}.`);
  }
}

/** The job id of a route segment; a malformed one names no job (404). */
export async function jobIdOf(ctx: { params: Promise<{ id: string }> }): Promise<number> {
  return parseId((await ctx.params).id, "job");
}

/** Run a JSON route: the answer as JSON, a refusal as `errorResponse`, a stale write with the saved version. */
export async function jsonRoute(run: () => Promise<unknown>, status = 200): Promise<Response> {
  try {
    return Response.json(await run(), { status, headers: { "cache-control": "no-store" } });
  } catch (err) {
    if (err instanceof StaleWriteError)
      return Response.json({ error: err.message, current: err.current }, { status: 409 });
    return errorResponse(err);
  }
}
