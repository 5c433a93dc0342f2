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

/**
 * How deeply a JSON text nests (arrays and objects), counted without parsing, so a body nested
 * thousands deep is refused before any recursive parser or validator meets it.
 */
export function jsonDepth(text: string): number {
  let depth = 0;
  let max = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 92)
        i++; // backslash: skip the escaped character
      else if (c === 34) inString = false;
    } else if (c === 34) inString = true;
    else if (c === 91 || c === 123) max = Math.max(max, ++depth);
    else if (c === 93 || c === 125) depth--;
  }
  return max;
}

/**
 * A route's JSON body checked before the handler sees it: at most `maxBytes` (413) and `maxDepth`
 * levels (400), valid JSON (400). Answers null when the body is fine, else the refusal.
 */
export async function refuseBadJson(
  req: Request,
  { maxBytes, maxDepth }: { maxBytes: number; maxDepth: number },
): Promise<Response | null> {
  const declared = Number(req.headers.get("content-length") ?? "0");
  if (declared > maxBytes) return errorResponse(new HttpError(413, "The request is too large."));
  const text = await req.clone().text();
  if (text.length > maxBytes) return errorResponse(new HttpError(413, "The request is too large."));
  if (text.length === 0) return null;
  if (jsonDepth(text) > maxDepth)
    return errorResponse(new HttpError(400, "The request nests too deeply."));
  try {
    JSON.parse(text);
  } catch {
    return errorResponse(new HttpError(400, "The request is not valid JSON."));
  }
  return null;
}
