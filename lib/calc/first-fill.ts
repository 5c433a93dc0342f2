/**
 * The first-fill record against the design: what the homeowner measured when the loop was first
 * filled (cold fill pressure, the vessel's pre-charge before filling, the hot pressure at a stated
 * temperature, the glycol concentration or the freeze point a refractometer shows, the flow on the
 * meter), compared with the design values of the loop check, each saying whether it matches and
 * what a difference usually means. Pure: no database, no framework.
 *
 * Tolerances are common practice (a gauge's and a refractometer's usual reading error and the
 * trade's usual bands), except where a source is named: the least fill pressure above the
 * pre-charge (EN 12828, from memory, as in lib/calc/expansion.ts) and the final design pressure
 * from the relief setting (EN 12828, from memory).
 */
import { fluidSchema, type SystemDraft } from "@/lib/validation/system";
import { fillPressureBar, finalPressureBar } from "./expansion";
import type { Finding, FindingKey } from "./findings";
import { fluidModel } from "./fluid";
import {
  FREEZE_MARGIN_K,
  runLoopCheck,
  type LoopCheckResult,
  type PressurePoint,
} from "./loop-check";
import { round } from "./units";

/** Tolerances, each common practice unless a source is named. */
export const FIRST_FILL_TOLERANCE = {
  /** Cold fill vs design, bar: a pump-station gauge reads to about ±0.1–0.2 bar (common practice). */
  fillBar: 0.2,
  /**
   * Pre-charge vs the one set in the design, bar: lower by more than 0.2 or higher by more than
   * 0.5 (the same band as the loop check's pre-charge finding; common practice).
   */
  prechargeLowBar: 0.2,
  prechargeHighBar: 0.5,
  /** Hot pressure vs the design curve at the same temperature, bar (common practice). */
  hotBar: 0.3,
  /** Glycol by mass vs the design mix, percentage points: a refractometer reads to about ±2 (common practice). */
  glycolPoints: 3,
  /** Freeze point vs the design mix's, K (common practice). */
  freezeK: 2,
  /** Flow vs the design flow, share: a pump station's flow meter reads to about ±10 % (common practice). */
  flowShare: 0.2,
} as const;

/** What the homeowner measured. Pressures bar gauge at the pump station, °C, % by mass, L/h. */
export interface FirstFillReading {
  coldFillBar: number;
  prechargeBar: number;
  hotBar?: number | null;
  hotTempC?: number | null;
  glycolPercentMass?: number | null;
  freezePointC?: number | null;
  flowLph?: number | null;
}

/** The design values the reading is compared with, read from the loop-check result. */
export interface FirstFillDesign {
  /** Cold fill pressure at the pump station, bar g. */
  fillBar: number | null;
  fillTempC: number | null;
  /** Pre-charge the description sets, and the one the loop check recommends, bar g. */
  prechargeSetBar: number | null;
  prechargeRecommendedBar: number | null;
  reliefBar: number | null;
  /** Pressure at the pump station from cold to hot in the chosen vessel. */
  pressureCurve: PressurePoint[];
  glycolType: "propylene" | "ethylene" | "none" | null;
  glycolPercentMass: number | null;
  /** Freezing point (first crystals) of the design mix, °C. */
  freezeC: number | null;
  /** The collector under a clear night sky at the site's design minimum, °C. */
  coldNightC: number | null;
  flowLph: number | null;
}

export type ComparisonStatus = "matches" | "differs" | "not_compared";

export interface FirstFillComparison {
  key:
    "cold-fill" | "precharge" | "fill-margin" | "hot-pressure" | "glycol" | "freeze-point" | "flow";
  label: string;
  measured: string;
  design: string;
  tolerance: string;
  status: ComparisonStatus;
  /** What the difference usually means, or why nothing was compared. */
  meaning: string;
  source: string;
}

export interface FirstFillResult {
  items: FirstFillComparison[];
  differs: number;
}

const CP = "common practice";

function valueOf(result: LoopCheckResult, key: FindingKey, label: string): number | null {
  const f: Finding | undefined = result.findings.find((x) => x.key === key);
  const v = f?.values.find((x) => x.label === label)?.value;
  return typeof v === "number" && Number.isFinite(v) ? v : null;
}

/**
 * The design values of a description, from its loop check: the fill pressure and the pressure
 * curve from the pressure chart, the pre-charges from the pre-charge finding, the design flow
 * from the flow finding, the mix and the site's minimum from the freeze chart.
 */
