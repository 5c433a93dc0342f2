/**
 * The one place that maps the codes the database and the rules keep to the words people see.
 * Pure data and small formatters: safe for server and client components, e-mails and tests.
 * (The job states' words live in lib/jobs/states.ts, the levels' in lib/calc/findings.ts, the
 * verdicts' and outcomes' in lib/checklist/verdicts.ts; they are re-exported here so a page
 * needs only this module.)
 */
export { STATE_LABELS, STATE_LABELS_FOR } from "@/lib/jobs/states";
export { LEVEL_LABELS } from "@/lib/calc/findings";
export { OUTCOME_LABELS, VERDICT_LABELS } from "@/lib/checklist/verdicts";

export const ROLE_LABELS = {
  homeowner: "Homeowner",
  reviewer: "Reviewer",
  admin: "Admin",
} as const satisfies Record<string, string>;

/** The two services, by the names in product.md ("Names"): never a synonym. */
export const SERVICE_LABELS = {
  remote_check: "Remote design check",
  site_visit: "Site visit",
} as const satisfies Record<string, string>;

export type ServiceKind = keyof typeof SERVICE_LABELS;

export function serviceLabel(kind: string): string {
  return SERVICE_LABELS[kind as ServiceKind] ?? "Service";
}

export const PROJECT_STATUS_LABELS: Record<string, string> = {
  draft: "Draft",
  ready: "Ready to post",
  archived: "Archived",
};

export const REQUEST_STATUS_LABELS: Record<string, string> = {
  open: "Open for quotes",
  awarded: "Quote accepted",
  cancelled: "Cancelled",
  expired: "Expired",
};

export const QUOTE_STATUS_LABELS: Record<string, string> = {
  live: "Open",
  withdrawn: "Withdrawn",
  declined: "Not chosen",
  accepted: "Accepted",
};

/** One word for a refused credential everywhere: badge, button, filter and e-mail. */
export const CREDENTIAL_STATUS_LABELS = {
  pending: "Waiting for check",
  verified: "Verified",
  rejected: "Rejected",
  expired: "Expired",
} as const satisfies Record<string, string>;

export const OUTBOX_STATUS_LABELS: Record<string, string> = {
  pending: "Waiting to send",
  sending: "Sending",
  sent: "Sent",
  failed: "Failed",
};

export const PHOTO_TAG_LABELS: Record<string, string> = {
  collector: "Collector",
  roof: "Roof",
  pump_station: "Pump station",
  vessel: "Expansion vessel",
  cylinder: "Cylinder",
  pipework: "Pipework",
  other: "Other",
};

export const DISPUTE_RESOLUTION_LABELS: Record<string, string> = {
  release: "Payment released to the reviewer",
  partial_refund: "Part refunded to the homeowner",
  full_refund: "Refunded in full to the homeowner",
};

/** A code's words from one of the maps above, or the code made readable (never the raw key). */
export function labelFor(map: Record<string, string>, code: string | null | undefined): string {
  if (!code) return "";
  return map[code] ?? code.replace(/_/g, " ").replace(/^./, (c) => c.toUpperCase());
}

/** "1 collector", "2 collectors"; pass the plural when it is not the singular plus "s". */
export function plural(n: number, singular: string, pluralForm = `${singular}s`): string {
  return `${n} ${n === 1 ? singular : pluralForm}`;
}

/** The configured currency's symbol or code as people read it, e.g. "£" for GBP, "€" for EUR. */
export function currencySymbol(currency: string, locale = "en-GB"): string {
  const part = new Intl.NumberFormat(locale, { style: "currency", currency })
    .formatToParts(0)
    .find((p) => p.type === "currency");
  return part?.value ?? currency;
}

/** The locale dates are shown in when the user's own is not known (product default). */
export const DEFAULT_LOCALE = "en-GB";

/**
 * A calendar date ("2026-12-14" or a Date) in the user's locale, e.g. "14 Dec 2026" in en-GB,
 * never a bare mm/dd/yyyy. Dates without a time are read as UTC days, so they never shift.
 */
export function formatDate(value: string | Date | null | undefined, locale = DEFAULT_LOCALE) {
  if (!value) return "";
  const d = typeof value === "string" ? new Date(`${value.slice(0, 10)}T00:00:00Z`) : value;
  if (Number.isNaN(d.getTime())) return String(value);
  return new Intl.DateTimeFormat(locale, {
    day: "numeric",
    month: "short",
    year: "numeric",
    timeZone: "UTC",
  }).format(d);
}
