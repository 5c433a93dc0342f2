"use client";

import dynamic from "next/dynamic";
import type { LoopCheckResult } from "@/lib/calc/loop-check";

// The chart library loads after the page, in its own chunk; the figure, its caption and its
// text description are in the page from the start, and the box keeps its height meanwhile.
const PressurePlot = dynamic(() => import("./chart-plots").then((m) => m.PressurePlot), {
  ssr: false,
});
const FreezePlot = dynamic(() => import("./chart-plots").then((m) => m.FreezePlot), {
  ssr: false,
});

type Charts = LoopCheckResult["charts"];

/** Loop pressure from cold fill to the highest liquid temperature, the stagnation point and the relief setting. */
export function PressureChart({ data }: { data: NonNullable<Charts["pressure"]> }) {
  return (
    <figure className="rounded-card border border-slate-200 bg-white p-4">
      <figcaption className="mb-2 font-semibold">
        Loop pressure, cold to hot, against the relief setting
      </figcaption>
      <div
        className="h-64"
        role="img"
        aria-label={`Loop pressure rises from ${data.fillBar} bar cold; relief valve at ${data.reliefBar} bar; about ${data.stagnation.pressureBar ?? "over the relief setting"} bar at stagnation.`}
      >
        <PressurePlot data={data} />
      </div>
      {/* The marks' words sit below the plot, where they never overlap the curve on a phone. */}
      <ul className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-sm text-slate-700">
        <li className="flex items-center gap-2">
          <span
            aria-hidden
            className="inline-block w-6 border-t-2 border-dashed border-[#b42318]"
          />
          Relief valve {data.reliefBar} bar
        </li>
        {data.stagnation.pressureBar !== null ? (
          <li className="flex items-center gap-2">
            <span
              aria-hidden
              className="inline-block h-3 w-3 rounded-full border border-[#7e3f1f] bg-[#f8c537]"
            />
            Stagnation, with steam: {data.stagnation.pressureBar} bar at {data.stagnation.tempC} °C
          </li>
        ) : null}
      </ul>
    </figure>
  );
}

/** Freezing point against glycol concentration, with the site's design minimum and the chosen mix marked. */
export function FreezeChart({ data }: { data: NonNullable<Charts["freeze"]> }) {
  return (
    <figure className="rounded-card border border-slate-200 bg-white p-4">
      <figcaption className="mb-2 font-semibold">
        Freezing point of propylene glycol against concentration
      </figcaption>
      <div
        className="h-64"
        role="img"
        aria-label={`Freezing point falls as glycol rises; site minimum ${data.designMinC} °C; chosen mix ${data.percent} %.`}
      >
        <FreezePlot data={data} />
      </div>
      <ul className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-sm text-slate-700">
        <li className="flex items-center gap-2">
          <span
            aria-hidden
            className="inline-block w-6 border-t-2 border-dashed border-[#2f5f8a]"
          />
          Site minimum {data.designMinC} °C
        </li>
        <li className="flex items-center gap-2">
          <span aria-hidden className="inline-block h-4 border-l-2 border-[#9d4f25]" />
          Your mix {data.percent} %
        </li>
      </ul>
    </figure>
  );
}
