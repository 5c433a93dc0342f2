/**
 * The job state machine (product.md, "Job states") as data and pure functions. The data layer
 * asks `canTransition` inside its transaction, after locking the job row, and writes the new
 * state only when it says yes; pages ask `nextActions` which buttons to show.
 *
 *   awaiting_payment → funded → in_review → delivered → released
 *   delivered → disputed → released | partially_refunded | refunded
 *   awaiting_payment → cancelled;  funded → refunded (cancelled before the review starts)
 */
import { isWithinDisputeWindow } from "./dispute-window";
import { isJobState, STATE_LABELS, type JobState } from "./states";

/** Who can trigger a transition: a person in a role, or the system (webhooks, the worker). */
export type TriggerRole = "homeowner" | "reviewer" | "admin" | "system";

/** The one doing it: a signed-in person, or the system. */
export type JobActor =
  { id: number; role: "homeowner" | "reviewer" | "admin" } | { role: "system" };

/** What the machine needs to know about a job. */
export interface JobFacts {
  state: JobState;
  homeownerId: number;
  reviewerId: number;
  /** When the dispute window closes (`release_due_at`, from `disputeOpenUntil`); null until delivered. */
  releaseDueAt: Date | null;
}

export const TRANSITION_NAMES = [
  "fund",
  "cancel",
  "cancelForRefund",
  "startReview",
  "deliver",
  "release",
  "openDispute",
  "settleRelease",
  "settlePartialRefund",
  "settleFullRefund",
] as const;

export type TransitionName = (typeof TRANSITION_NAMES)[number];

export function isTransitionName(value: unknown): value is TransitionName {
  return typeof value === "string" && (TRANSITION_NAMES as readonly string[]).includes(value);
}

/** Where the dispute window must stand for a role to take a transition. */
export type WindowRule = "open" | "closed";

export interface TransitionRule {
  name: TransitionName;
  from: JobState;
  to: JobState;
  /** The roles that may trigger it. */
  by: readonly TriggerRole[];
  /** A homeowner or reviewer must be this job's own homeowner or reviewer (admins and the system are not owners). */
  mustOwn: boolean;
  /** For these roles the dispute window must be open (or closed) at the time. */
  disputeWindow?: Partial<Record<TriggerRole, WindowRule>>;
  /** The button or log wording. */
  label: string;
  /** What it does, in plain words. */
  summary: string;
}

export const TRANSITIONS: Record<TransitionName, TransitionRule> = {
  fund: {
    name: "fund",
    from: "awaiting_payment",
    to: "funded",
    by: ["system"],
    mustOwn: false,
    label: "Record the payment",
    summary:
      "A verified payment (webhook or checkout check) puts the homeowner's money into held funds.",
  },
  cancel: {
    name: "cancel",
    from: "awaiting_payment",
    to: "cancelled",
    by: ["homeowner", "system"],
    mustOwn: true,
    label: "Cancel this job",
    summary: "Cancels the job before anything is paid.",
  },
  cancelForRefund: {
    name: "cancelForRefund",
    from: "funded",
    to: "refunded",
    by: ["homeowner"],
    mustOwn: true,
    label: "Cancel and get a full refund",
    summary: "Cancels the job before the review starts and refunds the payment in full.",
  },
  startReview: {
    name: "startReview",
    from: "funded",
    to: "in_review",
    by: ["reviewer"],
    mustOwn: true,
    label: "Start the review",
    summary: "The reviewer starts work; from now on the homeowner can no longer cancel.",
  },
  deliver: {
    name: "deliver",
    from: "in_review",
    to: "delivered",
    by: ["reviewer"],
    mustOwn: true,
    label: "Deliver the report",
    summary: "Freezes the report, sends it to the homeowner and starts the dispute window.",
  },
  release: {
    name: "release",
    from: "delivered",
    to: "released",
    by: ["homeowner", "system"],
    mustOwn: true,
    disputeWindow: { system: "closed" },
    label: "Release the payment",
    summary:
      "Pays the reviewer, less the platform fee. The homeowner can do it at any time after delivery; the system does it when the dispute window closes.",
  },
  openDispute: {
    name: "openDispute",
    from: "delivered",
    to: "disputed",
    by: ["homeowner"],
    mustOwn: true,
    disputeWindow: { homeowner: "open" },
    label: "Open a dispute",
    summary: "Keeps the payment held and asks the Loopwright team to settle it.",
  },
  settleRelease: {
    name: "settleRelease",
    from: "disputed",
    to: "released",
    by: ["admin"],
    mustOwn: false,
    label: "Settle: pay the reviewer",
    summary: "Ends the dispute by paying the reviewer in full, less the platform fee.",
  },
  settlePartialRefund: {
    name: "settlePartialRefund",
    from: "disputed",
    to: "partially_refunded",
    by: ["admin"],
    mustOwn: false,
    label: "Settle: part refund",
    summary:
      "Ends the dispute by refunding part of the payment and paying the rest to the reviewer, less the fee on that part.",
  },
  settleFullRefund: {
    name: "settleFullRefund",
    from: "disputed",
    to: "refunded",
    by: ["admin"],
    mustOwn: false,
    label: "Settle: full refund",
    summary: "Ends the dispute by refunding the payment in full.",
  },
};

