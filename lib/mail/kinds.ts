/** The e-mail kinds and what each needs; kept apart from the renderer so app code can import it. */
export interface TemplatePayloads {
  verify_email: { name: string; url: string };
  reset_password: { name: string; url: string };
  sign_in_failures: { name: string; count: number; url: string };
  new_quote: {
    name: string;
    projectTitle: string;
    reviewerName: string;
    price: string;
    url: string;
  };
  quote_accepted: { name: string; projectTitle: string; price: string; url: string };
  quote_declined: {
    name: string;
    projectTitle: string;
    reason?: string | null;
    /** True when the homeowner accepted another quote; otherwise they declined this one. */
    chosenAnother?: boolean;
    url: string;
  };
  payment_received: { name: string; projectTitle: string; amount: string; url: string };
  review_started: { name: string; projectTitle: string; reviewerName: string; url: string };
  report_delivered: {
    name: string;
    projectTitle: string;
    outcome: string;
    releaseBy: string;
    url: string;
  };
  refund_issued: { name: string; projectTitle: string; amount: string; url: string };
  payout_account_ready: { name: string; url: string };
  /** `mine` when the reader is the reviewer who proposed it. */
  visit_proposed: {
    name: string;
    projectTitle: string;
    when: string;
    url: string;
    mine?: boolean;
    note?: string | null;
  };
  visit_confirmed: { name: string; projectTitle: string; when: string; url: string };
  /** `mine` when the reader is the homeowner who asked. */
  visit_declined: {
    name: string;
    projectTitle: string;
    when: string;
    note: string;
    url: string;
    mine?: boolean;
  };
  visit_cancelled: { name: string; projectTitle: string; when: string; url: string };
  receipt: {
    name: string;
    projectTitle: string;
    /** "Payment" or "Refund". */
    what: string;
    number: string;
    amount: string;
    date: string;
    url: string;
  };
  funds_released: { name: string; projectTitle: string; amount: string; url: string };
  dispute_opened: { name: string; projectTitle: string; reason: string; url: string };
  dispute_settled: { name: string; projectTitle: string; resolution: string; url: string };
  credential_verified: {
    name: string;
    credential: string;
    expiresOn: string;
    url: string;
    /** Further credentials verified in the same sitting, batched into this one e-mail. */
    more?: { credential: string; expiresOn: string }[];
  };
  credential_rejected: { name: string; credential: string; reason: string; url: string };
  credential_expiring: { name: string; credential: string; expiresOn: string; url: string };
  item_requested: {
    name: string;
    projectTitle: string;
    reviewerName: string;
    kind: "photo" | "fact";
    itemTitle: string;
    question: string;
    url: string;
  };
  new_message: {
    name: string;
    senderName: string;
    /** Left out for a reviewer before the homeowner accepts their quote. */
    projectTitle?: string;
    preview: string;
    url: string;
  };
}

export type TemplateName = keyof TemplatePayloads;

/** Kinds a person may switch off; the others (money, security, credentials) always go. */
export const OPTIONAL_TEMPLATES = [
  "new_message",
  "new_quote",
] as const satisfies readonly TemplateName[];
