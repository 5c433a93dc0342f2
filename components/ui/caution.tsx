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

/** The cautions that belong beside one step of the work (product.md, "Safety"). */
export const STEP_CAUTIONS = {
  collectors: [
    {
      title: "Working at height",
      text: "Collectors go on the roof: work from a scaffold or tower with edge protection, never from a ladder alone, with two people, on a dry and calm day.",
    },
  ],
  fluid: [
    {
      title: "Glycol handling",
      text: "Wear gloves and eye protection when mixing or filling; collect spills and old fluid for proper disposal, never into a drain.",
    },
    {
      title: "Hot fluid",
      text: "Fill and vent with the collector covered or early in the morning; never open a loop that has been in the sun.",
    },
  ],
  cylinder: [
    {
      title: "Licensed work",
      text: "Unvented cylinders and immersion heaters are licensed work where local rules say so: fitting, the relief and expansion devices and the electrics need a competent, licensed person.",
    },
  ],
  safety: [
    {
      title: "Scalding",
      text: "Solar can heat the store well above 60 °C. Fit a thermostatic mixing valve at the outlet and set it to a safe temperature for the taps it serves.",
    },
    {
      title: "Relief valves",
      text: "Pipe relief discharges to a safe, visible place: at stagnation they can release steam and hot glycol.",
    },
  ],
  siteVisit: [
    {
      title: "Working at height",
      text: "The visitor may go up to the collectors: have a scaffold or tower ready where the roof needs one. Never ladders alone.",
    },
  ],
  roofPhotos: [
    {
      title: "Photos from a safe place",
      text: "Take roof and collector photos from the ground, a window or a scaffold, never from the roof edge or a ladder.",
    },
  ],
} as const satisfies Record<string, readonly { title: string; text: string }[]>;

export type StepCautionKey = keyof typeof STEP_CAUTIONS;

/** A short caution beside the step it concerns. */
export function StepCaution({ step }: { step: StepCautionKey }) {
  return (
    <aside
      data-caution={step}
      className="rounded-lg border-l-4 border-sun-400 bg-amber-50 px-4 py-3 text-sm text-slate-800"
    >
      <ul className="space-y-1">
        {STEP_CAUTIONS[step].map((c) => (
          <li key={c.title} className="flex gap-2">
            <TriangleAlert aria-hidden className="mt-0.5 h-4 w-4 shrink-0 text-copper-700" />
            <span>
              <strong>{c.title}.</strong> {c.text}
            </span>
          </li>
        ))}
      </ul>
    </aside>
  );
}

/** The caution for a section of the system description, if one belongs beside it. */
export function cautionForSection(section: string): StepCautionKey | null {
  return section in STEP_CAUTIONS && section !== "siteVisit" && section !== "roofPhotos"
    ? (section as StepCautionKey)
    : null;
}
