import { z } from "zod";
import { requireTokenActor } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { HttpError } from "@/lib/data/errors";
import { errorResponse } from "@/lib/server/http";
import { listBoard } from "@/lib/data/board";
import { boardQuerySchema } from "@/lib/validation/board";

/** The request board as JSON, for the board page's client-side fetching. */
export async function GET(req: Request) {
  try {
    // listBoard reads the reviewer's row (role, suspension, credentials) in its own query.
    const user = await requireTokenActor("reviewer");
    const params = Object.fromEntries(new URL(req.url).searchParams);
    const parsed = boardQuerySchema.safeParse(params);
    if (!parsed.success) {
      throw new HttpError(
        400,
        "Some filters are not valid.",
        z.flattenError(parsed.error).fieldErrors as Record<string, string[]>,
      );
    }
    return Response.json(await listBoard(db(), user, parsed.data), {
      headers: { "cache-control": "private, no-store" },
    });
  } catch (err) {
    return errorResponse(err);
  }
}
