import type { LoopCheckResult } from "@/lib/calc/loop-check";
import { ADVISORY_LINE, LEVEL_LABELS, LEVELS } from "@/lib/calc/findings";
import { FindingsList } from "./findings-list";
import { FreezeChart, PressureChart } from "./charts";
import { LevelBadge } from "./level-badge";

/** "Stop 0 · Fix 2 · Note 1 · OK 6": the level words as the badges show them. */
export function levelCounts(result: LoopCheckResult): string {
  return [...LEVELS]
    .reverse()
    .map((l) => `${LEVEL_LABELS[l]} ${result.counts[l]}`)
    .join(" · ");
}

function LevelCounts({ result }: { result: LoopCheckResult }) {
  return <>{levelCounts(result)}</>;
}

/** The loop check's summary line, findings by level and the two charts. */
export function LoopCheckResults({ result }: { result: LoopCheckResult }) {
  return (
    <section aria-labelledby="results-title" className="space-y-5" data-testid="loop-check-results">
      <div className="flex flex-wrap items-center gap-3">
        <h2 id="results-title" tabIndex={-1} className="text-2xl font-bold focus:outline-none">
          Loop check
        </h2>
        <LevelBadge level={result.worst} />
        <p className="text-slate-600">
          <LevelCounts result={result} />
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
