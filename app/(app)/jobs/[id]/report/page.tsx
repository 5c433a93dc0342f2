import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { HttpError, parseId } from "@/lib/data/errors";
import { getJob, TRANSITION_LABELS } from "@/lib/data/jobs";
import { getReport } from "@/lib/data/review";
import { numberPins } from "@/lib/checklist/pins";
import { OUTCOME_HINTS, OUTCOME_LABELS } from "@/lib/checklist/verdicts";
import { SECTIONS } from "@/lib/checklist/catalogue";
import { formatMoney } from "@/lib/money";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { Card } from "@/components/ui/card";
import { SERVICE_LABELS } from "@/lib/labels";
import { Cautions } from "@/components/ui/caution";
import { Markdown } from "@/components/ui/markdown";
import { ActionForm } from "@/components/ui/action-form";
import { releaseAction } from "@/components/jobs/actions";
import { DisputeCard } from "@/components/jobs/dispute-card";
import { addAddendumAction } from "@/components/review/actions";
import { Evidence } from "@/components/review/evidence";
import { PinnedImage } from "@/components/review/pinned-image";
import { PrintButton } from "@/components/review/print-button";
import { VerdictBadge } from "@/components/review/verdict-badge";
import type { ReportItem } from "@/lib/types/review";

export const metadata: Metadata = { title: "Report" };

const day = (s: string | null) =>
  s
    ? new Intl.DateTimeFormat("en-GB", { dateStyle: "long", timeZone: "UTC" }).format(
        new Date(`${s.replace(" ", "T")}Z`),
      )
    : "";

