/**
 * The states of a job (product.md, "Job states"), the same list as the `jobs.state` column in
 * db/migrations/20261201_0003_jobs_and_money.ts, with the words and icons people see for each.
 * Pure data: no database, no framework, no React (icons are lucide-react export names as strings).
 */

export const JOB_STATES = [
  "awaiting_payment",
  "funded",
  "in_review",
  "delivered",
  "disputed",
  "released",
  "partially_refunded",
  "refunded",
  "cancelled",
] as const;

export type JobState = (typeof JOB_STATES)[number];

/** A state string from the database or a request is one of ours. */
export function isJobState(value: unknown): value is JobState {
  return typeof value === "string" && (JOB_STATES as readonly string[]).includes(value);
}

/** States no transition leaves: the money has gone where it is going. */
export const TERMINAL_STATES = [
  "released",
  "partially_refunded",
  "refunded",
  "cancelled",
] as const satisfies readonly JobState[];

export function isTerminal(state: JobState): boolean {
  return (TERMINAL_STATES as readonly JobState[]).includes(state);
}

/** States in which the homeowner's payment is held by the platform (paid, not yet paid out or refunded). */
export const FUNDS_HELD_STATES = [
  "funded",
  "in_review",
  "delivered",
  "disputed",
] as const satisfies readonly JobState[];

export function isFundsHeld(state: JobState): boolean {
  return (FUNDS_HELD_STATES as readonly JobState[]).includes(state);
}

/** Who looks at a job page. */
export type ViewerRole = "homeowner" | "reviewer" | "admin";

/** The short, neutral label for a state: badges, admin tables, the audit log. */
export const STATE_LABELS: Record<JobState, string> = {
  awaiting_payment: "Awaiting payment",
  funded: "Paid, held",
  in_review: "Review in progress",
  delivered: "Report delivered",
  disputed: "In dispute",
  released: "Paid out",
  partially_refunded: "Part refunded",
  refunded: "Refunded",
  cancelled: "Cancelled",
};

/** The label each viewer sees, in their own terms (the homeowner's money is "held", then "released"). */
export const STATE_LABELS_FOR: Record<ViewerRole, Record<JobState, string>> = {
  homeowner: {
    awaiting_payment: "Awaiting your payment",
    funded: "Paid, held until you release it",
    in_review: "Review in progress, payment held",
    delivered: "Report delivered, payment held",
    disputed: "In dispute, payment held",
    released: "Payment released",
    partially_refunded: "Part refunded to you",
    refunded: "Refunded to you",
    cancelled: "Cancelled",
  },
  reviewer: {
    awaiting_payment: "Awaiting the homeowner's payment",
    funded: "Paid, held: ready to start",
    in_review: "Review in progress",
    delivered: "Report delivered",
    disputed: "In dispute",
    released: "Paid out to you",
    partially_refunded: "Part refunded, rest paid out",
    refunded: "Refunded to the homeowner",
    cancelled: "Cancelled",
  },
  admin: STATE_LABELS,
};

/** The label for a state as this viewer should read it (the neutral one with no viewer). */
export function stateLabel(state: JobState, viewer?: ViewerRole): string {
  return viewer ? STATE_LABELS_FOR[viewer][state] : STATE_LABELS[state];
}

/** One or two sentences for the job page: where the money is and what happens next. */
export const STATE_DESCRIPTIONS: Record<ViewerRole, Record<JobState, string>> = {
  homeowner: {
    awaiting_payment:
      "You accepted this quote. Pay to start the review; your payment is held by Loopwright and the reviewer is paid only when you release it.",
    funded:
      "Your payment is held by Loopwright. The reviewer has not started yet, so you can still cancel for a full refund.",
    in_review:
      "The reviewer is working through the checklist. Your payment stays held until the report is delivered and you release it.",
    delivered:
      "The report is ready to read. Release the payment if it answers your questions, or open a dispute before the window closes; with no action the payment is released when the window closes.",
    disputed:
      "You opened a dispute. Your payment stays held while the Loopwright team looks at it and settles it.",
    released: "You released the payment to the reviewer. This job is complete.",
    partially_refunded:
      "The dispute was settled with a part refund to you; the rest was paid to the reviewer.",
    refunded: "Your payment was refunded in full.",
    cancelled: "This job was cancelled before any payment was taken.",
  },
  reviewer: {
    awaiting_payment:
      "The homeowner accepted your quote and has not paid yet. Wait for the payment before you start.",
    funded:
      "The homeowner's payment is held by Loopwright. Start the review when you are ready; once you start, the homeowner can no longer cancel.",
    in_review:
      "You are reviewing this system. Deliver the report when every checklist item has a verdict.",
    delivered:
      "You delivered the report. The payment is released to you when the homeowner releases it or the dispute window closes.",
    disputed:
      "The homeowner opened a dispute. The payment stays held while the Loopwright team settles it.",
    released: "The payment was released to your payout account, less the platform fee.",
    partially_refunded:
      "The dispute was settled with a part refund to the homeowner; the rest was paid to you, less the platform fee on that part.",
    refunded: "The dispute was settled with a full refund to the homeowner.",
    cancelled: "This job was cancelled before the homeowner paid.",
  },
  admin: {
    awaiting_payment: "Quote accepted; no payment taken yet.",
    funded: "Payment held; the reviewer has not started.",
    in_review: "Payment held; the review is in progress.",
    delivered: "Payment held; the report is delivered and the dispute window is running.",
    disputed: "Payment held; the dispute is waiting for a settlement.",
    released: "Payment released to the reviewer, less the platform fee.",
    partially_refunded: "Settled: part refunded, the rest paid out less the fee on that part.",
    refunded: "Refunded in full.",
    cancelled: "Cancelled before payment.",
  },
};

/** lucide-react icon export names used for job states (strings only; the UI maps them to icons). */
export type JobStateIcon =
  | "CreditCard"
  | "ShieldCheck"
  | "ClipboardList"
  | "FileCheck"
  | "Scale"
  | "CircleCheck"
  | "ArrowLeftRight"
  | "Undo2"
  | "CircleX";

export const STATE_ICONS: Record<JobState, JobStateIcon> = {
  awaiting_payment: "CreditCard",
  funded: "ShieldCheck",
  in_review: "ClipboardList",
  delivered: "FileCheck",
  disputed: "Scale",
  released: "CircleCheck",
  partially_refunded: "ArrowLeftRight",
  refunded: "Undo2",
  cancelled: "CircleX",
};
