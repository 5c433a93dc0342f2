import { labelFor, REQUEST_STATUS_LABELS, serviceLabel } from "@/lib/labels";
import { env } from "@/lib/env";
import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { HttpError } from "@/lib/data/errors";
import { getOwnProject, listProjectFiles, listProjectRequests } from "@/lib/data/projects";
import { runLoopCheck } from "@/lib/calc/loop-check";
import { systemSchema } from "@/lib/validation/system";
import { formatMoney } from "@/lib/money";
import { SECTIONS } from "@/components/loop-check/system-fields";
import { LoopCheckResults } from "@/components/loop-check/loop-check-results";
import { Card } from "@/components/ui/card";
import { ButtonLink } from "@/components/ui/button";
import { Cautions } from "@/components/ui/caution";
import { ProjectFiles } from "@/components/projects/project-files";
import { RequestForm } from "@/components/projects/request-form";
import { withdrawRequest } from "@/components/projects/actions";
import { DeleteProjectButton } from "@/components/projects/delete-project-button";
import { ActionForm } from "@/components/ui/action-form";
import { listItemRequestsForProject } from "@/lib/data/review";
import { ReviewerQuestions } from "@/components/review/reviewer-questions";
import { answerItemRequestAction } from "@/components/review/actions";
import { getPhotoGuidance } from "@/lib/data/photo-tags";
import { PhotoGuidance } from "@/components/aftercare/photo-guidance";

export const metadata: Metadata = { title: "Project" };

export default async function ProjectPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const user = await pageUser(`/projects/${id}`, ["homeowner", "admin"]);
  if (!/^\d+$/.test(id)) notFound();
  const project = await getOwnProject(db(), user, Number(id)).catch((err: unknown) => {
    if (err instanceof HttpError && err.status === 404) notFound();
    throw err;
  });
  const [files, requests, questions, guidance] = await Promise.all([
    listProjectFiles(db(), user, project.id),
    listProjectRequests(db(), user, project.id),
    listItemRequestsForProject(db(), user, project.id),
    getPhotoGuidance(db(), user, project.id),
  ]);
  const result = runLoopCheck(project.system);
  const complete = systemSchema.safeParse(project.system).success;
  const missing = SECTIONS.filter((s) => !(s.id in project.system));
  const open = requests.find((r) => r.status === "open");
  return (
    <div className="space-y-6">
      <header className="flex flex-wrap items-center justify-between gap-3">
        <h1 className="text-3xl font-bold">{project.title}</h1>
        <ButtonLink
          variant="secondary"
          href={`/projects/${project.id}/edit/${missing[0]?.id ?? "site"}`}
        >
          {complete ? "Edit the description" : "Continue the description"}
        </ButtonLink>
      </header>
      {!complete ? (
        <p role="status" className="rounded-card border border-level-note bg-level-note-bg p-4">
          Still to fill in:{" "}
          {missing.map((s) => s.title).join(", ") || "some values in the steps marked below"}. The
          loop check below uses what you have saved.
        </p>
      ) : null}

      <ReviewerQuestions
        projectId={project.id}
        questions={questions}
        photos={files.filter((f) => f.purpose === "photo")}
        answer={answerItemRequestAction}
      />

      <Card>
        <h2 className="mb-3 text-xl font-bold">Sketch and photos</h2>
        <p className="mb-3 text-sm text-slate-600">
          Only you, our admins and the reviewers you ask can see these.
        </p>
        <ProjectFiles projectId={project.id} files={files} />
      </Card>

      <PhotoGuidance projectId={project.id} guidance={guidance} />

      <Card>
        <h2 className="mb-3 text-xl font-bold">Review requests</h2>
        {requests.length ? (
          <ul className="mb-4 divide-y divide-slate-100">
            {requests.map((r) => (
              <li
                key={r.id}
                className="flex flex-wrap items-center gap-3 py-3"
                data-request={r.status}
              >
                <span className="font-semibold">{serviceLabel(r.kind)}</span>
                <span>
                  {formatMoney(r.budgetMinMinor, r.currency)}–
                  {formatMoney(r.budgetMaxMinor, r.currency)}
                </span>
                <span className="rounded-full bg-slate-100 px-2 py-0.5 text-sm">
                  {labelFor(REQUEST_STATUS_LABELS, r.status)}
                </span>
                <span className="text-sm text-slate-600">
                  {r.status === "open"
                    ? `open until ${r.expiresAt.slice(0, 10)}`
                    : `posted ${r.createdAt.slice(0, 10)}`}
                </span>
                <Link
                  className="inline-flex min-h-11 items-center underline"
                  href={`/requests/${r.id}`}
                >
                  Quotes
                </Link>
                {r.status === "open" ? (
                  <ActionForm
                    action={withdrawRequest}
                    fields={{ projectId: project.id, requestId: r.id }}
                    submitLabel="Cancel request"
                    pendingLabel="Cancelling…"
                    confirm="Cancel this request? Reviewers who quoted are told."
                  />
                ) : null}
              </li>
            ))}
          </ul>
        ) : null}
        {open ? (
          <div className="space-y-3">
            <p role="status" className="rounded-lg bg-level-ok-bg p-3 text-level-ok">
              Your request is on the board. Verified reviewers can now quote; you will get an e-mail
              for each quote.
            </p>
            <details>
              <summary className="min-h-11 cursor-pointer py-2 font-semibold">
                Edit this request
              </summary>
              <RequestForm
                currency={env().CURRENCY}
                projectId={project.id}
                existing={{
                  id: open.id,
                  values: {
                    kind: open.kind,
                    questions: open.questions,
                    budgetMinPounds: String(open.budgetMinMinor / 100),
                    budgetMaxPounds: String(open.budgetMaxMinor / 100),
                    windowStart: open.windowStart ?? "",
                    windowEnd: open.windowEnd ?? "",
                    accessNotes: open.accessNotes ?? "",
                  },
                }}
              />
            </details>
          </div>
        ) : complete ? (
          <RequestForm
            projectId={project.id}
            currency={env().CURRENCY}
            stops={result.findings
              .filter((f) => f.level === "stop")
              .map((f) => ({ title: f.title, action: f.action }))}
          />
        ) : (
          <p>Finish the description to ask for a review.</p>
        )}
      </Card>

      <Cautions compact />
      <LoopCheckResults result={result} />
      <div className="flex flex-wrap items-center justify-between gap-3 text-sm">
        <Link className="inline-flex min-h-11 items-center underline" href="/dashboard">
          Back to the dashboard
        </Link>
        <Link
          className="inline-flex min-h-11 items-center underline"
          href={`/projects/${project.id}/first-fill`}
        >
          First-fill record (commissioning)
        </Link>
        <DeleteProjectButton projectId={project.id} />
      </div>
    </div>
  );
}
