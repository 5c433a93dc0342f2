/**
 * The loop check: from a (possibly incomplete) system description to findings.
 * Each section of the description is validated on its own, so a half-filled draft still gets
 * every finding its complete sections allow, and a finding naming what is missing for the rest.
 * No exception, NaN or Infinity leaves this module: see `sanitise` at the end.
 */
import type { z } from "zod";
import {
  collectorArraySchema,
  cylinderSchema,
  designSchema,
  expansionVesselSchema,
  fluidSchema,
  pipeRunSchema,
  pumpStationSchema,
  safetySchema,
  siteSchema,
  type SystemDraft,
} from "@/lib/validation/system";
import { copperInnerDiameterMm, litresPerMetre, ROUGHNESS_M } from "./tubes";
import { glycolDensity, glycolFreezingPoint, glycolViscosity } from "./glycol";
import { waterDensity, waterViscosity } from "./water-if97";
import {
  fillPressureBar,
  finalPressureBar,
  nextStandardVesselL,
  recommendedPrechargeBar,
  requiredVesselVolumeL,
  thermalExpansion,
  vesselPressureBar,
  waterSealL,
} from "./expansion";
import {
  FITTING_EQUIVALENT_DIAMETERS,
  pipePressureDrop,
  pressureToHeadM,
  type PipeFlowResult,
} from "./hydraulics";
import {
  collectorOutputW,
  DEFAULT_COEFFICIENTS,
  REFERENCE_IRRADIANCE,
  stagnationTemperatureC,
  type EfficiencyCoefficients,
} from "./collector";
import { type Finding, type FindingKey, type Level, isFiniteFinding, worstLevel } from "./findings";
import { cToK, lphToM3s, round } from "./units";

type Parsed<S extends z.ZodType> = z.output<S>;

/** Design flow per m² of aperture, L/(m²·h): low-flow 12–24 (Kalogirou 2009); high-flow 30–50 (common practice). */
export const SPECIFIC_FLOW = {
  lowMin: 12,
  lowMax: 24,
  highMin: 30,
  highMax: 50,
  design: 30,
} as const;
/** Velocity band for copper solar loops, m/s (common practice). */
export const VELOCITY_BAND = { min: 0.3, max: 1.0, hardMax: 1.5 } as const;
/** Temperature at the vessel when it hangs on an uninsulated cooling leg, °C (common practice). */
export const COOLING_LEG_TEMP_C = 70;
/** Highest return-leg temperature the circulator sees, °C (common practice). */
export const RETURN_LEG_TEMP_C = 110;
/** Mean fluid temperature for pressure-drop estimates, °C (common practice). */
export const HYDRAULIC_TEMP_C = 40;
/** Freeze margin below the design minimum, K (common practice). */
export const FREEZE_MARGIN_K = 3;
/** Spare fluid for flushing and topping up, fraction of the loop volume (common practice). */
export const FLUID_MARGIN = 0.1;

export interface PressurePoint {
  tempC: number;
  pressureBar: number | null;
}
export interface FreezePoint {
  percent: number;
  freezeC: number;
}

export interface LoopCheckResult {
  findings: Finding[];
  worst: Level;
  counts: Record<Level, number>;
  /** Figures the charts draw; absent where the inputs are incomplete. */
  charts: {
    pressure?: {
      points: PressurePoint[];
      reliefBar: number;
      stagnation: PressurePoint;
      fillBar: number;
    };
    freeze?: { points: FreezePoint[]; designMinC: number; percent: number };
  };
}

interface Sections {
  site?: Parsed<typeof siteSchema>;
  collectors?: Parsed<typeof collectorArraySchema>;
  pipeRuns?: Parsed<typeof pipeRunSchema>[];
  pumpStation?: Parsed<typeof pumpStationSchema>;
  expansionVessel?: Parsed<typeof expansionVesselSchema>;
  fluid?: Parsed<typeof fluidSchema>;
  cylinder?: Parsed<typeof cylinderSchema>;
  safety?: Parsed<typeof safetySchema>;
  design: Parsed<typeof designSchema>;
}

const SECTION_NAMES: Record<string, string> = {
  site: "Site",
  collectors: "Collector array",
  pipeRuns: "Pipe runs",
  pumpStation: "Pump station",
  expansionVessel: "Expansion vessel",
  fluid: "Heat-transfer fluid",
  cylinder: "Cylinder and coils",
  safety: "Fittings and safety devices",
  design: "Design temperatures",
};

