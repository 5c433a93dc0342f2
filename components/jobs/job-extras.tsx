import Link from "next/link";
import type { JobTimelineEntry, JobView } from "@/lib/types/jobs";
import { env } from "@/lib/env";
import { formatWhen, fromSqlDateTime } from "@/lib/time";

const VISIT_WORDS: Record<string, string> = {
  "job.visit_proposed": "Site visit proposed for",
  "job.visit_confirmed": "Site visit confirmed for",
  "job.visit_declined": "Another time asked for instead of",
  "job.visit_cancelled": "Site visit called off: the job was cancelled",
};

/** A site-visit timeline entry in words, with the visit's time; null for other entries. */
export function visitTimelineWords(t: JobTimelineEntry): string | null {
  const words = VISIT_WORDS[t.action];
  if (!words) return null;
  return t.visitAt
    ? `${words} ${formatWhen(fromSqlDateTime(t.visitAt), env().APP_TIME_ZONE)}`
    : words;
}

/** The link to the job's receipts, for the homeowner who paid and admins, once money moved. */
export function ReceiptsLink({ job, role }: { job: JobView; role: string }) {
  if (role !== "homeowner" && role !== "admin") return null;
  if (!job.money.chargedMinor) return null;
  return (
    <Link
      className="inline-flex min-h-11 items-center font-semibold text-copper-700 underline"
      href={`/jobs/${job.id}/receipts`}
    >
      Receipts
    </Link>
  );
}
