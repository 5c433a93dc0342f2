import { z } from "zod";
import { idSchema } from "@/lib/validation/id";

export type FieldErrors = Record<string, string[]>;

/**
 * The one error type of the data layer: an expected refusal with the HTTP status it maps to, a
 * message in plain words and, for bad input, errors keyed by field. Route handlers turn it into
 * JSON (lib/server/http.ts), server actions into form state (lib/server/action.ts).
 */
export class HttpError extends Error {
  constructor(
    readonly status: 400 | 401 | 403 | 404 | 409 | 413 | 422 | 429 | 503,
    message: string,
    readonly fieldErrors?: FieldErrors,
  ) {
    super(message);
  }
}
export const badRequest = (m: string) => new HttpError(400, m);
export const unauthorized = (m = "Sign in to continue.") => new HttpError(401, m);
export const forbidden = (m = "You do not have access to this.") => new HttpError(403, m);
export const notFound = (m = "Not found.") => new HttpError(404, m);
export const conflict = (m: string) => new HttpError(409, m);
export const unprocessable = (m: string, fieldErrors?: FieldErrors) =>
  new HttpError(422, m, fieldErrors);
export const tooMany = (m: string) => new HttpError(429, m);

/**
 * Field errors of a failed parse, keyed by the field's dotted path (optionally under a prefix,
 * such as the section of the system description).
 */
export function fieldErrorsOf(error: z.ZodError, prefix = ""): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of error.issues) {
    const key = [prefix, ...issue.path.map(String)].filter(Boolean).join(".") || "form";
    (out[key] ??= []).push(issue.message);
  }
  return out;
}

/** Parse input with a shared schema, or refuse with 422 and the errors beside each field. */
export function parseInput<S extends z.ZodType>(
  schema: S,
  input: unknown,
  message = "Some details need attention.",
  prefix = "",
): z.output<S> {
  const parsed = schema.safeParse(input);
  if (!parsed.success) throw unprocessable(message, fieldErrorsOf(parsed.error, prefix));
  return parsed.data;
}

/** A database id from the outside world (lib/validation/id.ts): digits or a whole number only. */
export { idSchema };

/** An id, or 404: a malformed id names nothing that exists. */
export function parseId(value: unknown, what = "record"): number {
  const parsed = idSchema.safeParse(value);
  if (!parsed.success) throw notFound(`No such ${what}.`);
  return parsed.data;
}
