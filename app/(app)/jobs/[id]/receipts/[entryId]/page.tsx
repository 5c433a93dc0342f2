import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { HttpError, parseId } from "@/lib/data/errors";
import { getReceipt } from "@/lib/data/receipts";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { ReceiptView } from "@/components/jobs/receipt";
import { PrintButton } from "@/components/jobs/print-button";

export const metadata: Metadata = { title: "Receipt" };

export default async function ReceiptPage({
  params,
}: {
  params: Promise<{ id: string; entryId: string }>;
}) {
  const { id, entryId } = await params;
  const user = await pageUser(`/jobs/${id}/receipts/${entryId}`);
  let ids: { jobId: number; ledgerId: number };
  try {
    ids = { jobId: parseId(id, "job"), ledgerId: parseId(entryId, "receipt") };
  } catch {
    notFound();
  }
  const receipt = await getReceipt(db(), user, ids.jobId, ids.ledgerId).catch((err: unknown) => {
    if (err instanceof HttpError && err.status === 404) notFound();
    throw err;
  });
  return (
    <div className="print-alone space-y-4">
      <div className="no-print flex flex-wrap items-center justify-between gap-3">
        <Link
          className="font-semibold text-copper-700 underline"
          href={`/jobs/${ids.jobId}/receipts`}
        >
          All receipts for this job
        </Link>
        <PrintButton />
      </div>
      <ReceiptView r={receipt} />
    </div>
  );
}