export default async function ReportPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await pageUser(`/jobs/${id}/report`);
  const jobId = (() => {
    try {
      return parseId(id, "job");
    } catch {
      notFound();
    }
  })();
  const orNotFound = (err: unknown): never => {
    if (err instanceof HttpError && (err.status === 404 || err.status === 403)) notFound();
    throw err;
  };
  const [report, job] = await Promise.all([
    getReport(db(), user, jobId).catch(orNotFound),
    getJob(db(), user, jobId).catch(orNotFound),
  ]);
  const s = report.snapshot;
  const keys = s.items.map((i) => i.key);
  const pins = numberPins(keys, (k) => s.items.find((i) => i.key === k)?.pins);
  const pinned = s.files.filter((f) => pins.some((p) => p.attachmentId === f.id));
  const title = (k: string) => s.items.find((i) => i.key === k)?.title ?? k;
  const sections: { name: string; items: ReportItem[] }[] = [];
  for (const item of s.items) {
    const last = sections.at(-1);
    if (last?.name === item.section) last.items.push(item);
    else sections.push({ name: item.section, items: [item] });
  }
  const rank = (name: string) => {
    const i = (SECTIONS as readonly string[]).indexOf(name);
    return i < 0 ? SECTIONS.length : i;
  };
  sections.sort((a, b) => rank(a.name) - rank(b.name));
  const price = formatMoney(job.money.amountMinor, job.currency);
  const fields = { jobId };
  return (
    <article data-print-report className="report mx-auto max-w-4xl space-y-8">
      <header className="space-y-2">
        <p className="no-print text-sm">
          <Link className="underline" href={`/jobs/${jobId}`}>
            The job
          </Link>
        </p>
        <h1 className="text-3xl font-bold">
          {SERVICE_LABELS[report.kind]} report: {report.projectTitle}
        </h1>
        <p className="text-slate-700">
          By {report.reviewerName} for {report.homeownerName} · delivered {day(report.deliveredAt)}{" "}
          · checklist {s.catalogueVersion}
        </p>
        <PrintButton />
      </header>

      <section
        aria-labelledby="outcome"
        className="break-inside-avoid rounded-card border-4 border-copper-700 bg-white p-6"
        data-outcome={s.outcome}
      >
        <h2 id="outcome" className="text-sm font-semibold uppercase tracking-wide text-slate-600">
          Outcome
        </h2>
        <p className="mt-1 text-3xl font-bold">{OUTCOME_LABELS[s.outcome]}</p>
        <p className="mt-1 text-lg">{OUTCOME_HINTS[s.outcome]}</p>
        {s.summaryMd ? (
          <div className="prose mt-4 max-w-none">
            <Markdown>{s.summaryMd}</Markdown>
          </div>
        ) : null}
      </section>

      <section aria-labelledby="changes" className="space-y-3">
        <h2 id="changes" className="text-2xl font-bold">
          Required changes
        </h2>
        {s.requiredChanges.length ? (
          <ol className="list-decimal space-y-3 pl-6" data-testid="required-changes">
            {s.requiredChanges.map((c, i) => (
              <li key={i} className="break-inside-avoid">
                <p className="font-semibold">{c.text}</p>
                {c.itemKeys.length ? (
                  <p className="text-sm text-slate-600">
                    Checklist:{" "}
                    {c.itemKeys.map((k, j) => (
                      <span key={k}>
                        {j ? ", " : ""}
                        <a href={`#item-${k}`} className="underline">
                          {title(k)}
                        </a>
                      </span>
                    ))}
                  </p>
                ) : null}
              </li>
            ))}
          </ol>
        ) : (
          <p>None.</p>
        )}
      </section>

      {pinned.length ? (
        <section aria-labelledby="pinned" className="space-y-4">
          <h2 id="pinned" className="text-2xl font-bold">
            Marked on the sketch and photos
          </h2>
          {pinned.map((f) => (
            <div key={f.id} className="break-inside-avoid space-y-2">
              <p className="font-semibold">
                {f.purpose === "sketch" ? "Sketch" : "Photo"}: {f.caption ?? f.fileName}
              </p>
              <PinnedImage
                fileId={f.id}
                alt={f.caption ?? f.fileName}
                pins={pins.filter((p) => p.attachmentId === f.id)}
              />
              <ol className="space-y-1 text-sm">
                {pins
                  .filter((p) => p.attachmentId === f.id)
                  .map((p) => (
                    <li key={p.n}>
                      <strong>{p.n}.</strong> {p.label} —{" "}
                      <a href={`#item-${p.itemKey}`} className="underline">
                        {title(p.itemKey)}
                      </a>
                    </li>
                  ))}
              </ol>
            </div>
          ))}
        </section>
      ) : null}

      <section aria-labelledby="checklist" className="space-y-6">
        <h2 id="checklist" className="text-2xl font-bold">
          The checklist
        </h2>
        {!report.hasChecklist ? (
          <p>This report was delivered before checklists were kept with reports.</p>
        ) : null}
        {sections.map((sec) => (
          <div key={sec.name} className="space-y-3">
            <h3 className="text-xl font-bold">{sec.name}</h3>
            <ul className="space-y-3">
              {sec.items.map((item) => (
                <li
                  key={item.key}
                  id={`item-${item.key}`}
                  data-item={item.key}
                  className="break-inside-avoid rounded-card border border-slate-200 bg-white p-4"
                >
                  <div className="flex flex-wrap items-center gap-3">
                    <VerdictBadge verdict={item.verdict} />
                    <h4 className="text-lg font-bold">{item.title}</h4>
                  </div>
                  <p className="mt-1 text-sm text-slate-600">
                    {item.check} ({item.basis})
                  </p>
                  {item.noteMd ? (
                    <div className="prose prose-sm mt-2 max-w-none">
                      <Markdown>{item.noteMd}</Markdown>
                    </div>
                  ) : null}
                  {pins.some((p) => p.itemKey === item.key) ? (
                    <p className="mt-2 text-sm">
                      Pins:{" "}
                      {pins
                        .filter((p) => p.itemKey === item.key)
                        .map((p) => `${p.n} (${p.label})`)
                        .join(", ")}
                    </p>
                  ) : null}
                  {item.evidence.length ? (
                    <details className="mt-2 print:block">
                      <summary className="cursor-pointer py-3 text-sm font-semibold">
                        From the loop check
                      </summary>
                      <div className="mt-2">
                        <Evidence findings={item.evidence} />
                      </div>
                    </details>
                  ) : null}
                </li>
              ))}
            </ul>
          </div>
        ))}
      </section>

      {report.addenda.length ? (
        <section aria-labelledby="addenda" className="space-y-3">
          <h2 id="addenda" className="text-2xl font-bold">
            Addenda
          </h2>
          {report.addenda.map((a) => (
            <div
              key={a.id}
              className="break-inside-avoid rounded-card border border-slate-200 bg-white p-4"
            >
              <p className="text-sm text-slate-600">
                {day(a.createdAt)} · {a.authorName}
              </p>
              <div className="prose prose-sm max-w-none">
                <Markdown>{a.bodyMd}</Markdown>
              </div>
            </div>
          ))}
        </section>
      ) : null}

      <div className="no-print space-y-4">
        {job.state === "released" || job.state === "partially_refunded" ? (
          <p role="status" className="rounded-lg bg-level-ok-bg p-3 font-semibold">
            ✓ The payment is released to {report.reviewerName}.
          </p>
        ) : null}
        {job.state === "disputed" ? (
          <p role="status" className="rounded-lg bg-level-note-bg p-3 font-semibold">
            A dispute is open: the payment stays held while the Loopwright team settles it.
          </p>
        ) : null}
        {job.actions.includes("release") ? (
          <Card>
            <h2 className="text-xl font-bold">Happy with the report?</h2>
            <p className="mt-1">Release the payment to {report.reviewerName}.</p>
            <ActionForm
              action={releaseAction}
              fields={fields}
              submitLabel={TRANSITION_LABELS.release}
              pendingLabel="Releasing…"
              variant="primary"
              className="mt-3"
              confirm={`Release ${price} to ${report.reviewerName}? The platform fee is kept; this cannot be undone.`}
            />
          </Card>
        ) : null}
        {job.actions.includes("openDispute") ? (
          <DisputeCard jobId={jobId} openUntil={day(job.releaseDueAt)} />
        ) : null}
        {report.viewer === "reviewer" ? (
          <Card>
            <h2 className="text-xl font-bold">Add a dated addendum</h2>
            <p className="mt-1">
              The report itself stays as delivered; an addendum is added below it with today&apos;s
              date.
            </p>
            <ActionForm
              action={addAddendumAction}
              fields={fields}
              submitLabel="Add the addendum"
              variant="secondary"
              className="mt-3"
            >
              <label className="block font-semibold" htmlFor="addendum">
                Addendum (Markdown)
              </label>
              <textarea
                id="addendum"
                name="bodyMd"
                required
                minLength={5}
                maxLength={8000}
                rows={4}
                className="w-full rounded-lg border border-slate-300 p-3"
              />
            </ActionForm>
          </Card>
        ) : null}
      </div>

      <Cautions compact />
    </article>
  );
}
