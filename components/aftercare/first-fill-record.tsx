import { CircleCheck, CircleMinus, TriangleAlert } from "lucide-react";
import type { ComparisonStatus, FirstFillDesign } from "@/lib/calc/first-fill";
import { FIRST_FILL_TOLERANCE } from "@/lib/calc/first-fill";
import type { FirstFillJob } from "@/lib/types/aftercare";
import { cn } from "@/lib/cn";
import { Card } from "@/components/ui/card";
import { CountersignForm, FirstFillForm } from "./first-fill-form";

const STATUS: Record<ComparisonStatus, { word: string; icon: typeof CircleCheck; tone: string }> = {
  matches: { word: "Matches", icon: CircleCheck, tone: "text-level-ok" },
  differs: { word: "Differs", icon: TriangleAlert, tone: "text-level-fix" },
  not_compared: { word: "Not compared", icon: CircleMinus, tone: "text-slate-600" },
};

const day = (s: string) =>
  new Intl.DateTimeFormat("en-GB", { dateStyle: "medium", timeZone: "UTC" }).format(
    new Date(`${s.replace(" ", "T")}Z`),
  );

const v = (n: number | null, unit: string, digits = 2) =>
  n === null ? "—" : `${Number(n.toFixed(digits)).toLocaleString("en-GB")} ${unit}`;

/** The design values the readings are compared with. */
export function DesignValues({ design }: { design: FirstFillDesign }) {
  const rows: [string, string][] = [
    [
      "Cold fill pressure",
      `${v(design.fillBar, "bar")}${design.fillTempC !== null ? ` at ${design.fillTempC} °C` : ""}`,
    ],
    ["Vessel pre-charge set", v(design.prechargeSetBar, "bar")],
    ["Recommended pre-charge", v(design.prechargeRecommendedBar, "bar")],
    [
      "Hot pressure",
      design.pressureCurve.length
        ? `${v(design.pressureCurve.at(-1)!.pressureBar, "bar")} at ${design.pressureCurve.at(-1)!.tempC} °C (curve from the fill temperature)`
        : "—",
    ],
    ["Relief valve setting", v(design.reliefBar, "bar", 1)],
    [
      "Glycol",
      design.glycolType === "none"
        ? "plain water"
        : `${v(design.glycolPercentMass, "% by mass", 1)}${design.freezeC !== null ? `, freezes at ${v(design.freezeC, "°C", 1)}` : ""}`,
    ],
    ["Clear night at the collector", v(design.coldNightC, "°C", 1)],
    ["Design flow", v(design.flowLph, "L/h", 0)],
  ];
  return (
    <dl className="grid gap-x-6 sm:grid-cols-2" data-testid="design-values">
      {rows.map(([k, val]) => (
        <div key={k} className="flex justify-between gap-4 border-b border-slate-100 py-1.5">
          <dt className="text-slate-700">{k}</dt>
          <dd className="text-right font-semibold tabular-nums">{val}</dd>
        </div>
      ))}
    </dl>
  );
}