function parseSections(draft: SystemDraft, findings: Finding[]): Sections {
  const out: Sections = { design: { fillTempC: 15, maxLiquidTempC: 120 } };
  const take = <S extends z.ZodType>(
    name: keyof typeof SECTION_NAMES,
    schema: S,
    value: unknown,
  ) => {
    if (value === undefined || value === null) {
      findings.push(missing(name, "not filled in yet"));
      return undefined;
    }
    const r = schema.safeParse(value);
    if (r.success) return r.data as Parsed<S>;
    const first = r.error.issues[0];
    const where = first && first.path.length ? `${first.path.join(".")}: ` : "";
    findings.push(missing(name, `${where}${first?.message ?? "invalid"}`));
    return undefined;
  };
  out.site = take("site", siteSchema, draft.site);
  out.collectors = take("collectors", collectorArraySchema, draft.collectors);
  if (Array.isArray(draft.pipeRuns) && draft.pipeRuns.length > 0) {
    const runs: Parsed<typeof pipeRunSchema>[] = [];
    draft.pipeRuns.forEach((run, i) => {
      const r = pipeRunSchema.safeParse(run);
      if (r.success) runs.push(r.data);
      else
        findings.push(
          missing("pipeRuns", `run ${i + 1}: ${r.error.issues[0]?.message ?? "invalid"}`),
        );
    });
    if (runs.length === draft.pipeRuns.length) out.pipeRuns = runs;
  } else {
    findings.push(missing("pipeRuns", "add at least one pipe run"));
  }
  out.pumpStation = take("pumpStation", pumpStationSchema, draft.pumpStation);
  out.expansionVessel = take("expansionVessel", expansionVesselSchema, draft.expansionVessel);
  out.fluid = take("fluid", fluidSchema, draft.fluid);
  out.cylinder = take("cylinder", cylinderSchema, draft.cylinder);
  out.safety = take("safety", safetySchema, draft.safety);
  if (draft.design !== undefined) {
    const d = designSchema.safeParse(draft.design);
    if (d.success) out.design = d.data;
    else findings.push(missing("design", d.error.issues[0]?.message ?? "invalid"));
  }
  return out;
}

function missing(section: string, detail: string): Finding {
  return {
    key: "input",
    level: "note",
    title: `${SECTION_NAMES[section] ?? section}: ${detail}`,
    values: [],
    source: "Loopwright input checks",
    action:
      "Complete this part of the description; the checks that need it are skipped until then.",
  };
}

function skipped(key: FindingKey, what: string, needs: string[]): Finding {
  return {
    key,
    level: "note",
    title: `${what} not checked yet`,
    values: [],
    source: "Loopwright input checks",
    action: `Needs: ${needs.map((n) => SECTION_NAMES[n] ?? n).join(", ")}.`,
  };
}

/** Inner diameter (mm) and content (L/m) of a pipe run. */
function runGeometry(run: Parsed<typeof pipeRunSchema>): { boreMm: number; lPerM: number } | null {
  if (run.material === "copper" && run.copperSize) {
    const bore = copperInnerDiameterMm(run.copperSize);
    return { boreMm: bore, lPerM: litresPerMetre(bore) };
  }
  if (run.material === "stainless_flex") {
    const bore = run.flexBoreMm ?? 16;
    return { boreMm: bore, lPerM: run.flexContentLPerM ?? litresPerMetre(bore) };
  }
  return null;
}

function coefficientsOf(c: Parsed<typeof collectorArraySchema>): {
  coeffs: EfficiencyCoefficients;
  defaulted: boolean;
} {
  const d = DEFAULT_COEFFICIENTS[c.type];
  const defaulted = c.eta0 === undefined || c.a1 === undefined || c.a2 === undefined;
  return { coeffs: { eta0: c.eta0 ?? d.eta0, a1: c.a1 ?? d.a1, a2: c.a2 ?? d.a2 }, defaulted };
}