export function firstFillDesign(
  system: SystemDraft,
  result: LoopCheckResult = runLoopCheck(system),
): FirstFillDesign {
  const pressure = result.charts.pressure;
  const freeze = result.charts.freeze;
  const fluid = fluidSchema.safeParse(system.fluid);
  const glycolType = fluid.success ? fluid.data.glycolType : null;
  const percent = freeze?.percent ?? (fluid.success ? fluid.data.glycolPercentMass : null);
  return {
    fillBar: pressure ? pressure.fillBar : null,
    fillTempC: pressure?.points[0]?.tempC ?? null,
    prechargeSetBar: valueOf(result, "vessel-precharge", "Pre-charge set"),
    prechargeRecommendedBar: valueOf(result, "vessel-precharge", "Recommended pre-charge"),
    reliefBar: pressure?.reliefBar ?? null,
    pressureCurve: pressure?.points ?? [],
    glycolType,
    glycolPercentMass: percent,
    freezeC:
      glycolType && percent !== null ? round(fluidModel(glycolType, percent).freezeC, 1) : null,
    coldNightC: freeze ? freeze.designMinC - FREEZE_MARGIN_K : null,
    flowLph: valueOf(result, "flow-rate", "Design flow"),
  };
}

/** The design pressure at `tempC` on the curve (straight lines between its points), or null off it. */
export function designPressureAt(curve: readonly PressurePoint[], tempC: number): number | null {
  for (let i = 1; i < curve.length; i++) {
    const a = curve[i - 1]!;
    const b = curve[i]!;
    if (tempC < a.tempC || tempC > b.tempC) continue;
    if (a.pressureBar === null || b.pressureBar === null) return null;
    const t = b.tempC === a.tempC ? 0 : (tempC - a.tempC) / (b.tempC - a.tempC);
    return a.pressureBar + t * (b.pressureBar - a.pressureBar);
  }
  return null;
}

const bar = (n: number) => `${round(n, 2)} bar`;
const degC = (n: number) => `${round(n, 1)} °C`;

function band(
  measured: number,
  design: number,
  low: number,
  high = low,
): { status: ComparisonStatus; dir: "low" | "high" | null } {
  if (measured < design - low - 1e-9) return { status: "differs", dir: "low" };
  if (measured > design + high + 1e-9) return { status: "differs", dir: "high" };
  return { status: "matches", dir: null };
}

