import { TriangleAlert } from "lucide-react";
import { ADVISORY_LINE } from "@/lib/calc/findings";

export const CAUTIONS = [
  {
    title: "Working at height",
    text: "Work on the roof from a scaffold or tower with edge protection, not from ladders alone. Two people, a dry and calm day.",
  },
  {
    title: "Hot, pressurised fluid and steam",
    text: "A collector that stops circulating in sun can pass 200 °C. Never open a hot loop; fill and work with the collector covered or early in the morning.",
  },
  {
    title: "Scalding",
    text: "Solar can heat the store above 60 °C and beyond 80 °C. Fit a thermostatic mixing valve at the outlet.",
  },
  {
    title: "Glycol",
    text: "Wear gloves and eye protection; collect spills and old fluid for proper disposal, never into a drain.",
  },
  {
    title: "Licensed work",
    text: "Unvented cylinders and electrical work need a competent, licensed person where local rules say so.",
  },
] as const;

export function Cautions({ compact = false }: { compact?: boolean }) {
  return (
    <aside
      aria-labelledby="cautions-title"
      className="rounded-card border-2 border-sun-400 bg-amber-50 p-5"
    >
      <h2 id="cautions-title" className="flex items-center gap-2 text-lg font-bold text-slate-900">
        <TriangleAlert aria-hidden className="h-5 w-5 text-copper-700" /> Before anyone goes up or
        fills anything
      </h2>
      <ul className={compact ? "mt-3 space-y-2 text-sm" : "mt-3 grid gap-3 sm:grid-cols-2"}>
        {CAUTIONS.map((c) => (
          <li key={c.title}>
            <strong>{c.title}.</strong> {c.text}
          </li>
        ))}
      </ul>
      <p className="mt-4 text-sm font-semibold text-slate-800">{ADVISORY_LINE}</p>
    </aside>
  );
}
