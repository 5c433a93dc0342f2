import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { HttpError } from "@/lib/data/errors";
import { getFirstFillPage } from "@/lib/data/first-fill";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { Card } from "@/components/ui/card";
import { Cautions } from "@/components/ui/caution";
import {
  DesignValues,
  FirstFillJobRecord,
  TOLERANCE_NOTE,
} from "@/components/aftercare/first-fill-record";
import { PrintButton } from "@/components/aftercare/print-button";
import "@/components/aftercare/print.css";

export const metadata: Metadata = { title: "First-fill record" };

export default async function FirstFillPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await pageUser(`/projects/${id}/first-fill`);
  if (!/^\d+$/.test(id)) notFound();
  const page = await getFirstFillPage(db(), user, Number(id)).catch((err: unknown) => {
    if (err instanceof HttpError && (err.status === 404 || err.status === 403)) notFound();
    throw err;
  });
  return (
    <article className="commissioning-record space-y-6">
      <header className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <p className="text-sm font-semibold uppercase tracking-wide text-slate-600">
            Commissioning record
          </p>
          <h1 className="text-3xl font-bold">First fill: {page.projectTitle}</h1>
        </div>
        <PrintButton />
      </header>
      <p className="text-slate-700">
        What the loop showed when it was first filled, against the design values of the
        project&apos;s loop check. A difference is not always a fault; the notes say what it usually
        means.
      </p>
      <Card>
        <h2 className="text-xl font-bold">Design values</h2>
        <p className="mb-2 text-sm text-slate-600">
          From the loop check of the project&apos;s description as it stands now.
        </p>
        <DesignValues design={page.design} />
      </Card>
      {page.jobs.length === 0 ? (
        <Card>
          <p>The first-fill record opens once a reviewer has delivered a report on this project.</p>
        </Card>
      ) : (
        page.jobs.map((j) => (
          <FirstFillJobRecord
            key={j.jobId}
            projectId={page.projectId}
            job={j}
            viewer={page.viewer}
          />
        ))
      )}
      <Cautions compact />
      <footer className="space-y-1 text-sm text-slate-600">
        <p>{TOLERANCE_NOTE}</p>
      </footer>
      <p className="flex flex-wrap gap-4 print:hidden">
        {page.viewer === "homeowner" || page.viewer === "admin" ? (
          <Link className="underline" href={`/projects/${page.projectId}`}>
            Back to the project
          </Link>
        ) : null}
        {page.jobs.map((j) => (
          <Link key={j.jobId} className="underline" href={`/jobs/${j.jobId}`}>
            The job with {j.reviewerName}
          </Link>
        ))}
      </p>
    </article>
  );
}
