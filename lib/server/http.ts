import "server-only";
import { HttpError } from "@/lib/data/errors";
import { noteDatabaseDown } from "@/lib/data/health";

/** Turn an error into a JSON response; unexpected errors are logged, never shown. */
export function errorResponse(err: unknown): Response {
  if (err instanceof HttpError) {
    return Response.json(
      { error: err.message, ...(err.fieldErrors ? { fieldErrors: err.fieldErrors } : {}) },
      { status: err.status },
    );
  }
  if (isDatabaseDown(err)) {
    noteDatabaseDown();
    return Response.json(
      { error: "The service is briefly unavailable. Please try again in a moment." },
      { status: 503 },
    );
  }
  console.error(err);
  return Response.json(
    { error: "Something went wrong on our side. Please try again." },
    { status: 500 },
  );
}

/** The database could not be reached (stopped, restarting, pool timed out). */
export function isDatabaseDown(err: unknown): boolean {
  const code = (err as { code?: string } | null)?.code;
  const name = (err as { name?: string } | null)?.name;
  return (
    code === "ECONNREFUSED" ||
    code === "PROTOCOL_CONNECTION_LOST" ||
    code === "ETIMEDOUT" ||
    name === "KnexTimeoutError"
  );
}
