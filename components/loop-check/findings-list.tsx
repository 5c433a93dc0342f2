import { LEVELS, type Finding, type Level } from "@/lib/calc/findings";
import { LevelBadge } from "./level-badge";
import { hasRecalledFigures, plainSource } from "./plain-source";

// The groups' headings never reuse a report outcome's words (Ready to commission, Fix before
// filling, Do not proceed): levels and outcomes are different things.
const GROUP_TITLES: Record<Level, string> = {
  stop: "Stop: unsafe as described; the loop must not be filled or run",
  fix: "Fix: changes needed",
  note: "Note: worth a look",
  ok: "OK: checks that pass",
};

export interface FindingsListProps {
  findings: readonly Finding[];
}

/** Findings grouped by level, worst first, each with its numbers, source and what to do. */
export function FindingsList({ findings }: FindingsListProps) {
  const order = [...LEVELS].reverse();
  return (
    <div className="space-y-6">
      {order.map((level) => {
        const group = findings.filter((f) => f.level === level);
        if (group.length === 0) return null;
        return (
          <section key={level} aria-label={GROUP_TITLES[level]} data-testid={`findings-${level}`}>
            <h3 className="mb-2 text-lg font-bold text-slate-900">{GROUP_TITLES[level]}</h3>
            <ul className="space-y-3">
              {group.map((f, i) => (
                <li
                  key={`${f.key}-${i}`}
                  data-finding={f.key}
                  className="rounded-card border border-slate-200 bg-white p-4"
                >
                  <div className="flex flex-wrap items-start gap-2">
                    <LevelBadge level={f.level} />
                    <p className="flex-1 font-semibold text-slate-900">{f.title}</p>
                  </div>
                  {f.values.length > 0 ? (
                    <table className="mt-3 w-full text-sm">
                      <tbody>
                        {f.values.map((v, j) => (
                          <tr key={`${j}-${v.label}`} className="border-t border-slate-100">
                            <th
                              scope="row"
                              className="py-1 pr-3 text-left font-normal text-slate-600"
                            >
                              {v.label}
                            </th>
                            <td
                              className={
                                typeof v.value === "number"
                                  ? "whitespace-nowrap py-1 text-right font-mono tabular-nums text-slate-900"
                                  : "py-1 text-right font-mono tabular-nums text-slate-900"
                              }
                            >
                              {v.value}
                              {v.unit ? ` ${v.unit}` : ""}
                            </td>
                          </tr>
                        ))}
                      </tbody>
                    </table>
                  ) : null}
                  <p className="mt-3 text-slate-800">
                    <strong>What to do:</strong> {f.action}
                  </p>
                  <p className="mt-1 text-xs text-slate-500">Source: {plainSource(f.source)}</p>
                  {f.method ? (
                    <details className="mt-2 text-sm text-slate-700">
                      <summary className="cursor-pointer py-3 font-medium text-slate-800">
                        How this is worked out
                      </summary>
                      <p className="mt-1">{plainSource(f.method)}</p>
                      {hasRecalledFigures(f.source) || hasRecalledFigures(f.method) ? (
                        <p className="mt-1 text-xs text-slate-600">
                          Some coefficients here are quoted from the standard as commonly applied
                          rather than from its latest edition: for design work, check the standard
                          itself.
                        </p>
                      ) : null}
                    </details>
                  ) : null}
                </li>
              ))}
            </ul>
          </section>
        );
      })}
    </div>
  );
}
