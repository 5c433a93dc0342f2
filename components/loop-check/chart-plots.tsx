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

/**
 * The chart library's part of the loop-check charts, loaded on its own after the page (see
 * charts.tsx), so pages that show no chart never load it and pages that do are usable before it.
 */
export function PressurePlot({ data }: { data: NonNullable<Charts["pressure"]> }) {
  const top = Math.ceil(
    Math.max(data.reliefBar, ...data.points.map((p) => p.pressureBar ?? 0)) + 0.5,
  );
  return (
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
        <Tooltip formatter={(v) => [`${v} bar`, "pressure"]} labelFormatter={(l) => `${l} °C`} />
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
  );
}

export function FreezePlot({ data }: { data: NonNullable<Charts["freeze"]> }) {
  return (
    <ResponsiveContainer width="100%" height="100%">
      <LineChart data={data.points} margin={{ top: 10, right: 20, bottom: 20, left: 0 }}>
        <CartesianGrid stroke="#e2e8f0" />
        <XAxis dataKey="percent" type="number" domain={[0, 60]} unit=" %" tick={{ fontSize: 12 }} />
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
  );
}
