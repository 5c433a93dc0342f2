/**
 * The rules a report must meet before it is delivered, as a pure function: the data layer calls
 * it with the job locked and refuses delivery (422) with these problems; the workspace calls it
 * as the reviewer works, to show what is still missing.
 *
 * Blocking:
 * - every applicable item has a verdict;
 * - an outcome is chosen, and a summary written;
 * - no item is `unsafe` when the outcome is "ready to commission";
 * - "fix before filling" and "do not proceed" list at least one required change;
 * - each required change says what to do and names at least one item of this checklist.
 * Warnings (delivery goes ahead): an unsafe or concern item that no required change mentions.
 */
import type { Outcome, RequiredChange, Verdict } from "@/lib/types/review";
import { itemTitle } from "./item-titles";
import { OUTCOME_LABELS } from "./verdicts";

export interface DeliveryInput {
  /** The checklist's item keys, in order. */
  itemKeys: readonly string[];
  verdicts: Readonly<Record<string, Verdict | null | undefined>>;
  outcome: Outcome | null;
  summaryMd: string;
  requiredChanges: readonly RequiredChange[];
}

export type DeliveryProblemCode =
  | "unanswered"
  | "no_outcome"
  | "no_summary"
  | "unsafe_but_ready"
  | "no_required_changes"
  | "change_without_text"
  | "change_without_items"
  | "change_unknown_item";

export interface DeliveryProblem {
  code: DeliveryProblemCode;
  message: string;
  /** The items concerned, when there are any. */
  itemKeys: string[];
}

export interface DeliveryCheck {
  ok: boolean;
  problems: DeliveryProblem[];
  warnings: DeliveryProblem[];
}

const list = (keys: readonly string[]) => keys.map(itemTitle).join(", ");

export function checkDelivery(input: DeliveryInput): DeliveryCheck {
  const problems: DeliveryProblem[] = [];
  const warnings: DeliveryProblem[] = [];
  const known = new Set(input.itemKeys);

  const unanswered = input.itemKeys.filter((k) => !input.verdicts[k]);
  if (unanswered.length)
    problems.push({
      code: "unanswered",
      message: `${unanswered.length} ${unanswered.length === 1 ? "item has" : "items have"} no verdict yet: ${list(unanswered)}.`,
      itemKeys: unanswered,
    });

  if (!input.outcome)
    problems.push({ code: "no_outcome", message: "Choose the overall outcome.", itemKeys: [] });
  if (!input.summaryMd.trim())
    problems.push({
      code: "no_summary",
      message: "Write a summary for the homeowner.",
      itemKeys: [],
    });

  const unsafe = input.itemKeys.filter((k) => input.verdicts[k] === "unsafe");
  if (input.outcome === "ready_to_commission" && unsafe.length)
    problems.push({
      code: "unsafe_but_ready",
      message: `${list(unsafe)} ${unsafe.length === 1 ? "is" : "are"} marked unsafe, so the outcome cannot be “${OUTCOME_LABELS.ready_to_commission}”.`,
      itemKeys: unsafe,
    });

  if (
    (input.outcome === "fix_before_filling" || input.outcome === "do_not_proceed") &&
    input.requiredChanges.length === 0
  )
    problems.push({
      code: "no_required_changes",
      message: `List at least one required change for “${OUTCOME_LABELS[input.outcome]}”.`,
      itemKeys: [],
    });

  input.requiredChanges.forEach((c, i) => {
    const n = i + 1;
    if (!c.text.trim())
      problems.push({
        code: "change_without_text",
        message: `Required change ${n} says nothing yet: write what to do.`,
        itemKeys: [],
      });
    if (c.itemKeys.length === 0)
      problems.push({
        code: "change_without_items",
        message: `Required change ${n} is not linked to a checklist item.`,
        itemKeys: [],
      });
    const unknown = c.itemKeys.filter((k) => !known.has(k));
    if (unknown.length)
      problems.push({
        code: "change_unknown_item",
        message: `Required change ${n} names an item that is not on this checklist.`,
        itemKeys: unknown,
      });
  });

  const covered = new Set(input.requiredChanges.flatMap((c) => c.itemKeys));
  const uncovered = input.itemKeys.filter(
    (k) => (input.verdicts[k] === "unsafe" || input.verdicts[k] === "concern") && !covered.has(k),
  );
  if (uncovered.length)
    warnings.push({
      code: "change_without_items",
      message: `No required change mentions ${list(uncovered)}, marked unsafe or a concern.`,
      itemKeys: uncovered,
    });

  return { ok: problems.length === 0, problems, warnings };
}
