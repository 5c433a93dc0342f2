import "server-only";
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import type { z } from "zod";
import { HttpError, fieldErrorsOf } from "@/lib/data/errors";
import type { Role } from "@/lib/data/actor";
import { getCurrentUser, type CurrentUser } from "./auth/session";
import { isDatabaseDown } from "./http";
import { clientAddress } from "./client-address";
import { noteDatabaseDown } from "@/lib/data/health";

import type { ActionState } from "@/lib/types/action";

export type { ActionState } from "@/lib/types/action";

interface ActionOptions<S extends z.ZodType, R> {
  /** Roles that may run the action; anyone else gets a refusal message, not an error page. */
  roles?: readonly Role[];
  /** The shared schema that parses the input (ids included) before anything else runs. */
  schema: S;
  input: unknown;
  /** Echoed back on failure so the form keeps what was typed. */
  values?: Record<string, string | string[]>;
  /** The one lib/data call, with the actor and the parsed input. */
  run: (actor: CurrentUser, input: z.output<S>) => Promise<R>;
  /** The message on success. */
  done: string | ((result: R) => string);
  /** Runs after success, outside the error handling: revalidatePath, redirect. */
  after?: (result: R, input: z.output<S>) => void;
}

/**
 * One shape for every server action: read the actor, parse the input with the shared schema,
 * call one lib/data function, and turn an expected refusal into a message. A signed-out visitor
 * goes to sign-in; an unexpected error is logged and answered in plain words; no expected refusal
 * ever becomes an error page.
 */
export async function runAction<S extends z.ZodType, R>(
  opts: ActionOptions<S, R>,
): Promise<ActionState> {
  const values = opts.values;
  let user: CurrentUser | null;
  try {
    user = await getCurrentUser();
  } catch (err) {
    return failure(err, values);
  }
  if (!user) redirect("/sign-in");
  if (opts.roles && !opts.roles.includes(user.role))
    return { ok: false, message: "Your account cannot do this.", values };
  const parsed = opts.schema.safeParse(opts.input);
  if (!parsed.success)
    return {
      ok: false,
      message: "Some details need attention.",
      fieldErrors: fieldErrorsOf(parsed.error),
      values,
    };
  let result: R;
  try {
    result = await opts.run(user, parsed.data);
  } catch (err) {
    return failure(err, values);
  }
  opts.after?.(result, parsed.data);
  return { ok: true, message: typeof opts.done === "function" ? opts.done(result) : opts.done };
}

interface PublicActionOptions<S extends z.ZodType, R> {
  schema: S;
  input: unknown;
  values?: Record<string, string | string[]>;
  /** The one lib/data call, with the parsed input and the client's address (for rate limits). */
  run: (input: z.output<S>, client: { address: string }) => Promise<R>;
  done?: string;
  after?: (result: R, input: z.output<S>) => void;
}

/**
 * runAction for people who are not signed in (sign-up, password reset, e-mail confirmation):
 * the same parse-first shape and answers, with no actor.
 */
export async function publicAction<S extends z.ZodType, R>(
  opts: PublicActionOptions<S, R>,
): Promise<ActionState> {
  const values = opts.values;
  const parsed = opts.schema.safeParse(opts.input);
  if (!parsed.success)
    return {
      ok: false,
      message: "Some details need attention.",
      fieldErrors: fieldErrorsOf(parsed.error),
      values,
    };
  let result: R;
  try {
    result = await opts.run(parsed.data, { address: clientAddress(await headers()) });
  } catch (err) {
    return failure(err, values);
  }
  opts.after?.(result, parsed.data);
  return { ok: true, ...(opts.done ? { message: opts.done } : {}) };
}

/** An expected refusal becomes its message; anything else is logged and stays vague. */
export function failure(err: unknown, values?: ActionState["values"]): ActionState {
  if (err instanceof HttpError)
    return { ok: false, message: err.message, fieldErrors: err.fieldErrors, values };
  if (isDatabaseDown(err)) {
    noteDatabaseDown();
    return {
      ok: false,
      message: "The service is briefly unavailable; what you typed is still here. Try again soon.",
      values,
    };
  }
  console.error(err);
  return {
    ok: false,
    message: "Something went wrong on our side; what you typed is still here. Please try again.",
    values,
  };
}

/** A form's fields as a plain object (repeated names as lists), without React's `$ACTION` keys. */
export function formValues(
  formData: FormData,
  lists: readonly string[] = [],
): Record<string, string | string[]> {
  const out: Record<string, string | string[]> = {};
  // Anyone can post any argument list to an action: something that is not a form has no fields,
  // and the schema then refuses it in words instead of the action throwing.
  if (!(formData instanceof FormData)) return out;
  for (const key of new Set(formData.keys())) {
    if (key.startsWith("$")) continue;
    const all = formData.getAll(key).map((v) => (typeof v === "string" ? v : v.name));
    out[key] = lists.includes(key) ? all : (all[0] ?? "");
  }
  return out;
}
