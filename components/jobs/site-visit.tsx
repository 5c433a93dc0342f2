import { CalendarCheck, CalendarClock, CalendarX, TriangleAlert } from "lucide-react";
import type { JobView } from "@/lib/types/jobs";
import { env } from "@/lib/env";
import { formatWhen, fromSqlDateTime, wallTimeIn } from "@/lib/time";
import { Card } from "@/components/ui/card";
import { ActionForm } from "@/components/ui/action-form";
import { VisitForm } from "./visit-form";
import { askAnotherVisitAction, confirmVisitAction, proposeVisitAction } from "./visit-actions";

const STATE_WORDS = {
  proposed: { icon: CalendarClock, words: "Proposed, waiting for the homeowner to confirm" },
  confirmed: { icon: CalendarCheck, words: "Confirmed" },
  declined: { icon: CalendarX, words: "The homeowner asked for another time" },
} as const;

const longDay = (d: string) =>
  new Intl.DateTimeFormat("en-GB", { dateStyle: "long", timeZone: "UTC" }).format(
    new Date(`${d.slice(0, 10)}T00:00:00Z`),
  );

/** The caution beside the site-visit step: the visitor works at height. */
export function WorkAtHeightCaution() {
  return (
    <p
      className="mt-3 flex gap-2 rounded-lg border-2 border-sun-400 bg-amber-50 p-3 text-sm"
      data-testid="visit-caution"
    >
      <TriangleAlert aria-hidden className="mt-0.5 h-5 w-5 shrink-0 text-copper-700" />
      <span>
        <strong>Working at height.</strong> The visitor works on the roof from a scaffold or a tower
        with edge protection, never from a ladder alone. Local rules for work at height, and the
        licensed practice where you live, come first.
      </span>
    </p>
  );
}

/** The site-visit step on the job page: the time, its state and the next thing to do. */
export function SiteVisitCard({ job, role }: { job: JobView; role: string }) {
  if (job.kind !== "site_visit") return null;
  const tz = env().APP_TIME_ZONE;
  const open = job.state === "funded" || job.state === "in_review";
  const visit = job.visit;
  const when = visit ? formatWhen(fromSqlDateTime(visit.at), tz) : null;
  const state = !visit
    ? null
    : visit.state === "declined" && (job.state === "cancelled" || job.state === "refunded")
      ? { icon: CalendarX, words: "Called off: the job was cancelled" }
      : STATE_WORDS[visit.state];
  const fields = { jobId: job.id, sequence: visit?.sequence ?? 0 };
  return (
    <Card>
      <h2 className="text-xl font-bold">Site visit</h2>
      {job.windowStart && job.windowEnd ? (
        <p className="mt-1">
          The homeowner&apos;s window: {longDay(job.windowStart)} to {longDay(job.windowEnd)}.
        </p>
      ) : null}
      {visit && state ? (
        <div className="mt-3" data-testid="visit-status">
          <p className="flex items-center gap-2 font-semibold">
            <state.icon aria-hidden className="h-5 w-5 text-copper-700" /> {state.words}
          </p>
          <p className="mt-1 text-lg">{when}</p>
          {visit.note ? <p className="mt-1 text-slate-700">Note: “{visit.note}”</p> : null}
        </div>
      ) : (
        <p className="mt-3">
          {role === "reviewer"
            ? "Propose a date and time for the visit inside the homeowner's window."
            : "The reviewer proposes a date and time; you confirm it or ask for another."}
        </p>
      )}
      <WorkAtHeightCaution />
      {open && role === "reviewer" ? (
        <div className="mt-4">
          <VisitForm
            action={proposeVisitAction}
            fields={{ jobId: job.id }}
            mode="propose"
            submitLabel={visit ? "Propose a new time" : "Propose this time"}
            min={job.windowStart ? `${job.windowStart.slice(0, 10)}T07:00` : undefined}
            max={job.windowEnd ? `${job.windowEnd.slice(0, 10)}T20:00` : undefined}
            current={visit ? wallTimeIn(fromSqlDateTime(visit.at), tz) : undefined}
          />
        </div>
      ) : null}
      {open && role === "homeowner" && visit?.state === "proposed" ? (
        <div className="mt-4 space-y-4">
          <ActionForm
            action={confirmVisitAction}
            fields={fields}
            submitLabel="Confirm this time"
            pendingLabel="Confirming…"
            variant="primary"
          />
          <VisitForm
            action={askAnotherVisitAction}
            fields={fields}
            mode="another"
            submitLabel="Ask for another time"
          />
        </div>
      ) : null}
      {open && role === "homeowner" && visit?.state === "confirmed" ? (
        <details className="mt-4">
          <summary className="cursor-pointer font-semibold">This time no longer suits</summary>
          <div className="mt-2">
            <VisitForm
              action={askAnotherVisitAction}
              fields={fields}
              mode="another"
              submitLabel="Ask for another time"
            />
          </div>
        </details>
      ) : null}
    </Card>
  );
}