/** One job's record: the readings against the design, the countersign, and the forms. */
export function FirstFillJobRecord({
  projectId,
  job,
  viewer,
}: {
  projectId: number;
  job: FirstFillJob;
  viewer: "homeowner" | "reviewer" | "admin";
}) {
  const r = job.record;
  const signed = Boolean(r?.countersignedAt);
  return (
    <section aria-labelledby={`ff-${job.jobId}`} className="space-y-4" data-first-fill={job.jobId}>
      <h2 id={`ff-${job.jobId}`} className="text-2xl font-bold">
        Reviewed by {job.reviewerName}
      </h2>
      {!job.open && !r ? (
        <p>The first fill can be recorded once the reviewer&apos;s report has been delivered.</p>
      ) : null}
      {r && job.comparison ? (
        <Card>
          <p className="text-sm text-slate-600">
            Recorded {day(r.recordedAt)} ·{" "}
            {job.comparison.differs === 0
              ? "every reading matches the design"
              : `${job.comparison.differs} ${job.comparison.differs === 1 ? "reading differs" : "readings differ"} from the design`}
          </p>
          <div className="mt-3 overflow-x-auto">
            <table className="w-full text-left text-sm" aria-label="Readings against the design">
              <thead className="border-b border-slate-200 text-slate-600">
                <tr>
                  <th scope="col" className="p-2">
                    Reading
                  </th>
                  <th scope="col" className="p-2">
                    Measured
                  </th>
                  <th scope="col" className="p-2">
                    Design
                  </th>
                  <th scope="col" className="p-2">
                    Result
                  </th>
                  <th scope="col" className="p-2">
                    What it usually means
                  </th>
                </tr>
              </thead>
              <tbody>
                {job.comparison.items.map((i) => {
                  const s = STATUS[i.status];
                  const Icon = s.icon;
                  return (
                    <tr
                      key={i.key}
                      className="border-b border-slate-100 align-top"
                      data-compare={i.key}
                      data-status={i.status}
                    >
                      <th scope="row" className="p-2 font-semibold">
                        {i.label}
                      </th>
                      <td className="p-2 tabular-nums">{i.measured}</td>
                      <td className="p-2 tabular-nums">
                        {i.design}
                        <div className="text-xs text-slate-500">tolerance {i.tolerance}</div>
                      </td>
                      <td className={cn("p-2 font-bold whitespace-nowrap", s.tone)}>
                        <Icon aria-hidden className="mr-1 inline h-4 w-4" />
                        {s.word}
                      </td>
                      <td className="p-2">
                        {i.meaning}
                        <div className="text-xs text-slate-500">{i.source}</div>
                      </td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
          </div>
          {r.notes ? (
            <div className="mt-3">
              <h3 className="font-semibold">Notes</h3>
              <p className="whitespace-pre-line">{r.notes}</p>
            </div>
          ) : null}
          <div className="mt-4 rounded-lg bg-slate-50 p-3" data-testid="countersign">
            {signed ? (
              <>
                <p className="font-semibold">
                  <CircleCheck aria-hidden className="mr-1 inline h-4 w-4 text-level-ok" />
                  Countersigned by {r.countersignedBy ?? job.reviewerName} on{" "}
                  {day(r.countersignedAt!)}
                </p>
                {r.countersignComment ? (
                  <p className="mt-1 whitespace-pre-line">{r.countersignComment}</p>
                ) : null}
              </>
            ) : viewer === "reviewer" ? (
              <CountersignForm jobId={job.jobId} projectId={projectId} />
            ) : (
              <p>Not countersigned yet: {job.reviewerName} can countersign it from this page.</p>
            )}
          </div>
        </Card>
      ) : null}
      {viewer === "homeowner" && job.open && !signed ? (
        <Card className="print:hidden">
          {r ? (
            <details>
              <summary className="min-h-11 cursor-pointer py-2 font-semibold">
                Correct the readings (until the reviewer countersigns)
              </summary>
              <FirstFillForm jobId={job.jobId} projectId={projectId} record={r} />
            </details>
          ) : (
            <>
              <h3 className="mb-2 text-lg font-bold">Record the first fill</h3>
              <FirstFillForm jobId={job.jobId} projectId={projectId} record={null} />
            </>
          )}
        </Card>
      ) : null}
    </section>
  );
}

/** The tolerances in words, for the foot of the record. */
export const TOLERANCE_NOTE = `Tolerances (common practice): cold fill ±${FIRST_FILL_TOLERANCE.fillBar} bar; pre-charge −${FIRST_FILL_TOLERANCE.prechargeLowBar}/+${FIRST_FILL_TOLERANCE.prechargeHighBar} bar; hot pressure ±${FIRST_FILL_TOLERANCE.hotBar} bar; glycol ±${FIRST_FILL_TOLERANCE.glycolPoints} points; freeze point ±${FIRST_FILL_TOLERANCE.freezeK} K; flow ±${FIRST_FILL_TOLERANCE.flowShare * 100} %. The fill at least 0.3 bar above the pre-charge follows EN 12828 (from memory).`;
