import { labelFor, plural, PROJECT_STATUS_LABELS } from "@/lib/labels";
import type { Metadata } from "next";
import Link from "next/link";
import { pageUser, type CurrentUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { getAdminCounts, listOwnProjects } from "@/lib/data/dashboard";
import { listJobs } from "@/lib/data/jobs";
import { formatMoney } from "@/lib/money";
import { JobStateBadge } from "@/components/jobs/job-state-badge";
import { getVerificationStatus } from "@/lib/data/reviewers";
import { credentialName } from "@/lib/credentials";
import { Card } from "@/components/ui/card";
import { ButtonLink } from "@/components/ui/button";
import { LevelBadge } from "@/components/loop-check/level-badge";
import { VerifyEmailBanner } from "@/components/auth/resend-verification";

export const metadata: Metadata = { title: "Dashboard" };

export default async function DashboardPage() {
  const user = await pageUser("/dashboard");
  return (
    <div className="space-y-6">
      <h1 className="text-3xl font-bold">Hello, {user.displayName}</h1>
      {!user.emailVerified ? <VerifyEmailBanner /> : null}
      {user.role === "homeowner" ? <HomeownerPanel user={user} /> : null}
      {user.role === "reviewer" ? <ReviewerPanel userId={user.id} /> : null}
      {user.role === "admin" ? <AdminPanel user={user} /> : null}
      {user.role !== "admin" ? <JobsPanel user={user} /> : null}
    </div>
  );
}

async function HomeownerPanel({ user }: { user: CurrentUser }) {
  const projects = await listOwnProjects(db(), user);
  return (
    <Card>
      <h2 className="text-xl font-bold">Your projects</h2>
      {projects.length === 0 ? (
        <p className="mt-2 text-slate-700">
          No projects yet. Start one to describe your system step by step, upload a sketch and
          photos, and ask for a review.
        </p>
      ) : (
        <ul className="mt-3 divide-y divide-slate-100">
          {projects.map((p) => (
            <li key={p.id} className="flex flex-wrap items-center gap-3 py-3">
              {p.worstLevel ? <LevelBadge level={p.worstLevel} /> : null}
              <Link
                href={`/projects/${p.id}`}
                className="flex min-h-11 flex-1 items-center font-semibold underline"
              >
                {p.title}
              </Link>
              <span className="text-sm text-slate-600">
                {labelFor(PROJECT_STATUS_LABELS, p.status)}
                {p.openRequests ? ` · ${plural(p.openRequests, "open request")}` : ""}
              </span>
            </li>
          ))}
        </ul>
      )}
      <div className="mt-4">
        <div className="flex flex-wrap gap-3">
          <ButtonLink href="/projects/new">New project</ButtonLink>
          <ButtonLink href="/loop-check" variant="secondary">
            Try the loop check
          </ButtonLink>
        </div>
      </div>
    </Card>
  );
}

async function ReviewerPanel({ userId }: { userId: number }) {
  const status = await getVerificationStatus(db(), userId);
  return (
    <Card>
      <h2 className="text-xl font-bold">Verification</h2>
      {status.suspended ? (
        <p className="mt-2 font-semibold text-level-stop">
          Your account is suspended. Contact the Loopwright team.
        </p>
      ) : status.verified ? (
        <p className="mt-2 text-level-ok">
          You are verified: you can see the request board and quote.
        </p>
      ) : (
        <div className="mt-2 space-y-2">
          <p>You can quote once these are in place:</p>
          <ul className="list-disc pl-5">
            {!status.hasProfile ? (
              <li>
                <Link className="underline" href="/reviewer/profile">
                  Your trade profile
                </Link>
              </li>
            ) : null}
            {status.missing.map((k) => (
              <li key={k}>
                A verified, unexpired{" "}
                <Link className="underline" href="/reviewer/credentials">
                  {credentialName(k)}
                </Link>
              </li>
            ))}
          </ul>
        </div>
      )}
    </Card>
  );
}

async function AdminPanel({ user }: { user: CurrentUser }) {
  const c = await getAdminCounts(db(), user);
  const tiles = [
    { label: "Credentials waiting", value: c.pendingCredentials, href: "/admin/credentials" },
    { label: "E-mails that failed", value: c.failedEmails, href: "/admin/outbox" },
    { label: "Open disputes", value: c.openDisputes, href: "/admin/disputes" },
    { label: "Suspended reviewers", value: c.suspended, href: "/admin/credentials?status=all" },
  ];
  return (
    <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
      {tiles.map((t) => (
        <Link
          key={t.label}
          href={t.href}
          className="rounded-card border border-slate-200 bg-white p-5 hover:border-copper-400"
        >
          <p className="text-3xl font-bold">{t.value}</p>
          <p className="text-slate-700">{t.label}</p>
        </Link>
      ))}
    </div>
  );
}

/** The person's jobs, grouped by state in the order they move through. */
async function JobsPanel({ user }: { user: CurrentUser }) {
  const jobs = await listJobs(db(), user);
  if (jobs.length === 0) return null;
  const viewer = user.role === "homeowner" ? "homeowner" : "reviewer";
  return (
    <Card>
      <h2 className="text-xl font-bold">Your jobs</h2>
      <ul className="mt-3 divide-y divide-slate-100">
        {jobs.map((j) => (
          <li key={j.id} className="flex flex-wrap items-center gap-3 py-3">
            <JobStateBadge state={j.state} viewer={viewer} />
            <Link
              href={`/jobs/${j.id}`}
              className="flex min-h-11 flex-1 items-center font-semibold underline"
            >
              {j.title}
            </Link>
            <span className="text-sm text-slate-600">{formatMoney(j.amountMinor, j.currency)}</span>
          </li>
        ))}
      </ul>
    </Card>
  );
}
