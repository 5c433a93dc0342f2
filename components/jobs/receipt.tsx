import type { Receipt } from "@/lib/types/receipts";
import { env } from "@/lib/env";
import { formatMoney } from "@/lib/money";
import { fromSqlDateTime } from "@/lib/time";

const SERVICE = { remote_check: "Remote design check", site_visit: "Site visit" } as const;

/** One receipt, laid out to print on its own page. */
export function ReceiptView({ r }: { r: Receipt }) {
  const date = new Intl.DateTimeFormat("en-GB", {
    dateStyle: "long",
    timeStyle: "short",
    timeZone: env().APP_TIME_ZONE,
  }).format(fromSqlDateTime(r.at));
  const amount = formatMoney(r.amountMinor, r.currency);
  const rows: [string, string][] = [
    ["Receipt number", r.number],
    ["Date", date],
    [r.kind === "payment" ? "Paid by" : "Refunded to", `${r.payerName} (${r.payerEmail})`],
    ["For", `${SERVICE[r.service]} by ${r.reviewerName}: ${r.projectTitle}`],
    ["Job", `Loopwright job ${r.jobId}`],
  ];
  if (r.refundOf) rows.push(["Refund of", `payment receipt ${r.refundOf}`]);
  if (r.providerRef) rows.push(["Payment service reference", r.providerRef]);
  return (
    <article
      className="break-after-page rounded-card border border-slate-200 bg-white p-6 print:border-0 print:p-0"
      aria-labelledby={`receipt-${r.ledgerId}`}
      data-testid="receipt"
    >
      <p className="text-sm font-bold tracking-wide text-copper-700">LOOPWRIGHT</p>
      <h2 id={`receipt-${r.ledgerId}`} className="mt-1 text-2xl font-bold">
        {r.kind === "payment" ? "Payment receipt" : "Refund receipt"}
      </h2>
      <dl className="mt-4 divide-y divide-slate-100">
        {rows.map(([k, v]) => (
          <div key={k} className="grid grid-cols-3 gap-4 py-2">
            <dt className="text-slate-600">{k}</dt>
            <dd className="col-span-2">{v}</dd>
          </div>
        ))}
        <div className="grid grid-cols-3 gap-4 py-3 text-lg font-bold">
          <dt>{r.kind === "payment" ? "Amount paid" : "Amount refunded"}</dt>
          <dd className="col-span-2 tabular-nums" data-testid="receipt-amount">
            {amount}
          </dd>
        </div>
      </dl>
      <p className="mt-4 text-sm text-slate-600">
        {r.kind === "payment"
          ? "Held by Loopwright until the report is delivered and released, or refunded."
          : "Returned to the card the payment was made with; banks usually show it within a few working days."}
      </p>
    </article>
  );
}
