/** Plain words for the verdicts and outcomes (the database keeps the keys). */
import type { Outcome, Verdict } from "@/lib/types/review";

export const VERDICT_LABELS: Record<Verdict, string> = {
  sound: "Sound",
  concern: "Concern",
  unsafe: "Unsafe",
  not_applicable: "Not applicable",
  could_not_verify: "Could not verify",
};

export const VERDICT_HINTS: Record<Verdict, string> = {
  sound: "Meets the check as described and shown.",
  concern: "Works, but should be improved or watched.",
  unsafe: "Must be put right before the loop is filled or run.",
  not_applicable: "Does not apply to this system after all.",
  could_not_verify: "The sketch, photos and description do not show enough to judge.",
};

export const OUTCOME_LABELS: Record<Outcome, string> = {
  ready_to_commission: "Ready to commission",
  fix_before_filling: "Fix before filling",
  do_not_proceed: "Do not proceed",
};

export const OUTCOME_HINTS: Record<Outcome, string> = {
  ready_to_commission:
    "Nothing found that stops the loop being filled and commissioned as described.",
  fix_before_filling: "Make the required changes below before the loop is filled.",
  do_not_proceed: "Serious problems: do not fill, run or go further until they are resolved.",
};
