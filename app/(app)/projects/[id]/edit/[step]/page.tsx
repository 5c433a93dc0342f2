import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { HttpError } from "@/lib/data/errors";
import { getOwnProject } from "@/lib/data/projects";
import { SECTIONS } from "@/components/loop-check/system-fields";
import { Card } from "@/components/ui/card";
import { StepForm } from "@/components/projects/step-form";
import { formDefaults } from "@/components/projects/blank-system";
import { cn } from "@/lib/cn";

export const metadata: Metadata = { title: "Describe the system" };

export default async function EditStepPage({
  params,
}: {
  params: Promise<{ id: string; step: string }>;
}) {
  const { id, step } = await params;
  const user = await pageUser(`/projects/${id}/edit/${step}`, ["homeowner"]);
  const section = SECTIONS.find((s) => s.id === step);
  if (!section || !/^\d+$/.test(id)) notFound();
  const project = await getOwnProject(db(), user, Number(id)).catch((err: unknown) => {
    if (err instanceof HttpError && err.status === 404) notFound();
    throw err;
  });
  const next = SECTIONS[SECTIONS.indexOf(section) + 1];
  const saved = new Set(Object.keys(project.system));
  return (
    <div className="grid gap-6 lg:grid-cols-[16rem_minmax(0,1fr)]">
      <nav aria-label="Steps" className="space-y-1">
        <p className="mb-2 font-semibold">
          <Link className="underline" href={`/projects/${project.id}`}>
            {project.title}
          </Link>
        </p>
        <ol className="space-y-1">
          {SECTIONS.map((s, i) => (
            <li key={s.id}>
              <Link
                href={`/projects/${project.id}/edit/${s.id}`}
                aria-current={s.id === step ? "step" : undefined}
                className={cn(
                  "flex min-h-11 items-center gap-2 rounded-lg px-3 py-2",
                  s.id === step ? "bg-copper-600 text-white" : "hover:bg-slate-100",
                )}
              >
                <span className="w-5 text-right">{i + 1}.</span> {s.title}{" "}
                {saved.has(s.id) ? <span aria-label="saved">✓</span> : null}
              </Link>
            </li>
          ))}
        </ol>
      </nav>
      <Card>
        <StepForm
          key={step}
          projectId={project.id}
          section={section}
          next={next ? { id: next.id, title: next.title } : undefined}
          defaultValues={formDefaults(project.system)}
        />
      </Card>
    </div>
  );
}
