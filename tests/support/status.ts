import { HttpError } from "@/lib/data/errors";

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

/** The refusal a domain call throws; fails the test when it succeeds or throws anything else. */
export async function refusalOf(p: Promise<unknown>): Promise<HttpError> {
  try {
    await p;
  } catch (err) {
    if (err instanceof HttpError) return err;
    throw err;
  }
  throw new Error("expected a refusal, but the call succeeded");
}
