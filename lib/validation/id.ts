import { z } from "@/lib/zod";

/**
 * A database id from the outside world (a route segment, a form field, an action argument): a
 * whole number, or a string of digits. Nothing is coerced, so NaN, Infinity, true, [5], {} or a
 * Date never pass for an id.
 */
export const idSchema = z
  .union(
    [
      z.number(),
      z
        .string()
        .trim()
        .regex(/^\d{1,16}$/)
        .transform(Number),
    ],
    {
      error: "Not a valid id",
    },
  )
  .pipe(
    z
      .number({ error: "Not a valid id" })
      .int("Not a valid id")
      .positive("Not a valid id")
      .max(Number.MAX_SAFE_INTEGER, "Not a valid id"),
  );
