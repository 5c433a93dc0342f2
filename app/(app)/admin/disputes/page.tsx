import type { Metadata } from "next";
import Link from "next/link";
import { listOpenDisputes } from "@/lib/data/jobs";
import { formatMoney } from "@/lib/money";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { Card } from "@/components/ui/card";

export const metadata: Metadata = { title: "Disputes" };

export default async function DisputesPage() {
  const user = await pageUser("/admin/disputes", ["admin"]);
  const disputes = await listOpenDisputes(db(), user);
  return (
    <div className="space-y-4">
      <h1 className="text-3xl font-bold">Open disputes</h1>
      <p className="text-slate-700">
        Each one holds a homeowner&apos;s payment. Open the job to read both sides, the report and
        the messages, then settle: pay the reviewer, refund part, or refund in full.
      </p>
      {disputes.length === 0 ? (
        <Card>
          <p>No open disputes.</p>
        </Card>
      ) : (
        <ul className="space-y-3">
          {disputes.map((d) => (
            <li key={d.jobId}>
              <Card>
                <p className="font-semibold">
                  <Link className="underline" href={`/jobs/${d.jobId}`}>
                    {d.projectTitle}
                  </Link>{" "}
                  · {formatMoney(d.amountMinor, d.currency)} held
                </p>
                <p className="text-sm text-slate-600">
                  {d.homeownerName} disputes the report from {d.reviewerName} · opened{" "}
                  {d.openedAt.slice(0, 10)}
                </p>
                <p className="mt-2 whitespace-pre-line">{d.reason}</p>
              </Card>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