/** Run the loop check on a system description (complete or draft). */
export function runLoopCheck(draft: SystemDraft | null | undefined): LoopCheckResult {
  const findings: Finding[] = [];
  const s = parseSections(draft ?? {}, findings);
  const charts: LoopCheckResult["charts"] = {};
  const { fillTempC, maxLiquidTempC } = s.design;

  // --- Stagnation and the hot zone -------------------------------------------------------
  let stagnationC: number | undefined;
  if (s.collectors) {
    const { coeffs, defaulted } = coefficientsOf(s.collectors);
    stagnationC = stagnationTemperatureC(coeffs);
    const apertureM2 = s.collectors.count * s.collectors.apertureAreaM2Each;
    const outputW = collectorOutputW(coeffs, apertureM2, 50, 20, REFERENCE_IRRADIANCE);
    findings.push({
      key: "collector-output",
      level: defaulted ? "note" : "ok",
      title: `About ${round(outputW / 1000, 1)} kW in full sun from ${round(apertureM2, 2)} m² of aperture`,
      values: [
        { label: "Aperture area", value: round(apertureM2, 2), unit: "m²" },
        { label: "Output at 1000 W/m², T_m − T_a = 30 K", value: round(outputW), unit: "W" },
        { label: "η₀ / a₁ / a₂", value: `${coeffs.eta0} / ${coeffs.a1} / ${coeffs.a2}` },
      ],
      source: "EN ISO 9806 efficiency curve; 1000 W/m² reference irradiance (common practice)",
      action: defaulted
        ? "Typical coefficients were used: enter η₀, a₁ and a₂ from the collector's EN ISO 9806 test report for a firmer figure."
        : "No action.",
    });
    const { tiltDeg, azimuthDeg } = s.collectors;
    const offSouth = Math.abs(azimuthDeg);
    const orientationPoor = tiltDeg < 15 || tiltDeg > 70 || offSouth > 60;
    const orientationMeh = !orientationPoor && (tiltDeg < 25 || tiltDeg > 60 || offSouth > 30);
    findings.push({
      key: "collector-output",
      level: orientationPoor || orientationMeh ? "note" : "ok",
      title: orientationPoor
        ? "Orientation loses a large share of the yield"
        : orientationMeh
          ? "Orientation loses some yield"
          : "Orientation is in the usual good range",
      values: [
        { label: "Tilt", value: tiltDeg, unit: "°" },
        { label: "Azimuth from south", value: azimuthDeg, unit: "°" },
      ],
      source: "Common practice: tilt 25–60°, within 30° of south for year-round hot water",
      action: orientationPoor
        ? "Expect noticeably less yield; check shading and whether another roof face is better."
        : "Note any shading from chimneys, trees or dormers.",
    });

    const hotZone: { level: Level; title: string; action: string }[] = [];
    if (s.safety?.jointsAtCollector === "soft_soldered") {
      hotZone.push({
        level: "fix",
        title: "Soft-soldered joints at the collector",
        action:
          "Use compression, press (high-temperature seals) or brazed joints at the collector and near it.",
      });
    }
    if (s.safety?.insulationMaxTempC !== undefined && s.safety.insulationMaxTempC < stagnationC) {
      hotZone.push({
        level: "fix",
        title: `Pipe insulation rated ${s.safety.insulationMaxTempC} °C, below stagnation`,
        action:
          "Use insulation rated above the stagnation temperature (and UV-resistant outdoors) on the collector pipes.",
      });
    }
    const vent = s.collectors.highPointVent;
    if (vent === "automatic") {
      hotZone.push({
        level: "fix",
        title: "Automatic vent at the high point with no isolation",
        action:
          "Fit a manual vent, or an automatic one with an isolating valve closed after commissioning, so steam cannot escape.",
      });
    } else if (vent === "automatic_isolatable") {
      const rating = s.collectors.ventMaxTempC;
      if (rating === undefined || rating < stagnationC) {
        hotZone.push({
          level: "note",
          title: `Automatic vent rated ${rating ?? "unknown"} °C near the collector`,
          action:
            "Keep its isolating valve closed after commissioning; a vent rated near 150 °C is marginal at the high point.",
        });
      }
    }
    findings.push({
      key: "stagnation",
      level: worstLevel(hotZone),
      title:
        `Stagnation about ${round(stagnationC, 0)} °C at the collector` +
        (hotZone.length ? `; ${hotZone.map((h) => h.title.toLowerCase()).join("; ")}` : ""),
      values: [
        {
          label: "Stagnation temperature (G = 1000 W/m², T_a = 30 °C)",
          value: round(stagnationC, 0),
          unit: "°C",
        },
        {
          label: "Joints at the collector",
          value: s.safety?.jointsAtCollector.replace("_", " ") ?? "not given",
        },
      ],
      source:
        "EN ISO 9806 efficiency curve solved for η = 0 (standard stagnation conditions, from memory)",
      action: hotZone.length
        ? hotZone.map((h) => h.action).join(" ")
        : "Everything within a metre or two of the collector must take this temperature. Fill and work with the collector covered or early in the morning.",
    });
  } else {
    findings.push(skipped("stagnation", "Stagnation temperature", ["collectors"]));
  }

  // --- Volume --------------------------------------------------------------------------
  let loopVolumeL: number | undefined;
  let steamVolumeL: number | undefined;
  const runGeoms = s.pipeRuns?.map((r) => ({ run: r, geom: runGeometry(r) }));
  if (s.collectors && runGeoms && s.cylinder && s.pumpStation) {
    const pipesL = runGeoms.reduce(
      (sum, { run, geom }) => sum + (geom ? geom.lPerM * run.lengthM : 0),
      0,
    );
    const steamPipesL = runGeoms.reduce(
      (sum, { run, geom }) => sum + (geom && run.inSteamReach ? geom.lPerM * run.lengthM : 0),
      0,
    );
    const collectorsL = s.collectors.count * s.collectors.fluidContentLEach;
    const coilL = s.cylinder.coils
      .filter((c) => c.heatSource === "solar")
      .reduce((sum, c) => sum + c.contentL, 0);
    loopVolumeL = pipesL + collectorsL + coilL + s.pumpStation.stationContentL;
    steamVolumeL = collectorsL + steamPipesL;
    const sealL = waterSealL(loopVolumeL);
    const totalL = loopVolumeL + sealL;
    findings.push({
      key: "fluid-volume",
      level: "ok",
      title: `The loop holds about ${round(totalL, 1)} L; have ${Math.ceil(totalL * (1 + FLUID_MARGIN))} L of fluid ready`,
      values: [
        { label: "Pipe runs", value: round(pipesL, 2), unit: "L" },
        { label: "Collectors", value: round(collectorsL, 2), unit: "L" },
        { label: "Solar coil", value: round(coilL, 2), unit: "L" },
        { label: "Pump station", value: round(s.pumpStation.stationContentL, 2), unit: "L" },
        { label: "Vessel water seal", value: round(sealL, 2), unit: "L" },
        { label: "Total", value: round(totalL, 2), unit: "L" },
      ],
      source:
        "EN 1057 tube bores; makers' content figures as entered; water seal per VDI 6002-1 (from memory)",
      action: `Order the loop volume plus about ${FLUID_MARGIN * 100} % for flushing and topping up (common practice).`,
    });
  } else {
    findings.push(
      skipped("fluid-volume", "Fluid volume", [
        "collectors",
        "pipeRuns",
        "cylinder",
        "pumpStation",
      ]),
    );
  }

  // --- Pressures and the vessel ----------------------------------------------------------
  if (
    s.pumpStation &&
    s.expansionVessel &&
    s.fluid &&
    loopVolumeL !== undefined &&
    steamVolumeL !== undefined
  ) {
    const ps = s.pumpStation;
    const ev = s.expansionVessel;
    const p0 = recommendedPrechargeBar(ps.staticHeightM);
    const pa = fillPressureBar(p0);
    const pe = finalPressureBar(ps.reliefValveBar);
    const glycol = s.fluid.glycolType === "none" ? 0 : s.fluid.glycolPercentMass;
    const exp = thermalExpansion(
      loopVolumeL,
      glycol,
      fillTempC,
      maxLiquidTempC,
      (pe + 1.01325) / 10,
    );
    const sealL = waterSealL(loopVolumeL);
    const required = requiredVesselVolumeL({
      expansionL: exp.expansionL,
      waterSealL: sealL,
      steamVolumeL,
      prechargeBar: p0,
      finalPressureBar: pe,
    });

    if (!Number.isFinite(required)) {
      findings.push({
        key: "vessel-size",
        level: "stop",
        title: "The relief valve is set too low for this static height: no vessel can work",
        values: [
          { label: "Pre-charge needed", value: round(p0, 2), unit: "bar" },
          { label: "Final pressure from relief setting", value: round(pe, 2), unit: "bar" },
        ],
        source: "EN 12828 Annex D; VDI 6002-1 (from memory)",
        action:
          "A higher relief setting (with every component rated for it) or a lower static height is needed; ask a reviewer.",
      });
    } else {
      const standard = nextStandardVesselL(required);
      const enough = ev.nominalVolumeL >= required;
      findings.push({
        key: "vessel-size",
        level: enough ? "ok" : "fix",
        title: enough
          ? `Vessel of ${ev.nominalVolumeL} L covers the ${round(required, 1)} L needed, steam included`
          : `Vessel of ${ev.nominalVolumeL} L is too small: ${round(required, 1)} L needed, steam included`,
        values: [
          {
            label: "Expansion to " + maxLiquidTempC + " °C",
            value: round(exp.expansionL, 2),
            unit: "L",
          },
          { label: "Expansion coefficient", value: round(exp.coefficient * 100, 2), unit: "%" },
          { label: "Water seal", value: round(sealL, 2), unit: "L" },
          { label: "Steam volume at stagnation", value: round(steamVolumeL, 2), unit: "L" },
          { label: "Required nominal volume", value: round(required, 1), unit: "L" },
          { label: "Next standard size", value: standard ?? "over 80", unit: "L" },
          { label: "Chosen vessel", value: ev.nominalVolumeL, unit: "L" },
        ],
        source: `EN 12828 Annex D with VDI 6002-1 steam volume (from memory); density: ${exp.basis}`,
        action: enough
          ? "No action."
          : standard
            ? `Fit a ${standard} L solar expansion vessel (or larger).`
            : "Above 80 L: two vessels, or a larger one; ask a reviewer to confirm.",
      });
    }

    const prechargeOff = ev.prechargeBar - p0;
    findings.push({
      key: "vessel-precharge",
      level: Math.abs(prechargeOff) <= 0.2 ? "ok" : Math.abs(prechargeOff) <= 0.5 ? "note" : "fix",
      title:
        Math.abs(prechargeOff) <= 0.2
          ? `Pre-charge ${ev.prechargeBar} bar matches the ${round(p0, 2)} bar needed`
          : `Set the pre-charge to ${round(p0, 2)} bar (now ${ev.prechargeBar} bar)`,
      values: [
        { label: "Static height", value: ps.staticHeightM, unit: "m" },
        { label: "Recommended pre-charge", value: round(p0, 2), unit: "bar" },
        { label: "Set pre-charge", value: ev.prechargeBar, unit: "bar" },
      ],
      source:
        "VDI 6002-1: 0.1 bar per metre of static height + 0.4 bar, at least 1.2 bar (from memory)",
      action:
        "Set the pre-charge with the vessel empty of fluid, before filling, with a tyre gauge at the gas valve.",
    });

    findings.push({
      key: "fill-pressure",
      level: "ok",
      title: `Fill to ${round(pa, 2)} bar cold`,
      values: [
        { label: "Cold fill pressure", value: round(pa, 2), unit: "bar" },
        { label: "Fill temperature", value: fillTempC, unit: "°C" },
      ],
      source: "EN 12828: fill pressure = pre-charge + 0.3 bar (from memory)",
      action:
        "Fill with the collector covered, through the fill point with a filling pump, and read the gauge cold.",
    });

    // Loop pressure from cold to hot in the chosen vessel, and at stagnation with steam.
    const userFill = fillPressureBar(ev.prechargeBar);
    const points: PressurePoint[] = [];
    const steps = 12;
    for (let k = 0; k <= steps; k++) {
      const t = fillTempC + ((maxLiquidTempC - fillTempC) * k) / steps;
      const e = thermalExpansion(loopVolumeL, glycol, fillTempC, t, (pe + 1.01325) / 10).expansionL;
      const p = vesselPressureBar(ev.nominalVolumeL, ev.prechargeBar, userFill, e);
      points.push({
        tempC: round(t, 1),
        pressureBar: Number.isFinite(p) ? round(Math.min(p, ps.reliefValveBar * 1.5), 2) : null,
      });
    }
    const hotP = vesselPressureBar(
      ev.nominalVolumeL,
      ev.prechargeBar,
      userFill,
      exp.expansionL + steamVolumeL,
    );
    const stagnationPoint: PressurePoint = {
      tempC: round(stagnationC ?? maxLiquidTempC, 0),
      pressureBar: Number.isFinite(hotP) ? round(Math.min(hotP, ps.reliefValveBar * 1.5), 2) : null,
    };
    charts.pressure = {
      points,
      reliefBar: ps.reliefValveBar,
      stagnation: stagnationPoint,
      fillBar: round(userFill, 2),
    };

    const components = [
      { name: "expansion vessel", bar: ev.maxPressureBar },
      ...(ps.lowestComponentMaxBar !== undefined
        ? [{ name: "lowest-rated component", bar: ps.lowestComponentMaxBar }]
        : []),
    ];
    const under = components.filter((c) => c.bar < ps.reliefValveBar);
    const opensAtStagnation = !Number.isFinite(hotP) || hotP >= ps.reliefValveBar;
    findings.push({
      key: "relief-margin",
      level: under.length ? "stop" : opensAtStagnation ? "fix" : hotP > pe ? "note" : "ok",
      title: under.length
        ? `Relief valve at ${ps.reliefValveBar} bar is above the ${under.map((u) => u.name).join(" and ")} rating`
        : opensAtStagnation
          ? "At stagnation the loop would reach the relief setting and discharge fluid"
          : `At stagnation the loop reaches about ${round(hotP, 1)} bar, under the ${ps.reliefValveBar} bar relief setting`,
      values: [
        { label: "Relief setting", value: ps.reliefValveBar, unit: "bar" },
        { label: "Final working pressure", value: round(pe, 2), unit: "bar" },
        {
          label: "Pressure at stagnation (chosen vessel)",
          value: Number.isFinite(hotP) ? round(hotP, 2) : "vessel full",
        },
        ...components.map((c) => ({ label: `Max pressure, ${c.name}`, value: c.bar, unit: "bar" })),
      ],
      source: "EN 12977-1; EN 12828 (relief principle); Boyle's law on the vessel's gas side",
      action: under.length
        ? "Every component must be rated at or above the relief setting: replace the under-rated parts or use a lower-set valve with a re-sized vessel."
        : opensAtStagnation
          ? "Use a larger vessel (see the vessel-size finding) so steam at stagnation is taken without discharge."
          : "No action. Pipe the relief discharge to a container that can take hot glycol.",
    });

    const seenAtVessel = ev.onCoolingLeg ? COOLING_LEG_TEMP_C : maxLiquidTempC;
    const vesselProblems: string[] = [];
    if (ev.diaphragmMaxTempC < seenAtVessel)
      vesselProblems.push("diaphragm rated below the temperature it will see");
    if (!ev.onCoolingLeg) vesselProblems.push("not on a cooling leg");
    findings.push({
      key: "vessel-rating",
      level: ev.diaphragmMaxTempC < seenAtVessel ? "fix" : ev.onCoolingLeg ? "ok" : "note",
      title: vesselProblems.length
        ? `Expansion vessel: ${vesselProblems.join("; ")}`
        : `Expansion vessel rated ${ev.diaphragmMaxTempC} °C on a cooling leg`,
      values: [
        { label: "Diaphragm rating", value: ev.diaphragmMaxTempC, unit: "°C" },
        { label: "Temperature it may see", value: seenAtVessel, unit: "°C" },
        { label: "On a cooling leg", value: ev.onCoolingLeg ? "yes" : "no" },
      ],
      source:
        "EN 13831 scope (ordinary heating vessels ≈ 70 °C at the diaphragm, from memory); common practice",
      action: vesselProblems.length
        ? "Use a vessel made for solar loops and hang it below its connection on an uninsulated leg, or add an intermediate cooling vessel."
        : "No action.",
    });
  } else {
    const needs = ["pumpStation", "expansionVessel", "fluid", "collectors", "pipeRuns", "cylinder"];
    findings.push(skipped("vessel-size", "Expansion vessel size and pressures", needs));
  }

  // --- Freeze --------------------------------------------------------------------------
  if (s.fluid && s.site) {
    const min = s.site.designMinTempC;
    const points: FreezePoint[] = [];
    for (let p = 0; p <= 60; p += 5)
      points.push({ percent: p, freezeC: round(glycolFreezingPoint(p), 1) });
    charts.freeze = { points, designMinC: min, percent: s.fluid.glycolPercentMass };
    if (s.fluid.glycolType === "none") {
      findings.push({
        key: "freeze",
        level: min < 0 ? "stop" : "fix",
        title: min < 0 ? "Plain water in a loop that will see frost" : "Plain water in the loop",
        values: [{ label: "Design minimum", value: min, unit: "°C" }],
        source: "Common practice",
        action:
          "Use an inhibited propylene glycol solar fluid mixed to protect below the site's minimum.",
      });
    } else if (s.fluid.glycolType === "ethylene") {
      findings.push({
        key: "freeze",
        level: "fix",
        title: "Ethylene glycol in a loop beside drinking water",
        values: [{ label: "Glycol", value: s.fluid.glycolPercentMass, unit: "% by mass" }],
        source: "Common practice",
        action:
          "Use inhibited propylene glycol made for solar loops: ethylene glycol is toxic and automotive mixes are not rated for stagnation.",
      });
    } else {
      const fp = glycolFreezingPoint(s.fluid.glycolPercentMass);
      const margin = min - fp;
      const level: Level = margin >= FREEZE_MARGIN_K ? "ok" : margin >= 0 ? "note" : "fix";
      findings.push({
        key: "freeze",
        level,
        title:
          level === "fix"
            ? `${s.fluid.glycolPercentMass} % glycol starts to freeze at ${round(fp, 1)} °C, above the site's ${min} °C`
            : `${s.fluid.glycolPercentMass} % glycol starts to freeze at ${round(fp, 1)} °C (site minimum ${min} °C)`,
        values: [
          { label: "Glycol", value: s.fluid.glycolPercentMass, unit: "% by mass" },
          { label: "Freezing point (first crystals)", value: round(fp, 1), unit: "°C" },
          { label: "Design minimum", value: min, unit: "°C" },
          { label: "Margin", value: round(margin, 1), unit: "K" },
        ],
        source:
          "Melinder (2010) propylene glycol polynomials; freezing point is first crystals, not burst protection",
        action:
          level === "ok"
            ? s.fluid.glycolPercentMass > 50
              ? "Protection is ample; above 50 % the fluid gets viscous and carries heat less well."
              : "No action. Test the mix with a refractometer after filling."
            : `Raise the glycol content so the freezing point is at least ${FREEZE_MARGIN_K} K below the site's minimum.`,
      });
    }
    if (!s.fluid.solarRated && s.fluid.glycolType !== "none") {
      findings.push({
        key: "freeze",
        level: "fix",
        title: "The fluid is not rated for solar stagnation",
        values: [],
        source: "Common practice",
        action:
          "Use a solar heat-transfer fluid; ordinary antifreeze breaks down and turns acidic at stagnation temperatures.",
      });
    }
  } else {
    findings.push(skipped("freeze", "Freeze protection", ["fluid", "site"]));
  }

  // --- Flow and hydraulics ---------------------------------------------------------------
  if (s.collectors && s.pumpStation && runGeoms && s.fluid) {
    const apertureM2 = s.collectors.count * s.collectors.apertureAreaM2Each;
    const designLph = SPECIFIC_FLOW.design * apertureM2;
    const minLph = SPECIFIC_FLOW.lowMin * apertureM2;
    const maxLph = SPECIFIC_FLOW.highMax * apertureM2;
    const ps = s.pumpStation;
    const covers = ps.flowMeterMinLph <= designLph && ps.flowMeterMaxLph >= designLph;
    findings.push({
      key: "flow-rate",
      level: covers ? "ok" : "fix",
      title: covers
        ? `Set about ${round(designLph, 0)} L/h; the flow meter (${ps.flowMeterMinLph}–${ps.flowMeterMaxLph} L/h) covers it`
        : `The flow meter (${ps.flowMeterMinLph}–${ps.flowMeterMaxLph} L/h) cannot show the ${round(designLph, 0)} L/h needed`,
      values: [
        { label: "Aperture area", value: round(apertureM2, 2), unit: "m²" },
        { label: "Design flow (30 L/(m²·h))", value: round(designLph, 0), unit: "L/h" },
        { label: "Sensible range", value: `${round(minLph, 0)}–${round(maxLph, 0)}`, unit: "L/h" },
      ],
      source:
        "Specific flow: low-flow 12–24 L/(m²·h) (Kalogirou 2009); high-flow 30–50 (common practice)",
      action: covers ? "No action." : "Fit a flow meter whose range includes the design flow.",
    });

    const glycol = s.fluid.glycolType === "none" ? 0 : s.fluid.glycolPercentMass;
    const rho =
      glycol > 0
        ? glycolDensity(glycol, HYDRAULIC_TEMP_C)
        : waterDensity(cToK(HYDRAULIC_TEMP_C), 0.3);
    const mu =
      glycol > 0
        ? glycolViscosity(glycol, HYDRAULIC_TEMP_C)
        : waterViscosity(cToK(HYDRAULIC_TEMP_C));
    const flow = lphToM3s(designLph);
    let totalPa = 0;
    const perRun: { label: string; result: PipeFlowResult }[] = [];
    for (const { run, geom } of runGeoms) {
      if (!geom) continue;
      const d = geom.boreMm / 1000;
      const length = run.lengthM + run.fittingsCount * FITTING_EQUIVALENT_DIAMETERS * d;
      const result = pipePressureDrop({
        flowM3s: flow,
        innerDiameterM: d,
        lengthM: length,
        roughnessM: ROUGHNESS_M[run.material],
        densityKgM3: rho,
        dynamicViscosityPas: mu,
      });
      totalPa += result.pressureDropPa;
      perRun.push({ label: run.label, result });
    }
    const headM = pressureToHeadM(totalPa, rho);
    const fast = perRun.filter((r) => r.result.velocityMs > VELOCITY_BAND.hardMax);
    const quick = perRun.filter((r) => r.result.velocityMs > VELOCITY_BAND.max);
    const slow = perRun.filter((r) => r.result.velocityMs < VELOCITY_BAND.min);
    const pumpShort = ps.pumpMaxHeadM !== undefined && headM > ps.pumpMaxHeadM;
    const pumpTight = ps.pumpMaxHeadM !== undefined && !pumpShort && headM > 0.8 * ps.pumpMaxHeadM;
    const level: Level =
      fast.length || pumpShort ? "fix" : quick.length || slow.length || pumpTight ? "note" : "ok";
    const notes: string[] = [];
    if (fast.length || quick.length)
      notes.push(`fast flow in ${quick.map((r) => r.label).join(", ")}`);
    if (slow.length)
      notes.push(`slow flow in ${slow.map((r) => r.label).join(", ")} (air may not clear)`);
    if (pumpShort) notes.push("the pump cannot deliver the head needed");
    else if (pumpTight) notes.push("the pump has little head to spare");
    findings.push({
      key: "hydraulics",
      level,
      title: notes.length
        ? `Pipe sizing: ${notes.join("; ")}`
        : `Pipe sizing fits: ${round(totalPa / 1000, 1)} kPa (${round(headM, 2)} m head) in the pipe runs`,
      values: [
        ...perRun.map((r) => ({
          label: `${r.label}: velocity, ${r.result.laminar ? "laminar" : "turbulent"}`,
          value: round(r.result.velocityMs, 2),
          unit: "m/s",
        })),
        { label: "Pipe-run pressure drop", value: round(totalPa / 1000, 2), unit: "kPa" },
        { label: "Head needed (pipes and fittings only)", value: round(headM, 2), unit: "m" },
        ...(ps.pumpMaxHeadM !== undefined
          ? [{ label: "Pump maximum head", value: ps.pumpMaxHeadM, unit: "m" }]
          : []),
        {
          label: `Fluid at ${HYDRAULIC_TEMP_C} °C`,
          value: `${round(rho, 0)} kg/m³, ${round(mu * 1000, 2)} mPa·s`,
        },
      ],
      source:
        "Darcy–Weisbach with Colebrook (turbulent) or 64/Re (laminar); fittings at 30 diameters each and the 0.3–1.0 m/s band are common practice",
      action:
        level === "ok"
          ? "No action. Collector and coil losses come on top: check them against the pump curve."
          : fast.length || quick.length
            ? "Use the next tube size up on the fast runs, or a lower flow."
            : pumpShort
              ? "Choose a pump with more head, larger tube, or a lower flow."
              : "Check the flow can purge air at filling; consider a smaller tube on slow runs.",
    });
  } else {
    findings.push(
      skipped("hydraulics", "Flow rate and pipe sizing", [
        "collectors",
        "pumpStation",
        "pipeRuns",
        "fluid",
      ]),
    );
  }

  // --- Component temperature ratings ----------------------------------------------------
  if (s.pumpStation && s.safety) {
    const problems: { level: Level; text: string }[] = [];
    if (s.pumpStation.pumpMaxTempC < RETURN_LEG_TEMP_C) {
      problems.push({
        level: "fix",
        text: `circulator rated ${s.pumpStation.pumpMaxTempC} °C (return leg may see ${RETURN_LEG_TEMP_C} °C)`,
      });
    }
    if (!s.safety.airSeparator) {
      problems.push({ level: "note", text: "no air separator in the flow line" });
    } else if (
      s.safety.airSeparatorMaxTempC !== undefined &&
      s.safety.airSeparatorMaxTempC < maxLiquidTempC
    ) {
      problems.push({
        level: "fix",
        text: `air separator rated ${s.safety.airSeparatorMaxTempC} °C (flow line may see ${maxLiquidTempC} °C)`,
      });
    }
    if (!s.safety.checkValve)
      problems.push({
        level: "fix",
        text: "no check valve against night-time reverse circulation",
      });
    findings.push({
      key: "component-ratings",
      level: worstLevel(problems),
      title: problems.length
        ? `Components: ${problems.map((p) => p.text).join("; ")}`
        : "Pump, air separator and check valve are rated for the loop",
      values: [
        { label: "Circulator rating", value: s.pumpStation.pumpMaxTempC, unit: "°C" },
        {
          label: "Air separator rating",
          value: s.safety.airSeparatorMaxTempC ?? (s.safety.airSeparator ? "not given" : "none"),
        },
        { label: "Highest liquid temperature", value: maxLiquidTempC, unit: "°C" },
      ],
      source:
        "Common practice: return leg up to 110 °C, flow line up to the highest liquid temperature",
      action: problems.length
        ? "Use parts made for solar primary loops; put the circulator on the cooler return leg."
        : "No action.",
    });
  } else {
    findings.push(skipped("component-ratings", "Component ratings", ["pumpStation", "safety"]));
  }

  return summarise(findings.map(sanitise), charts);
}

/** Replace any non-finite number with a plain note, so nothing odd reaches a person. */
function sanitise(f: Finding): Finding {
  if (isFiniteFinding(f)) return f;
  return {
    ...f,
    level: f.level === "ok" ? "note" : f.level,
    values: f.values.map((v) =>
      typeof v.value === "number" && !Number.isFinite(v.value)
        ? { ...v, value: "could not compute" }
        : v,
    ),
  };
}

function summarise(findings: Finding[], charts: LoopCheckResult["charts"]): LoopCheckResult {
  const counts: Record<Level, number> = { ok: 0, note: 0, fix: 0, stop: 0 };
  for (const f of findings) counts[f.level] += 1;
  return { findings, worst: worstLevel(findings), counts, charts };
}
