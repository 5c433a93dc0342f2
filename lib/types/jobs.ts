/** Shapes shared by lib/data/jobs.ts and the client components that show a job. */
import type { JobState, TransitionName } from "@/lib/jobs";

export interface JobMoney {
  /** The accepted quote's price. */
  amountMinor: number;
  chargedMinor: number;
  refundedMinor: number;
  paidOutMinor: number;
  feeMinor: number;
  /** Charged, less what has been refunded, paid out and kept as the fee. */
  heldMinor: number;
  /** What the fee and the payout will be on a full release. */
  expectedFeeMinor: number;
  expectedPayoutMinor: number;
}

export interface JobTimelineEntry {
  /** The audit action, such as `job.fund` or `quote.accepted`. */
  action: string;
  /** The state the job entered, when the entry is a transition. */
  to: JobState | null;
  by: string;
  at: string;
  /** For a site-visit entry: the visit's time (UTC DATETIME). */
  visitAt?: string | null;
}

export interface JobView {
  id: number;
  requestId: number;
  projectId: number;
  projectTitle: string;
  kind: "remote_check" | "site_visit";
  state: JobState;
  homeownerId: number;
  homeownerName: string;
  reviewerId: number;
  reviewerName: string;
  payoutAccountReady: boolean;
  currency: string;
  money: JobMoney;
  createdAt: string;
  fundedAt: string | null;
  reviewStartedAt: string | null;
  deliveredAt: string | null;
  releaseDueAt: string | null;
  closedAt: string | null;
  windowStart: string | null;
  windowEnd: string | null;
  visit: {
    at: string;
    state: "proposed" | "confirmed" | "declined";
    note: string | null;
    /** Raised by every change; a confirmation names the one it saw. */
    sequence: number;
  } | null;
  dispute: {
    reason: string;
    status: "open" | "settled";
    resolution: "release" | "partial_refund" | "full_refund" | null;
    refundMinor: number | null;
    note: string | null;
    openedAt: string;
  } | null;
  timeline: JobTimelineEntry[];
  /** The transitions the viewer can take now. */
  actions: TransitionName[];
}

export interface JobListItem {
  id: number;
  state: JobState;
  kind: "remote_check" | "site_visit";
  title: string;
  reviewerName: string | null;
  amountMinor: number;
  currency: string;
  updatedAt: string;
}
