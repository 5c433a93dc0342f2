/**
 * What every server action answers: success with a message, or a refusal with a message, the
 * errors beside each field, and what the person typed (so nothing is lost on a failed submit).
 * Shared by the actions (lib/server/action.ts) and the client forms that show the answer.
 */
export interface ActionState {
  ok: boolean;
  message?: string;
  fieldErrors?: Record<string, string[]>;
  values?: Record<string, string | string[]>;
}

/** The state a form starts in, before anything is submitted. */
export const idleState: ActionState = { ok: false };
