/** Shapes shared by lib/data/payments.ts and the pages that show money. */

export interface LedgerRow {
  id: number;
  jobId: number | null;
  /** charge: money in (positive); refund: money back (negative); transfer: to the reviewer; fee: kept. */
  kind: "charge" | "refund" | "transfer" | "fee";
  amountMinor: number;
  currency: string;
  providerRef: string | null;
  createdAt: string;
}

export interface ReviewerEarnings {
  payouts: LedgerRow[];
  paidOutMinor: number;
  heldForYou: { currency: string; amountMinor: number; jobs: number }[];
}

export interface ReconciliationReport {
  checkedJobs: number;
  differences: {
    jobId: number;
    what: "charge" | "refund" | "transfer" | "lookup";
    ledgerMinor: number;
    serviceMinor: number;
    note: string | null;
  }[];
  at: string;
}
