import type { LoopCheckResult } from "@/lib/calc/loop-check";
import { ADVISORY_LINE, LEVELS } from "@/lib/calc/findings";
import { FindingsList } from "./findings-list";
import { FreezeChart, PressureChart } from "./charts";
import { LevelBadge } from "./level-badge";

/** The loop check's summary line, findings by level and the two charts. */
export function LoopCheckResults({ result }: { result: LoopCheckResult }) {
  return (
    <section aria-labelledby="results-title" className="space-y-5" data-testid="loop-check-results">
      <div className="flex flex-wrap items-center gap-3">
        <h2 id="results-title" className="text-2xl font-bold">
          Loop check
        </h2>
        <LevelBadge level={result.worst} />
        <p className="text-slate-600">
          {[...LEVELS]
            .reverse()
            .map((l) => `${result.counts[l]} ${l}`)
            .join(" · ")}
        </p>
      </div>
      <div className="grid gap-4">
        {result.charts.pressure ? <PressureChart data={result.charts.pressure} /> : null}
        {result.charts.freeze ? <FreezeChart data={result.charts.freeze} /> : null}
      </div>
      <FindingsList findings={result.findings} />
      <p className="rounded-card border border-slate-300 bg-slate-100 p-4 text-sm font-semibold">
        {ADVISORY_LINE}
      </p>
    </section>
  );
}
