import type { Metadata } from "next";
import Link from "next/link";
import { listLedger, reconcile } from "@/lib/data/payments";
import { env } from "@/lib/env";
import { formatMoney } from "@/lib/money";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { Card } from "@/components/ui/card";

export const metadata: Metadata = { title: "Ledger" };

const KIND_WORDS = {
  charge: "Payment in",
  refund: "Refund",
  transfer: "Paid to reviewer",
  fee: "Platform fee",
} as const;

export default async function LedgerPage({
  searchParams,
}: {
  searchParams: Promise<{ check?: string }>;
}) {
  const user = await pageUser("/admin/ledger", ["admin"]);
  const { check } = await searchParams;
  const [ledger, report] = await Promise.all([
    listLedger(db(), user),
    check ? reconcile(db(), user) : Promise.resolve(null),
  ]);
  const currency = env().CURRENCY;
  const f = (n: number) => formatMoney(n, currency);
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-bold">Ledger</h1>
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
        {[
          ["Held now", ledger.heldMinor],
          ["Fees earned", ledger.totals.fee],
          ["Paid to reviewers", ledger.totals.transfer],
          ["Refunded", -ledger.totals.refund],
        ].map(([label, value]) => (
          <Card key={String(label)}>
            <p className="text-2xl font-bold tabular-nums">{f(Number(value))}</p>
            <p className="text-slate-700">{label}</p>
          </Card>
        ))}
      </div>
      <Card>
        <h2 className="text-xl font-bold">Reconciliation with the payment service</h2>
        {report ? (
          report.differences.length === 0 ? (
            <p className="mt-2 text-level-ok" role="status">
              The ledger agrees with the payment service for all {report.checkedJobs} paid jobs, to
              the minor unit.
            </p>
          ) : (
            <ul className="mt-2 space-y-1" role="alert">
              {report.differences.map((d, i) => (
                <li key={i}>
                  <Link className="underline" href={`/jobs/${d.jobId}`}>
                    Job {d.jobId}
                  </Link>
                  :{" "}
                  {d.what === "lookup"
                    ? d.note
                    : `${KIND_WORDS[d.what]} — ledger ${f(d.ledgerMinor)}, payment service ${f(d.serviceMinor)}`}
                </li>
              ))}
            </ul>
          )
        ) : (
          <p className="mt-2">
            <Link className="font-semibold text-copper-700 underline" href="/admin/ledger?check=1">
              Compare the ledger with the payment service now
            </Link>
          </p>
        )}
      </Card>
      <Card>
        <h2 className="text-xl font-bold">Latest entries</h2>
        <div className="mt-2 overflow-x-auto">
          <table className="w-full min-w-[32rem] text-left text-sm">
            <thead>
              <tr className="border-b border-slate-200 text-slate-600">
                <th className="py-1">When</th>
                <th>Job</th>
                <th>What</th>
                <th className="text-right">Amount</th>
              </tr>
            </thead>
            <tbody>
              {ledger.rows.map((r) => (
                <tr key={r.id} className="border-b border-slate-100">
                  <td className="whitespace-nowrap py-1 pr-2">{r.createdAt.slice(0, 16)}</td>
                  <td className="pr-2">
                    {r.jobId ? (
                      <Link className="underline" href={`/jobs/${r.jobId}`}>
                        {r.jobId}
                      </Link>
                    ) : null}
                  </td>
                  <td className="pr-2">{KIND_WORDS[r.kind]}</td>
                  <td className="text-right tabular-nums">
                    {formatMoney(r.amountMinor, r.currency)}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      </Card>
    </div>
  );
}