/** Compare a first-fill reading with the design, item by item. */
export function compareFirstFill(r: FirstFillReading, d: FirstFillDesign): FirstFillResult {
  const T = FIRST_FILL_TOLERANCE;
  const items: FirstFillComparison[] = [];

  // Cold fill pressure.
  if (d.fillBar === null) {
    items.push({
      key: "cold-fill",
      label: "Cold fill pressure",
      measured: bar(r.coldFillBar),
      design: "—",
      tolerance: `±${T.fillBar} bar (${CP})`,
      status: "not_compared",
      meaning: "The loop check has no fill pressure for this description yet.",
      source: CP,
    });
  } else {
    const b = band(r.coldFillBar, d.fillBar, T.fillBar);
    items.push({
      key: "cold-fill",
      label: "Cold fill pressure",
      measured: bar(r.coldFillBar),
      design: `${bar(d.fillBar)}${d.fillTempC !== null ? ` at ${degC(d.fillTempC)}` : ""}`,
      tolerance: `±${T.fillBar} bar (${CP})`,
      status: b.status,
      meaning:
        b.dir === "low"
          ? "Less fluid is held in the vessel: on a cold night the pressure at the collector top can fall far enough for air to be drawn in and the fluid to boil early. Usually topped up with the filling pump, cold."
          : b.dir === "high"
            ? "Part of the vessel's room for expansion is used before the loop heats up: the hot and stagnation pressures rise and the relief valve may lift. Usually let down at the drain valve, cold."
            : "Matches the design.",
      source: "Design value from the loop check (VDI 6002-1 water seal; EN 12828)",
    });
  }

  // Pre-charge, measured with the vessel empty before filling.
  const p0 = d.prechargeSetBar;
  if (p0 === null) {
    items.push({
      key: "precharge",
      label: "Vessel pre-charge (before filling)",
      measured: bar(r.prechargeBar),
      design: "—",
      tolerance: `−${T.prechargeLowBar} / +${T.prechargeHighBar} bar (${CP})`,
      status: "not_compared",
      meaning: "The description has no vessel pre-charge yet.",
      source: CP,
    });
  } else {
    const b = band(r.prechargeBar, p0, T.prechargeLowBar, T.prechargeHighBar);
    const rec = d.prechargeRecommendedBar;
    items.push({
      key: "precharge",
      label: "Vessel pre-charge (before filling)",
      measured: bar(r.prechargeBar),
      design: `${bar(p0)}${rec !== null && Math.abs(rec - p0) > 1e-9 ? ` (recommended ${bar(rec)})` : ""}`,
      tolerance: `−${T.prechargeLowBar} / +${T.prechargeHighBar} bar (${CP})`,
      status: b.status,
      meaning:
        b.dir === "low"
          ? "The vessel gives back its fluid too soon as the loop cools, so the collector top loses pressure on cold nights; a pre-charge that has dropped since delivery can also mean a leaking gas valve or diaphragm. Usually set with a tyre pump at the gas valve, vessel empty of fluid."
          : b.dir === "high"
            ? "The vessel takes less of the expansion than planned, so the loop runs at higher pressure when hot. Usually let down at the gas valve, vessel empty of fluid."
            : "Matches the design.",
      source: "Recommended pre-charge: VDI 6002-1 (from memory), as in the loop check",
    });
  }

  // Cold fill at least pre-charge + 0.3 bar (EN 12828, from memory), both as measured.
  const least = fillPressureBar(r.prechargeBar);
  const marginOk = r.coldFillBar >= least - 1e-9;
  items.push({
    key: "fill-margin",
    label: "Fill pressure above the pre-charge",
    measured: `${bar(r.coldFillBar - r.prechargeBar)} above`,
    design: "at least 0.3 bar above",
    tolerance: "none",
    status: marginOk ? "matches" : "differs",
    meaning: marginOk
      ? "The vessel holds fluid when cold (its water seal)."
      : "Hardly any fluid is in the vessel when cold: as the loop cools the pressure drops quickly and air can get in. Usually the fill pressure is raised (or the pre-charge lowered, vessel empty) so the fill is at least 0.3 bar above the pre-charge.",
    source: "EN 12828, fill at least pre-charge + 0.3 bar (from memory)",
  });

  // Hot pressure at a stated temperature, against the design curve at that temperature.
  if (
    r.hotBar !== null &&
    r.hotBar !== undefined &&
    r.hotTempC !== null &&
    r.hotTempC !== undefined
  ) {
    const curve = d.pressureCurve;
    const expected = designPressureAt(curve, r.hotTempC);
    const first = curve[0];
    const last = curve.at(-1);
    const tol = `±${T.hotBar} bar (${CP})`;
    if (expected === null) {
      items.push({
        key: "hot-pressure",
        label: `Hot pressure at ${degC(r.hotTempC)}`,
        measured: bar(r.hotBar),
        design: "—",
        tolerance: tol,
        status: "not_compared",
        meaning:
          first && last
            ? `The design curve runs from ${degC(first.tempC)} to ${degC(last.tempC)}; read the hot pressure with the collector between those temperatures.`
            : "The loop check has no pressure curve for this description yet.",
        source: CP,
      });
    } else {
      const b = band(r.hotBar, expected, T.hotBar);
      const pe = d.reliefBar !== null ? finalPressureBar(d.reliefBar) : null;
      const nearRelief = pe !== null && r.hotBar >= pe;
      items.push({
        key: "hot-pressure",
        label: `Hot pressure at ${degC(r.hotTempC)}`,
        measured: bar(r.hotBar),
        design: bar(expected),
        tolerance: tol,
        status: nearRelief ? "differs" : b.status,
        meaning: nearRelief
          ? `At or above the ${bar(pe!)} the loop should stay below (the ${bar(d.reliefBar!)} relief setting less its margin): the relief valve may lift at stagnation. Usually a vessel too small, waterlogged (diaphragm failed) or isolated by a closed service valve, or a fill too high; have it checked before the next sunny day.`
          : b.dir === "high"
            ? "The pressure rises more than the design expects: usually the vessel is taking less than planned (pre-charge too high, a closed service valve, a failed diaphragm) or the loop was filled above the design pressure."
            : b.dir === "low"
              ? "The pressure rises less than the design expects: usually air still in the loop (purge again at the air separator), a slow leak, or the loop filled below the design pressure."
              : "Matches the design.",
        source: "Design curve from the loop check (Boyle's law on the vessel's gas side)",
      });
    }
  }

  // Glycol concentration by refractometer.
  const kind = d.glycolType;
  if (r.glycolPercentMass !== null && r.glycolPercentMass !== undefined) {
    if (d.glycolPercentMass === null || !kind) {
      items.push({
        key: "glycol",
        label: "Glycol concentration",
        measured: `${round(r.glycolPercentMass, 1)} %`,
        design: "—",
        tolerance: `±${T.glycolPoints} points (${CP})`,
        status: "not_compared",
        meaning: "The description has no fluid yet.",
        source: CP,
      });
    } else {
      const b = band(r.glycolPercentMass, d.glycolPercentMass, T.glycolPoints);
      const measuredFreeze = kind === "none" ? null : fluidModel(kind, r.glycolPercentMass).freezeC;
      const unprotected =
        measuredFreeze !== null && d.coldNightC !== null && measuredFreeze > d.coldNightC;
      items.push({
        key: "glycol",
        label: "Glycol concentration",
        measured: `${round(r.glycolPercentMass, 1)} % by mass${measuredFreeze !== null ? ` (freezes at ${degC(measuredFreeze)})` : ""}`,
        design: `${round(d.glycolPercentMass, 1)} % by mass`,
        tolerance: `±${T.glycolPoints} points (${CP})`,
        status: unprotected ? "differs" : b.status,
        meaning: unprotected
          ? `This mix starts to freeze above the ${degC(d.coldNightC!)} a clear night can bring at the collector: usually the loop was diluted by water left from the pressure test. Drain some and top up with concentrate until the reading is right.`
          : b.dir === "low"
            ? "Weaker than the design: less frost protection and more dilute corrosion inhibitors; usually water left in the loop from flushing or the pressure test."
            : b.dir === "high"
              ? "Stronger than the design: thicker fluid that carries heat less well and works the pump harder; usually concentrate added without the premix water."
              : "Matches the design.",
        source: "Freezing point: Melinder (2010), as in the loop check",
      });
    }
  }

  // The freeze point the refractometer shows.
  if (r.freezePointC !== null && r.freezePointC !== undefined) {
    if (d.freezeC === null) {
      items.push({
        key: "freeze-point",
        label: "Freeze point",
        measured: degC(r.freezePointC),
        design: "—",
        tolerance: `±${T.freezeK} K (${CP})`,
        status: "not_compared",
        meaning: "The description has no fluid yet.",
        source: CP,
      });
    } else {
      const b = band(r.freezePointC, d.freezeC, T.freezeK);
      const unprotected = d.coldNightC !== null && r.freezePointC > d.coldNightC;
      items.push({
        key: "freeze-point",
        label: "Freeze point",
        measured: degC(r.freezePointC),
        design: degC(d.freezeC),
        tolerance: `±${T.freezeK} K (${CP})`,
        status: unprotected ? "differs" : b.status,
        meaning: unprotected
          ? `Above the ${degC(d.coldNightC!)} a clear night can bring at the collector: the fluid can turn to slush there. Usually the loop was diluted by water left from the pressure test; drain some and top up with concentrate.`
          : b.dir === "high"
            ? "The mix freezes at a higher temperature than designed: it is weaker than planned, usually diluted by water left in the loop."
            : b.dir === "low"
              ? "The mix freezes lower than designed: it is stronger than planned, thicker, and carries heat less well."
              : "Matches the design.",
        source: "Freezing point: Melinder (2010), as in the loop check",
      });
    }
  }

  // Flow on the meter.
  if (r.flowLph !== null && r.flowLph !== undefined) {
    const tol = `±${Math.round(T.flowShare * 100)} % (${CP})`;
    if (d.flowLph === null) {
      items.push({
        key: "flow",
        label: "Flow rate",
        measured: `${round(r.flowLph, 0)} L/h`,
        design: "—",
        tolerance: tol,
        status: "not_compared",
        meaning: "The loop check has no design flow for this description yet.",
        source: CP,
      });
    } else {
      const b = band(r.flowLph, d.flowLph, d.flowLph * T.flowShare);
      items.push({
        key: "flow",
        label: "Flow rate",
        measured: `${round(r.flowLph, 0)} L/h`,
        design: `${round(d.flowLph, 0)} L/h`,
        tolerance: tol,
        status: b.status,
        meaning:
          b.dir === "low"
            ? "The collector runs hotter than designed and loses more heat; a flow well below the setting usually means air in the loop, a pump speed set too low or a partly closed valve."
            : b.dir === "high"
              ? "A small temperature difference across the collector, more pump power and noise; usually the pump speed is set higher than needed — turn it down until the meter shows the design flow."
              : "Matches the design.",
        source:
          "Design flow from the loop check (Kalogirou 2009 low-flow band; high-flow common practice)",
      });
    }
  }

  return { items, differs: items.filter((i) => i.status === "differs").length };
}
