import type { Finding } from "@/lib/calc/findings";
import { LevelBadge } from "@/components/loop-check/level-badge";

/** The loop-check findings an item links to: level, numbers with units, source. */
export function Evidence({ findings }: { findings: readonly Finding[] }) {
  if (!findings.length) return null;
  return (
    <ul className="space-y-2">
      {findings.map((f, i) => (
        <li
          key={`${f.key}-${i}`}
          className="rounded-lg border border-slate-200 bg-white p-3"
          data-evidence={f.key}
        >
          <p className="flex flex-wrap items-center gap-2 font-semibold">
            <LevelBadge level={f.level} /> {f.title}
          </p>
          {f.values.length ? (
            <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
              {f.values.map((v) => (
                <div key={v.label} className="contents">
                  <dt className="text-slate-600">{v.label}</dt>
                  <dd className="font-semibold tabular-nums">
                    {typeof v.value === "number" ? v.value.toLocaleString("en-GB") : v.value}
                    {v.unit ? ` ${v.unit}` : ""}
                  </dd>
                </div>
              ))}
            </dl>
          ) : null}
          <p className="mt-2 text-sm text-slate-600">Source: {f.source}</p>
          {f.action ? <p className="mt-1 text-sm">{f.action}</p> : null}
        </li>
      ))}
    </ul>
  );
}