/** Why a transition was refused, for mapping to a status: `forbidden` → 403, the rest → 409. */
export type RefusalCode =
  | "unknown_transition"
  | "forbidden"
  | "wrong_state"
  | "window_open"
  | "window_closed"
  | "window_unknown";

export type TransitionCheck =
  { ok: true; rule: TransitionRule } | { ok: false; code: RefusalCode; reason: string };

/** The HTTP status a refusal maps to. */
export function refusalStatus(code: RefusalCode): 403 | 409 | 422 {
  if (code === "forbidden") return 403;
  if (code === "unknown_transition") return 422;
  return 409;
}

const ROLE_WORDS: Record<TriggerRole, string> = {
  homeowner: "the homeowner",
  reviewer: "the reviewer",
  admin: "the Loopwright team",
  system: "Loopwright automatically",
};

function whoMay(rule: TransitionRule): string {
  const people = rule.by.filter((r) => r !== "system");
  if (people.length === 0) return "Only Loopwright can do this, once the payment is confirmed.";
  const words = people.map((r) =>
    rule.mustOwn && (r === "homeowner" || r === "reviewer")
      ? `${ROLE_WORDS[r]} of this job`
      : ROLE_WORDS[r],
  );
  return `Only ${words.join(" or ")} can do this.`;
}

const refuse = (code: RefusalCode, reason: string): TransitionCheck => ({
  ok: false,
  code,
  reason,
});

/**
 * May `actor` take `transition` on `job` at `now`? Checks, in this order: the actor's role, that
 * a homeowner or reviewer is this job's own, the job's current state, then the dispute window.
 * A refusal carries a plain-English reason to show as it is.
 */
export function canTransition(
  job: JobFacts,
  transition: TransitionName | string,
  actor: JobActor,
  now: Date = new Date(),
): TransitionCheck {
  if (!isTransitionName(transition))
    return refuse("unknown_transition", "That is not something that can be done to a job.");
  const rule = TRANSITIONS[transition];
  if (!rule.by.includes(actor.role)) return refuse("forbidden", whoMay(rule));
  if (rule.mustOwn && actor.role !== "system" && actor.role !== "admin") {
    const ownerId = actor.role === "homeowner" ? job.homeownerId : job.reviewerId;
    if (actor.id !== ownerId) return refuse("forbidden", whoMay(rule));
  }
  if (!isJobState(job.state) || job.state !== rule.from) {
    const current = isJobState(job.state) ? `"${STATE_LABELS[job.state]}"` : "unknown";
    return refuse(
      "wrong_state",
      `This job's status is ${current}; "${rule.label}" is only possible while it is "${STATE_LABELS[rule.from]}".`,
    );
  }
  const windowRule = rule.disputeWindow?.[actor.role];
  if (windowRule) {
    if (!job.releaseDueAt || Number.isNaN(job.releaseDueAt.getTime()))
      return refuse(
        "window_unknown",
        "This job has no dispute window recorded, so this cannot be done yet. Please contact the Loopwright team.",
      );
    const open = isWithinDisputeWindow(job.releaseDueAt, now);
    if (windowRule === "open" && !open)
      return refuse(
        "window_closed",
        "The dispute window for this report has closed, so a dispute can no longer be opened.",
      );
    if (windowRule === "closed" && open)
      return refuse(
        "window_open",
        "The dispute window for this report is still open; the payment is released automatically only after it closes.",
      );
  }
  return { ok: true, rule };
}

/** The transitions this viewer can take on this job now, in a stable order (the job page's buttons). */
export function nextActions(
  job: JobFacts,
  viewer: JobActor,
  now: Date = new Date(),
): TransitionRule[] {
  return TRANSITION_NAMES.filter((name) => canTransition(job, name, viewer, now).ok).map(
    (name) => TRANSITIONS[name],
  );
}
