"use client";

import {
  CartesianGrid,
  Line,
  LineChart,
  ReferenceDot,
  ReferenceLine,
  ResponsiveContainer,
  Tooltip,
  XAxis,
  YAxis,
} from "recharts";
import type { LoopCheckResult } from "@/lib/calc/loop-check";

type Charts = LoopCheckResult["charts"];

/** Loop pressure from cold fill to the highest liquid temperature, the stagnation point and the relief setting. */
export function PressureChart({ data }: { data: NonNullable<Charts["pressure"]> }) {
  const top = Math.ceil(
    Math.max(data.reliefBar, ...data.points.map((p) => p.pressureBar ?? 0)) + 0.5,
  );
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
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={data.points} margin={{ top: 10, right: 20, bottom: 20, left: 0 }}>
            <CartesianGrid stroke="#e2e8f0" />
            <XAxis
              dataKey="tempC"
              type="number"
              domain={["dataMin", Math.max(200, data.stagnation.tempC)]}
              unit=" °C"
              tick={{ fontSize: 12 }}
            />
            <YAxis domain={[0, top]} unit=" bar" width={56} tick={{ fontSize: 12 }} />
            <Tooltip
              formatter={(v) => [`${v} bar`, "pressure"]}
              labelFormatter={(l) => `${l} °C`}
            />
            <ReferenceLine y={data.reliefBar} stroke="#b42318" strokeDasharray="6 4" />
            <Line
              type="monotone"
              dataKey="pressureBar"
              stroke="#9d4f25"
              strokeWidth={3}
              dot={false}
              isAnimationActive={false}
            />
            {data.stagnation.pressureBar !== null ? (
              <ReferenceDot
                x={data.stagnation.tempC}
                y={data.stagnation.pressureBar}
                r={6}
                fill="#f8c537"
                stroke="#7e3f1f"
              />
            ) : null}
          </LineChart>
        </ResponsiveContainer>
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
        <ResponsiveContainer width="100%" height="100%">
          <LineChart data={data.points} margin={{ top: 10, right: 20, bottom: 20, left: 0 }}>
            <CartesianGrid stroke="#e2e8f0" />
            <XAxis
              dataKey="percent"
              type="number"
              domain={[0, 60]}
              unit=" %"
              tick={{ fontSize: 12 }}
            />
            <YAxis unit=" °C" width={56} domain={[-55, 5]} tick={{ fontSize: 12 }} />
            <Tooltip
              formatter={(v) => [`${v} °C`, "freezing point"]}
              labelFormatter={(l) => `${l} % by mass`}
            />
            <ReferenceLine y={data.designMinC} stroke="#2f5f8a" strokeDasharray="6 4" />
            <ReferenceLine x={data.percent} stroke="#9d4f25" />
            <Line
              type="monotone"
              dataKey="freezeC"
              stroke="#9d4f25"
              strokeWidth={3}
              dot={false}
              isAnimationActive={false}
            />
          </LineChart>
        </ResponsiveContainer>
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
