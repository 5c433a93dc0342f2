/** A receipt: one charge or refund in the ledger, as the homeowner who paid sees it. */
export interface Receipt {
  ledgerId: number;
  number: string;
  kind: "payment" | "refund";
  amountMinor: number;
  currency: string;
  at: string;
  providerRef: string | null;
  jobId: number;
  service: "remote_check" | "site_visit";
  projectTitle: string;
  reviewerName: string;
  payerName: string;
  payerEmail: string;
  /** For a refund: the payment it returns, by its receipt number. */
  refundOf: string | null;
}
