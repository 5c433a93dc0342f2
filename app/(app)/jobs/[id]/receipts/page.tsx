import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { HttpError, parseId } from "@/lib/data/errors";
import { listReceipts } from "@/lib/data/receipts";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { ReceiptView } from "@/components/jobs/receipt";
import { PrintButton } from "@/components/jobs/print-button";

export const metadata: Metadata = { title: "Receipts" };

export default async function ReceiptsPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await pageUser(`/jobs/${id}/receipts`);
  let jobId: number;
  try {
    jobId = parseId(id, "job");
  } catch {
    notFound();
  }
  const receipts = await listReceipts(db(), user, jobId).catch((err: unknown) => {
    if (err instanceof HttpError && err.status === 404) notFound();
    throw err;
  });
  return (
    <div className="print-alone space-y-6">
      <div className="no-print flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-3xl font-bold">Receipts</h1>
        {receipts.length ? <PrintButton label="Print all or save as PDF" /> : null}
      </div>
      <p className="no-print">
        <Link className="font-semibold text-copper-700 underline" href={`/jobs/${jobId}`}>
          Back to the job
        </Link>
      </p>
      {receipts.length === 0 ? <p>No payment yet, so no receipt.</p> : null}
      {receipts.map((r) => (
        <div key={r.ledgerId} className="space-y-2">
          <ReceiptView r={r} />
          <p className="no-print">
            <Link className="underline" href={`/jobs/${jobId}/receipts/${r.ledgerId}`}>
              Open receipt {r.number} on its own
            </Link>
          </p>
        </div>
      ))}
    </div>
  );
}
