import { HttpError } from "@/lib/server/errors";

/** The HTTP status a domain call would answer with: 200, or its HttpError's status. */
export async function statusOf(p: Promise<unknown>): Promise<number> {
  try {
    await p;
    return 200;
  } catch (err) {
    if (err instanceof HttpError) return err.status;
    throw err;
  }
}
