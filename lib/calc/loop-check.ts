/**
 * The loop check: from a (possibly incomplete) system description to findings.
 * Each section of the description is validated on its own, so a half-filled draft still gets
 * every finding its complete sections allow, and a finding naming what is missing for the rest.
 * The shared figures (steam reach, the one fill pressure, the stagnation pressure, the highest
 * liquid temperature) are worked out once in `derive` and every finding uses the same ones.
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
  type SystemSection,
} from "@/lib/validation/system";
import { describeFieldPath, SECTION_TITLES } from "@/lib/validation/system-fields";
import {
  copperInnerDiameterMm,
  copperOuterDiameterMm,
  FLEX_OUTER_EXTRA_MM,
  litresPerMetre,
  ROUGHNESS_M,
} from "./tubes";
import { saturationTemperature } from "./water-if97";
import {
  fillPressureForSealBar,
  finalPressureBar,
  nextStandardVesselL,
  recommendedPrechargeBar,
  requiredVesselVolumeL,
  thermalExpansion,
  vesselPressureBar,
  vesselState,
  waterSealL,
  type ExpansionResult,
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
  stagnationEstimate,
  type EfficiencyCoefficients,
  type StagnationEstimate,
} from "./collector";
import {
  PIPE_LOSS,
  pipeContentWithinL,
  pipeHeatLossWPerM,
  STEAM_POWER_W_PER_M2,
  steamReach,
  type SteamPipe,
} from "./steam";
import { fluidModel, type FluidModel } from "./fluid";
import { type Finding, type FindingKey, type Level, isFiniteFinding, worstLevel } from "./findings";
import { ATM_BAR, G, lphToM3s, round } from "./units";

type Parsed<S extends z.ZodType> = z.output<S>;

/**
 * Design flow per m² of aperture, L/(m²·h): low-flow 12–24 (Kalogirou 2009); high-flow 30–50
 * (common practice). The design figure is the middle of the chosen band unless the collector
 * maker gives one.
 */
export const SPECIFIC_FLOW = {
  lowMin: 12,
  lowMax: 24,
  highMin: 30,
  highMax: 50,
  lowDesign: 18,
  highDesign: 40,
} as const;
/**
 * Velocity in copper solar loops, m/s (common practice): below about 0.1 m/s bubbles are not
 * carried to the air separator; above 1.0 m/s the loop gets noisy; above 1.5 m/s copper erodes.
 * Ordinary domestic practice (15 mm copper at 60–250 L/h, 0.1–0.5 m/s) sits inside the band.
 */
export const VELOCITY_BAND = { min: 0.1, max: 1.0, hardMax: 1.5 } as const;
/** Temperature at the vessel when it hangs on an uninsulated cooling leg, °C (common practice). */
export const COOLING_LEG_TEMP_C = 70;
/** Highest return-leg temperature the circulator sees when steam stays clear of it, °C (common practice). */
export const RETURN_LEG_TEMP_C = 110;
/** Mean fluid temperature while running, for pressure drops, °C (common practice). */
export const HYDRAULIC_TEMP_C = 40;
/** A cold start is taken at the site's design minimum, but not below 0 °C (common practice). */
export const COLD_START_FLOOR_C = 0;
/** A collector under a clear night sky runs this much colder than the air, K (common practice). */
export const FREEZE_MARGIN_K = 5;
/**
 * Beyond about half ice by mass, a freezing mix is no longer a slush that can take up the ice's
 * expansion, and tubes can split (common practice estimate, not a published value).
 */
export const BURST_ICE_FRACTION = 0.5;
/** Below about 25 % glycol by mass the corrosion inhibitors are too dilute (common practice). */
export const INHIBITOR_MIN_PERCENT = 25;
/** Spare fluid for flushing and topping up, fraction of the loop volume (common practice). */
export const FLUID_MARGIN = 0.1;
/**
 * The least pressure at the collector's top when cold, bar g (common practice): below this an
 * automatic vent draws air in and the fluid boils at the top at little over 100 °C.
 */
export const MIN_TOP_PRESSURE_BAR = 0.3;
/** The highest liquid temperature is never taken below 120 °C (common practice, computation.md). */
export const MIN_LIQUID_TEMP_C = 120;
/**
 * Pressure drops at the design flow when not given, kPa (common practice, typical domestic
 * parts): collector array 5, solar coil 3, pump station (check valve, flow meter, valves) 8.
 */
export const COMPONENT_DROP_KPA = { collectors: 5, coil: 3, station: 8 } as const;
/**
 * Outlet temperature limits, °C: 48 °C at a bath in new homes in England (Approved Document G,
 * from memory); care settings use about 41 °C at showers and 44 °C at baths (HSE guidance, from
 * memory). Local rules decide.
 */
export const SCALD_LIMIT_C = { bath: 48, careShower: 41, careBath: 44 } as const;
/**
 * Cylinder volume per m² of collector aperture, L/m² (common practice): about 40 or more keeps
 * stagnation to the occasional hot, empty-house day; below about 25 it happens most sunny days.
 */
export const STORE_PER_M2 = { ok: 40, low: 25 } as const;
/** Steam reach this close to the pump station is reported as a near thing (common practice). */
export const REACH_CLOSE = { metres: 2, share: 0.1 } as const;
/** Pipe temperature while running, for the heat loss of uninsulated runs, °C (common practice). */
export const RUNNING_PIPE_C = 60;
/** Bare pipe losing more than this share of the array's full-sun output is a `fix` (common practice). */
export const BARE_LOSS_SHARE = 0.25;

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

function parseSections(draft: SystemDraft, findings: Finding[]): Sections {
  const out: Sections = { design: designSchema.parse(undefined) };
  const take = <S extends z.ZodType>(name: SystemSection, schema: S, value: unknown) => {
    if (value === undefined || value === null) {
      findings.push(missing(name, "not filled in yet"));
      return undefined;
    }
    const r = schema.safeParse(value);
    if (r.success) return r.data as Parsed<S>;
    const first = r.error.issues[0];
    findings.push(missing(name, issueText(name, first)));
    return undefined;
  };
  out.site = take("site", siteSchema, draft.site);
  out.collectors = take("collectors", collectorArraySchema, draft.collectors);
  if (Array.isArray(draft.pipeRuns) && draft.pipeRuns.length > 0) {
    const runs: Parsed<typeof pipeRunSchema>[] = [];
    draft.pipeRuns.forEach((run, i) => {
      const r = pipeRunSchema.safeParse(run);
      if (r.success) runs.push(r.data);
      else findings.push(missing("pipeRuns", issueText("pipeRuns", r.error.issues[0], [i])));
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
    else findings.push(missing("design", issueText("design", d.error.issues[0])));
  }
  return out;
}

/** What zod's bare "expected <type>" means, for a type mismatch with no message of our own. */
const EXPECTED_WORDS: Record<string, string> = {
  object: "a group of details",
  array: "a list",
  number: "a number",
  string: "text",
  boolean: "yes or no",
};

/** A schema issue in words: the field's label (never its key) and the message. */
function issueText(
  section: SystemSection,
  issue: { path: PropertyKey[]; message: string; code?: string; expected?: unknown } | undefined,
  prefix: PropertyKey[] = [],
): string {
  if (!issue) return "invalid";
  const where = describeFieldPath(section, [...prefix, ...issue.path]);
  // zod's own wording ("Invalid input: expected object, received NaN") is for developers.
  const message =
    issue.code === "invalid_type" && issue.message.startsWith("Invalid input")
      ? `expected ${EXPECTED_WORDS[String(issue.expected)] ?? "another kind of value"} here`
      : issue.message;
  return where ? `${where}: ${message}` : message;
}

function missing(section: SystemSection, detail: string): Finding {
  return {
    key: "input",
    level: "note",
    title: `${SECTION_TITLES[section]}: ${detail}`,
    values: [],
    source: "Loopwright input checks",
    action:
      "Complete this part of the description; the checks that need it are skipped until then.",
  };
}

function skipped(key: FindingKey, what: string, needs: SystemSection[]): Finding {
  return {
    key,
    level: "note",
    title: `${what} not checked yet`,
    values: [],
    source: "Loopwright input checks",
    action: `Needs: ${needs.map((n) => SECTION_TITLES[n]).join(", ")}.`,
  };
}

type Run = Parsed<typeof pipeRunSchema>;

/** Inner diameter (mm), outer diameter (mm) and content (L/m) of a pipe run. */
function runGeometry(run: Run): { boreMm: number; outerMm: number; lPerM: number } | null {
  if (run.material === "copper" && run.copperSize) {
    const bore = copperInnerDiameterMm(run.copperSize);
    return {
      boreMm: bore,
      outerMm: copperOuterDiameterMm(run.copperSize),
      lPerM: litresPerMetre(bore),
    };
  }
  if (run.material === "stainless_flex") {
    const bore = run.flexBoreMm ?? 16;
    return {
      boreMm: bore,
      outerMm: bore + FLEX_OUTER_EXTRA_MM,
      lPerM: run.flexContentLPerM ?? litresPerMetre(bore),
    };
  }
  return null;
}

const insulationOf = (run: Run) =>
  run.insulated ? (run.insulationMm ?? PIPE_LOSS.defaultInsulationMm) : 0;

function coefficientsOf(c: Parsed<typeof collectorArraySchema>): {
  coeffs: EfficiencyCoefficients;
  defaulted: boolean;
} {
  const d = DEFAULT_COEFFICIENTS[c.type];
  const defaulted = c.eta0 === undefined || c.a1 === undefined || c.a2 === undefined;
  return { coeffs: { eta0: c.eta0 ?? d.eta0, a1: c.a1 ?? d.a1, a2: c.a2 ?? d.a2 }, defaulted };
}

/** Boiling point of water, °C, at a gauge pressure in bar (IAPWS-IF97 Region 4). */
function boilingPointC(pressureBarG: number): number {
  const pMPa = (Math.max(pressureBarG, -0.9) + ATM_BAR) / 10;
  return saturationTemperature(pMPa) - 273.15;
}

/** Static pressure of a column of fluid, bar. */
const staticBar = (heightM: number, densityKgM3: number) => (densityKgM3 * G * heightM) / 1e5;

const fmt = (n: number, digits = 1) => round(n, digits);
const lowerFirst = (t: string) => t.charAt(0).toLowerCase() + t.slice(1);
const bar = (n: number) => (Number.isFinite(n) ? round(n, 2) : "off the scale");

// ------------------------------------------------------------------------------------------
// Shared figures

interface SteamFigures {
  powerW: number;
  powerPerM2: number;
  steamTempC: number;
  reachM: number;
  computedReachM: number;
  overridden: boolean;
  pipeSteamL: number;
  collectorsL: number;
  volumeL: number;
  stationAtM: number;
  reachesStation: boolean;
  marginM: number;
  losses: { label: string; wPerM: number }[];
}

interface PressureFigures {
  p0Set: number;
  p0Rec: number;
  p0Design: number;
  pe: number;
  sealL: number;
  fillBar: number;
  expansion: ExpansionResult;
  expansionTempC: number;
  requiredL: number;
  /** Stagnation pressure at the vessel with the chosen vessel, bar g (Infinity: relief opens). */
  stagnationBar: number;
  /** The pressure the loop actually reaches: the relief setting caps it. */
  stagnationCappedBar: number;
  liquidMaxC: number;
  boilingAtStagnationC: number;
  staticBar: number;
  topFillBar: number;
  topHotBar: number;
  topStagnationBar: number;
  night?: { tempC: number; stationBar: number; topBar: number; vesselEmpty: boolean };
  topReserveUsedBar: number;
  fillAtRecommendedBar: number;
}

interface Derived {
  fluid?: FluidModel;
  apertureM2?: number;
  grossM2?: number;
  stagnation?: StagnationEstimate;
  coeffs?: EfficiencyCoefficients;
  coeffsDefaulted?: boolean;
  runGeoms?: { run: Run; geom: ReturnType<typeof runGeometry> }[];
  loopVolumeL?: number;
  volumeParts?: { pipesL: number; collectorsL: number; coilL: number; stationL: number };
  steam?: SteamFigures;
  pressure?: PressureFigures;
}

function derive(s: Sections): Derived {
  const d: Derived = {};
  const { fillTempC } = s.design;
  if (s.fluid) d.fluid = fluidModel(s.fluid.glycolType, s.fluid.glycolPercentMass);
  const rhoFill = d.fluid?.densityKgM3(fillTempC) ?? 1000;

  if (s.collectors) {
    const c = s.collectors;
    d.apertureM2 = c.count * c.apertureAreaM2Each;
    d.grossM2 = c.count * c.grossAreaM2Each;
    const { coeffs, defaulted } = coefficientsOf(c);
    d.coeffs = coeffs;
    d.coeffsDefaulted = defaulted;
    d.stagnation = stagnationEstimate(c.type, coeffs, c.stagnationTempC);
  }
  if (s.pipeRuns) d.runGeoms = s.pipeRuns.map((run) => ({ run, geom: runGeometry(run) }));

  if (s.collectors && d.runGeoms && s.cylinder && s.pumpStation) {
    const pipesL = d.runGeoms.reduce(
      (sum, { run, geom }) => sum + (geom ? geom.lPerM * run.lengthM : 0),
      0,
    );
    const collectorsL = s.collectors.count * s.collectors.fluidContentLEach;
    const coilL = s.cylinder.coils
      .filter((c) => c.heatSource === "solar")
      .reduce((sum, c) => sum + c.contentL, 0);
    const stationL = s.pumpStation.stationContentL;
    d.volumeParts = { pipesL, collectorsL, coilL, stationL };
    d.loopVolumeL = pipesL + collectorsL + coilL + stationL;
  }

  // Steam reach (VDI 6002-1): the steam-producing power against the pipes' heat loss.
  if (s.collectors && d.runGeoms && s.pumpStation && d.grossM2 !== undefined) {
    const ps = s.pumpStation;
    const pe = finalPressureBar(ps.reliefValveBar);
    // The steam's temperature is the boiling point at the collector top at the design final
    // pressure; the loss is taken there (at lower pressure the steam reaches a little further).
    const topBar = Math.max(pe - staticBar(ps.staticHeightM, rhoFill), 0);
    const steamTempC = boilingPointC(topBar);
    const pipes: (SteamPipe & { label: string })[] = d.runGeoms.flatMap(({ run, geom }) =>
      geom
        ? [
            {
              label: run.label,
              lengthM: run.lengthM,
              contentLPerM: geom.lPerM,
              lossWPerM: pipeHeatLossWPerM(geom.outerMm, insulationOf(run), steamTempC),
            },
          ]
        : [],
    );
    const powerPerM2 = STEAM_POWER_W_PER_M2[s.collectors.type][s.collectors.emptying];
    const powerW = powerPerM2 * d.grossM2;
    const computed = steamReach(powerW, pipes);
    const override = s.design.steamReachM;
    const reachM = override ?? computed.reachM;
    const pipeSteamL =
      override !== undefined ? pipeContentWithinL(pipes, override) : computed.pipeSteamL;
    const totalPipeM = pipes.reduce((sum, p) => sum + p.lengthM, 0);
    const stationAtM = ps.pipeToStationM ?? totalPipeM;
    const collectorsL = s.collectors.count * s.collectors.fluidContentLEach;
    d.steam = {
      powerW,
      powerPerM2,
      steamTempC,
      reachM,
      computedReachM: computed.reachM,
      overridden: override !== undefined,
      pipeSteamL,
      collectorsL,
      volumeL: collectorsL + pipeSteamL,
      stationAtM,
      reachesStation: reachM >= stationAtM,
      marginM: stationAtM - reachM,
      losses: pipes.map((p) => ({ label: p.label, wPerM: p.lossWPerM })),
    };
  }

  // Pressures: one fill pressure from the pre-charge actually set, used everywhere below.
  if (s.pumpStation && s.expansionVessel && d.fluid && d.loopVolumeL !== undefined && d.steam) {
    const ps = s.pumpStation;
    const ev = s.expansionVessel;
    const fluid = d.fluid;
    const p0Set = ev.prechargeBar;
    const p0Rec = recommendedPrechargeBar(ps.staticHeightM);
    const p0Design = Math.max(p0Set, p0Rec);
    const pe = finalPressureBar(ps.reliefValveBar);
    const sealL = waterSealL(d.loopVolumeL);
    const fillBar = fillPressureForSealBar(ev.nominalVolumeL, p0Set, sealL);
    const expansionTempC = Math.max(s.design.maxLiquidTempC, MIN_LIQUID_TEMP_C);
    const pMPa = (pe + ATM_BAR) / 10;
    const kind = fluid.kind ?? "propylene";
    const expansion = thermalExpansion(
      d.loopVolumeL,
      fluid.percent,
      fillTempC,
      expansionTempC,
      pMPa,
      kind,
    );
    const requiredL = requiredVesselVolumeL({
      expansionL: expansion.expansionL,
      waterSealL: sealL,
      steamVolumeL: d.steam.volumeL,
      prechargeBar: p0Design,
      finalPressureBar: pe,
    });
    const stagnationBar = vesselPressureBar(
      ev.nominalVolumeL,
      p0Set,
      fillBar,
      expansion.expansionL + d.steam.volumeL,
    );
    const stagnationCappedBar = Math.min(stagnationBar, ps.reliefValveBar);
    const boilingAtStagnationC = boilingPointC(stagnationCappedBar);
    const liquidMaxC = Math.max(expansionTempC, boilingAtStagnationC);
    const head = staticBar(ps.staticHeightM, fluid.densityKgM3(fillTempC));
    const hotBar = vesselPressureBar(ev.nominalVolumeL, p0Set, fillBar, expansion.expansionL);

    let night: PressureFigures["night"];
    if (s.site) {
      const tempC = Math.max(s.site.designMinTempC, fluid.freezeC);
      const contraction = thermalExpansion(
        d.loopVolumeL,
        fluid.percent,
        fillTempC,
        tempC,
        pMPa,
        kind,
      ).expansionL;
      const state = vesselState(ev.nominalVolumeL, p0Set, fillBar, contraction);
      const stationBar = state.pressureBar;
      night = {
        tempC,
        stationBar,
        topBar: stationBar - staticBar(ps.staticHeightM, fluid.densityKgM3(tempC)),
        vesselEmpty: state.empty,
      };
    }
    d.pressure = {
      p0Set,
      p0Rec,
      p0Design,
      pe,
      sealL,
      fillBar,
      expansion,
      expansionTempC,
      requiredL,
      stagnationBar,
      stagnationCappedBar,
      liquidMaxC,
      boilingAtStagnationC,
      staticBar: head,
      topFillBar: fillBar - head,
      topHotBar: hotBar - head,
      topStagnationBar: stagnationCappedBar - head,
      night,
      topReserveUsedBar: p0Set - head,
      fillAtRecommendedBar: fillPressureForSealBar(ev.nominalVolumeL, p0Rec, sealL),
    };
  }
  return d;
}

// ------------------------------------------------------------------------------------------
// The checks

function collectorOutputFindings(s: Sections, d: Derived): Finding[] {
  if (!s.collectors || !d.coeffs || d.apertureM2 === undefined) return [];
  const coeffs = d.coeffs;
  const apertureM2 = d.apertureM2;
  const outputW = collectorOutputW(coeffs, apertureM2, 50, 20, REFERENCE_IRRADIANCE);
  const out: Finding[] = [
    {
      key: "collector-output",
      level: d.coeffsDefaulted ? "note" : "ok",
      title: `About ${round(outputW / 1000, 1)} kW in full sun from ${round(apertureM2, 2)} m² of collector`,
      values: [
        { label: "Aperture area", value: round(apertureM2, 2), unit: "m²" },
        {
          label: "Output in full sun, collector 30 K above the air",
          value: round(outputW),
          unit: "W",
        },
        { label: "η₀ / a₁ / a₂", value: `${coeffs.eta0} / ${coeffs.a1} / ${coeffs.a2}` },
      ],
      source: "EN ISO 9806 efficiency curve",
      method:
        "η = η₀ − a₁ ΔT/G − a₂ ΔT²/G at G = 1000 W/m² (full sun, about 1 kW per m², common practice) and ΔT = 30 K; output = η G × aperture area.",
      action: d.coeffsDefaulted
        ? "Typical figures were used: enter η₀, a₁ and a₂ from the collector's test report for a firmer figure."
        : "No action.",
    },
  ];
  const { tiltDeg, azimuthDeg } = s.collectors;
  const offSouth = Math.abs(azimuthDeg);
  const poor = tiltDeg < 15 || tiltDeg > 70 || offSouth > 60;
  const meh = !poor && (tiltDeg < 25 || tiltDeg > 60 || offSouth > 30);
  out.push({
    key: "collector-output",
    level: poor || meh ? "note" : "ok",
    title: poor
      ? "The collectors face well away from the sun's best angle: expect a lot less hot water"
      : meh
        ? "The collectors' angle loses some yield"
        : "The collectors face the sun well",
    values: [
      { label: "Tilt", value: tiltDeg, unit: "°" },
      { label: "Turned from south", value: azimuthDeg, unit: "°" },
    ],
    source: "Common practice: tilt 25–60°, within 30° of south for year-round hot water",
    action: poor
      ? "Expect noticeably less yield; check shading and whether another roof face is better."
      : "Note any shading from chimneys, trees or dormers.",
  });
  return out;
}

function stagnationFinding(s: Sections, d: Derived): Finding {
  if (!s.collectors || !d.stagnation)
    return skipped("stagnation", "Stagnation temperature", ["collectors"]);
  const st = d.stagnation;
  const stagC = st.tempC;
  const reach = d.steam
    ? `about ${fmt(d.steam.reachM)} m of pipe (flow and return together)`
    : null;
  const hotZone: { level: Level; title: string; action: string }[] = [];
  if (s.safety?.jointsAtCollector === "soft_soldered") {
    hotZone.push({
      level: "fix",
      title: "Soft-soldered joints at the collector",
      action:
        "Remake the joints at the collector and along the steam reach as compression, press (high-temperature seals) or brazed joints.",
    });
  }
  const insulation = s.safety?.insulationMaxTempC;
  if (s.safety && insulation === undefined) {
    hotZone.push({
      level: "note",
      title: "The pipe insulation's temperature rating is not given",
      action: `Check the insulation near the collector${reach ? ` (the first ${reach})` : ""} is rated to at least ${fmt(stagC, 0)} °C; ordinary foam lagging melts.`,
    });
  } else if (insulation !== undefined) {
    // Within the steam reach the pipes sit at the steam's boiling point for hours; only the
    // first stretch at the collector's outlet gets near the stagnation temperature itself.
    const steamC = d.steam?.steamTempC;
    if (steamC !== undefined && insulation < steamC) {
      hotZone.push({
        level: "fix",
        title: `Pipe insulation rated ${insulation} °C, below the ${fmt(steamC, 0)} °C steam in the pipes at stagnation`,
        action: `Use insulation rated to at least ${fmt(steamC, 0)} °C (UV-resistant outdoors)${reach ? ` over the first ${reach}` : ""}, and a sleeve rated to ${fmt(stagC, 0)} °C at the collector's connections.`,
      });
    } else if (insulation < stagC) {
      hotZone.push({
        level: steamC === undefined ? "fix" : "note",
        title: `Pipe insulation rated ${insulation} °C, below the ${fmt(stagC, 0)} °C the collector's connections reach`,
        action: `Fit a sleeve rated to ${fmt(stagC, 0)} °C (mineral wool or high-temperature rubber) over the first half metre or so at the collector's connections.`,
      });
    }
  }
  const vent = s.collectors.highPointVent;
  if (vent === "automatic") {
    hotZone.push({
      level: "fix",
      title: "Automatic air vent at the top with no valve to shut it",
      action:
        "Fit a manual vent, or an automatic one with an isolating valve that is closed after commissioning, so steam cannot escape.",
    });
  } else if (vent === "automatic_isolatable") {
    const rating = s.collectors.ventMaxTempC;
    if (rating === undefined || rating < stagC) {
      hotZone.push({
        level: "note",
        title: `Automatic air vent rated ${rating === undefined ? "(rating not given)" : `${rating} °C`} near the collector`,
        action:
          "Keep its isolating valve closed after commissioning; a vent rated near 150 °C is marginal at the top of the loop.",
      });
    }
  }
  const basisText =
    st.basis === "test report"
      ? "from the collector's test report"
      : st.basis === "efficiency curve"
        ? "from the collector's efficiency curve"
        : "a cautious typical figure for this type of collector";
  return {
    key: "stagnation",
    level: worstLevel(hotZone),
    title:
      `In full sun with the pump stopped the collector reaches about ${fmt(stagC, 0)} °C` +
      (hotZone.length ? `; ${hotZone.map((h) => lowerFirst(h.title)).join("; ")}` : ""),
    values: [
      { label: "Stagnation temperature", value: fmt(stagC, 0), unit: "°C" },
      { label: "Where the figure comes from", value: basisText },
      ...(d.steam
        ? [{ label: "Pipe that fills with steam", value: fmt(d.steam.reachM), unit: "m" }]
        : []),
      {
        label: "Joints at the collector",
        value: s.safety?.jointsAtCollector.replace("_", " ") ?? "not given",
      },
    ],
    source: "EN ISO 9806 (stagnation temperature); VDI 6002-1 (steam reach)",
    method:
      st.basis === "test report"
        ? "The stagnation temperature is the test report's figure."
        : "Without a test-report figure we take the higher of the efficiency curve solved for η = 0 at 1000 W/m² and 30 °C air, and a cautious typical figure (220 °C flat plate, 300 °C evacuated tube, from memory of typical test reports): the curve alone reads low.",
    action: hotZone.length
      ? hotZone.map((h) => h.action).join(" ")
      : `Everything ${reach ? `within the first ${reach}` : "near the collector"} must take this temperature. Fill and work with the collector covered or early in the morning.`,
  };
}

function steamReachFinding(s: Sections, d: Derived): Finding {
  const st = d.steam;
  if (!st || !s.collectors)
    return skipped("steam-reach", "Steam reach", ["collectors", "pipeRuns", "pumpStation"]);
  const ev = s.expansionVessel;
  const intermediate = ev?.intermediateVesselL;
  const protectedVessel = intermediate !== undefined && intermediate >= st.volumeL;
  const close =
    !st.reachesStation &&
    st.marginM < Math.max(REACH_CLOSE.metres, REACH_CLOSE.share * st.stationAtM);
  // Past the station by more than the estimate's own uncertainty, steam at an unprotected vessel
  // is a `stop`; only just past it, a `fix` that asks for the same remedy.
  const overshoot = -st.marginM;
  const marginal = overshoot < Math.max(REACH_CLOSE.metres, REACH_CLOSE.share * st.stationAtM);
  const level: Level = st.reachesStation
    ? protectedVessel || marginal
      ? "fix"
      : "stop"
    : close
      ? "note"
      : "ok";
  const emptying =
    s.collectors.type === "evacuated_tube"
      ? "evacuated tubes"
      : s.collectors.emptying === "good"
        ? "flat plates that empty well"
        : s.collectors.emptying === "poor"
          ? "flat plates that empty poorly"
          : "flat plates, emptying not known (taken as poor)";
  const remedy =
    `Fit a stagnation cooler (a finned or uninsulated cooling section) in the pipe before the pump station, or an intermediate vessel of at least ${Math.ceil(st.volumeL)} L (the volume steam pushes out) ahead of the expansion vessel; ` +
    "a collector that empties well, or shorter insulated runs near the collector, also shortens the reach.";
  return {
    key: "steam-reach",
    level,
    title: st.reachesStation
      ? protectedVessel
        ? `At stagnation steam reaches the pump station (about ${fmt(st.reachM)} m of pipe); the intermediate vessel protects the expansion vessel, but the pump and valves get steam`
        : `At stagnation steam reaches the pump station and the expansion vessel (about ${fmt(st.reachM)} m of pipe, station at ${fmt(st.stationAtM)} m)`
      : close
        ? `At stagnation steam comes within ${fmt(st.marginM)} m of the pump station`
        : `At stagnation steam fills about ${fmt(st.reachM)} m of pipe and stops ${fmt(st.marginM)} m short of the pump station`,
    values: [
      { label: "Collector type", value: emptying },
      { label: "Steam-producing power", value: st.powerPerM2, unit: "W/m²" },
      { label: "Steam-producing power of the array", value: round(st.powerW, 0), unit: "W" },
      { label: "Steam temperature in the pipes", value: fmt(st.steamTempC, 0), unit: "°C" },
      ...st.losses.map((l) => ({
        label: `Heat loss of ${l.label} when full of steam`,
        value: fmt(l.wPerM),
        unit: "W/m",
      })),
      {
        label: st.overridden ? "Steam reach (given by hand)" : "Steam reach",
        value: fmt(st.reachM),
        unit: "m",
      },
      ...(st.overridden
        ? [{ label: "Steam reach by the estimate", value: fmt(st.computedReachM), unit: "m" }]
        : []),
      {
        label: "Pipe from the collector to the pump station",
        value: fmt(st.stationAtM),
        unit: "m",
      },
      { label: "Steam volume (collectors and pipe)", value: round(st.volumeL, 2), unit: "L" },
      ...(intermediate !== undefined
        ? [{ label: "Intermediate vessel", value: intermediate, unit: "L" }]
        : []),
    ],
    source: st.overridden
      ? `Steam reach given by hand: ${s.design.steamReachReason ?? ""}`
      : "VDI 6002-1 steam reach (coefficients from memory)",
    method:
      "Steam reach = steam-producing power of the collectors (W per m² of gross area, by how well they empty: about 60 for flat plates that empty well, 120 for those that do not, 200 for evacuated tubes; VDI 6002-1, from memory) ÷ the heat loss per metre of each pipe full of steam, walked from the collector. " +
      "The loss is that of the insulated (or bare) pipe at the boiling point at the collector top at the design final pressure, with surroundings at 30 °C. Lengths count flow and return together.",
    action:
      level === "ok"
        ? "No action. Keep the pipes near the collector rated for steam."
        : level === "note"
          ? `The estimate is close: a collector that empties less well or thinner insulation would bring steam to the station. Consider the remedy now: ${remedy}`
          : protectedVessel
            ? `Protect the pump, flow meter and check valve: ${remedy}`
            : `Steam at the vessel destroys its diaphragm and lifts the relief valve. ${remedy} An uninsulated leg alone does not hold steam back.`,
  };
}

function volumeFinding(d: Derived): Finding {
  if (d.loopVolumeL === undefined || !d.volumeParts)
    return skipped("fluid-volume", "Fluid volume", [
      "collectors",
      "pipeRuns",
      "cylinder",
      "pumpStation",
    ]);
  const v = d.volumeParts;
  const sealL = waterSealL(d.loopVolumeL);
  const totalL = d.loopVolumeL + sealL;
  return {
    key: "fluid-volume",
    level: "ok",
    title: `The loop holds about ${round(totalL, 1)} L; have ${Math.ceil(totalL * (1 + FLUID_MARGIN))} L of fluid ready`,
    values: [
      { label: "Pipe runs", value: round(v.pipesL, 2), unit: "L" },
      { label: "Collectors", value: round(v.collectorsL, 2), unit: "L" },
      { label: "Solar coil", value: round(v.coilL, 2), unit: "L" },
      { label: "Pump station", value: round(v.stationL, 2), unit: "L" },
      { label: "Vessel water seal", value: round(sealL, 2), unit: "L" },
      { label: "Total", value: round(totalL, 2), unit: "L" },
    ],
    source: "EN 1057 tube bores; VDI 6002-1 water seal (from memory)",
    method:
      "Pipe content from the EN 1057 bore (π d²/4 per metre), collector, coil and station contents as entered, plus the water seal kept in the vessel: 0.5 % of the loop, at least 3 L.",
    action: `Order the loop volume plus about ${FLUID_MARGIN * 100} % for flushing and topping up (common practice). Fill with the solar fluid itself, not water first.`,
  };
}

function pressureFindings(s: Sections, d: Derived, charts: LoopCheckResult["charts"]): Finding[] {
  const p = d.pressure;
  if (
    !p ||
    !s.pumpStation ||
    !s.expansionVessel ||
    !d.steam ||
    d.loopVolumeL === undefined ||
    !d.fluid
  ) {
    const needs: SystemSection[] = [
      "pumpStation",
      "expansionVessel",
      "fluid",
      "collectors",
      "pipeRuns",
      "cylinder",
    ];
    return [skipped("vessel-size", "Expansion vessel size and pressures", needs)];
  }
  const ps = s.pumpStation;
  const ev = s.expansionVessel;
  const out: Finding[] = [];
  const { fillTempC } = s.design;

  // Vessel size.
  if (!Number.isFinite(p.requiredL)) {
    out.push({
      key: "vessel-size",
      level: "stop",
      title:
        "The relief valve is set too low for this height of loop: no expansion vessel can work",
      values: [
        { label: "Pre-charge needed", value: round(p.p0Design, 2), unit: "bar" },
        {
          label: "Highest working pressure from the relief setting",
          value: round(p.pe, 2),
          unit: "bar",
        },
      ],
      source: "EN 12828 Annex D; VDI 6002-1",
      method:
        "The vessel only works when the final design pressure (relief setting − 0.5 bar up to 5 bar, 90 % above) is above its pre-charge.",
      action:
        "A higher relief setting (with every part rated for it) or a lower pre-charge is needed; ask a reviewer.",
    });
  } else {
    const standard = nextStandardVesselL(p.requiredL);
    const enough = ev.nominalVolumeL >= p.requiredL;
    out.push({
      key: "vessel-size",
      level: enough ? "ok" : "fix",
      title: enough
        ? `The ${ev.nominalVolumeL} L expansion vessel is big enough: ${round(p.requiredL, 1)} L needed, steam included`
        : `The ${ev.nominalVolumeL} L expansion vessel is too small: ${round(p.requiredL, 1)} L needed, steam included`,
      values: [
        {
          label: `Expansion to ${p.expansionTempC} °C`,
          value: round(p.expansion.expansionL, 2),
          unit: "L",
        },
        {
          label: "Expansion coefficient",
          value: round(p.expansion.coefficient * 100, 2),
          unit: "%",
        },
        { label: "Water seal", value: round(p.sealL, 2), unit: "L" },
        { label: "Steam volume at stagnation", value: round(d.steam.volumeL, 2), unit: "L" },
        { label: "Pre-charge used for sizing", value: round(p.p0Design, 2), unit: "bar" },
        { label: "Required nominal volume", value: round(p.requiredL, 1), unit: "L" },
        { label: "Next standard size", value: standard ?? "over 80", unit: "L" },
        { label: "Chosen vessel", value: ev.nominalVolumeL, unit: "L" },
      ],
      source: "EN 12828 Annex D with the VDI 6002-1 steam volume",
      method: `V_n ≥ (expansion + water seal + steam volume) × (p_e + 1)/(p_e − p₀), with p_e the final design pressure and p₀ the pre-charge set, or the recommended one if that is higher. Density: ${p.expansion.basis}. Steam volume from the steam-reach estimate.`,
      action: enough
        ? "No action."
        : standard
          ? `Fit a ${standard} L solar expansion vessel (or larger).`
          : "Above 80 L: two vessels, or a larger one; ask a reviewer to confirm.",
    });
  }

  // Pre-charge.
  const off = p.p0Set - p.p0Rec;
  const low = off < -0.2;
  const high = off > 0.5;
  out.push({
    key: "vessel-precharge",
    level: low ? "fix" : high ? "note" : "ok",
    title: low
      ? `Raise the vessel's pre-charge to ${round(p.p0Rec, 2)} bar (now ${p.p0Set} bar): too low for a ${ps.staticHeightM} m high loop`
      : high
        ? `The pre-charge of ${p.p0Set} bar is higher than the ${round(p.p0Rec, 2)} bar needed`
        : `The pre-charge of ${p.p0Set} bar suits the ${ps.staticHeightM} m height`,
    values: [
      {
        label: "Height from the pump station to the collector top",
        value: ps.staticHeightM,
        unit: "m",
      },
      { label: "Recommended pre-charge", value: round(p.p0Rec, 2), unit: "bar" },
      { label: "Pre-charge set", value: p.p0Set, unit: "bar" },
      {
        label: "Collector top once the vessel's reserve is used",
        value: round(p.topReserveUsedBar, 2),
        unit: "bar",
      },
    ],
    source: "VDI 6002-1 (from memory)",
    method:
      "Recommended pre-charge = 0.1 bar per metre of height + 0.4 bar, at least 1.2 bar, so the collector top stays about 0.4 bar above the air's pressure even when the vessel has given back all its fluid.",
    action: low
      ? `Let the vessel's gas side down or pump it up to ${round(p.p0Rec, 2)} bar with the vessel empty of fluid, before filling (tyre gauge at the gas valve); then fill to ${bar(p.fillAtRecommendedBar)} bar.`
      : high
        ? "A higher pre-charge costs vessel capacity (the size check uses your setting); lower it to the recommended value unless a reviewer advises otherwise."
        : "Check it with the vessel empty of fluid, before filling, with a tyre gauge at the gas valve.",
  });

  // The one fill pressure, and the collector top cold at night and hot.
  const night = p.night;
  const noSeal = !Number.isFinite(p.fillBar);
  const nightLow = night !== undefined && night.topBar < MIN_TOP_PRESSURE_BAR;
  const reserveLow = p.topReserveUsedBar < 0;
  const fillLevel: Level = noSeal || nightLow || reserveLow ? "fix" : "ok";
  const nightBoilC = night ? boilingPointC(night.topBar) : undefined;
  out.push({
    key: "fill-pressure",
    level: fillLevel,
    title: noSeal
      ? `The ${ev.nominalVolumeL} L vessel is too small to hold its ${round(p.sealL, 1)} L water seal`
      : nightLow
        ? night!.vesselEmpty
          ? `On a cold night the vessel runs out of fluid and the collector top falls below ${round(night!.topBar, 2)} bar: air can be drawn in and the fluid boils early; raise the pre-charge`
          : `On a cold night the collector top falls to ${round(night!.topBar, 2)} bar: air can be drawn in and the fluid boils early; raise the pre-charge`
        : reserveLow
          ? `Once the vessel's reserve is used, the collector top falls below the air's pressure: raise the pre-charge`
          : `Fill to ${round(p.fillBar, 2)} bar at the pump station, cold (${fillTempC} °C)`,
    values: [
      { label: "Pre-charge set", value: p.p0Set, unit: "bar" },
      { label: "Fill pressure at the pump station, cold", value: bar(p.fillBar), unit: "bar" },
      { label: "Collector top, at filling", value: bar(p.topFillBar), unit: "bar" },
      ...(night
        ? [
            {
              label: `Collector top on a cold night (${fmt(night.tempC)} °C)`,
              value: bar(night.topBar),
              unit: "bar",
            },
            {
              label: "Boiling point at the collector top, cold night",
              value: fmt(nightBoilC ?? 0, 0),
              unit: "°C",
            },
          ]
        : []),
      {
        label: "Collector top once the vessel's reserve is used",
        value: round(p.topReserveUsedBar, 2),
        unit: "bar",
      },
      {
        label: `Collector top, hot (${p.expansionTempC} °C, before steam)`,
        value: bar(p.topHotBar),
        unit: "bar",
      },
      { label: "Collector top at stagnation", value: bar(p.topStagnationBar), unit: "bar" },
    ],
    source:
      "VDI 6002-1 (water seal in the vessel at filling); EN 12828 (fill at least pre-charge + 0.3 bar)",
    method:
      "Fill pressure p_a from Boyle's law on the vessel's gas side with the pre-charge actually set, so the water seal is in the vessel at the fill temperature: (p₀ + 1) V_n = (p_a + 1)(V_n − seal), and at least p₀ + 0.3 bar. " +
      "The collector top is that pressure less the fluid column (ρ g h). On a cold night the loop contracts (density from the fluid's property data) and the vessel gives fluid back; at least 0.3 bar at the top is kept cold (common practice).",
    action: noSeal
      ? "Fit a larger vessel: it must hold the water seal and the expansion."
      : nightLow || reserveLow
        ? `Set the pre-charge to ${round(p.p0Rec, 2)} bar (vessel empty of fluid) and fill to ${bar(p.fillAtRecommendedBar)} bar cold; if the vessel then cannot take the expansion, use a larger one.`
        : "Fill with the solar fluid through the fill point with a filling pump, collector covered, and read the gauge cold. Record the cold and hot pressures.",
  });

  // Loop pressure from cold to hot in the chosen vessel, and at stagnation with steam.
  const kind = d.fluid.kind ?? "propylene";
  const points: PressurePoint[] = [];
  const steps = 12;
  const pMPa = (p.pe + ATM_BAR) / 10;
  for (let k = 0; k <= steps; k++) {
    const t = fillTempC + ((p.expansionTempC - fillTempC) * k) / steps;
    const e = thermalExpansion(d.loopVolumeL, d.fluid.percent, fillTempC, t, pMPa, kind).expansionL;
    const pr = vesselPressureBar(ev.nominalVolumeL, p.p0Set, p.fillBar, e);
    points.push({
      tempC: round(t, 1),
      pressureBar: Number.isFinite(pr) ? round(Math.min(pr, ps.reliefValveBar * 1.5), 2) : null,
    });
  }
  charts.pressure = {
    points,
    reliefBar: ps.reliefValveBar,
    stagnation: {
      tempC: round(d.stagnation?.tempC ?? p.expansionTempC, 0),
      pressureBar: Number.isFinite(p.stagnationBar)
        ? round(Math.min(p.stagnationBar, ps.reliefValveBar * 1.5), 2)
        : null,
    },
    fillBar: Number.isFinite(p.fillBar) ? round(p.fillBar, 2) : round(p.p0Set, 2),
  };

  // Relief margin and pressure ratings.
  const ratings: { name: string; bar: number | undefined }[] = [
    { name: "expansion vessel", bar: ev.maxPressureBar },
    { name: "collector", bar: s.collectors?.maxPressureBar },
    { name: "solar coil", bar: s.cylinder?.solarCoilMaxBar },
    { name: "lowest-rated valve or fitting", bar: ps.lowestComponentMaxBar },
  ];
  const under = ratings.filter((r) => r.bar !== undefined && r.bar < ps.reliefValveBar);
  const unknown = ratings.filter((r) => r.bar === undefined);
  const opens = !Number.isFinite(p.stagnationBar) || p.stagnationBar >= ps.reliefValveBar;
  const weeps = !opens && p.stagnationBar > p.pe;
  const reliefLevel: Level = under.length
    ? "stop"
    : opens || weeps
      ? "fix"
      : unknown.length
        ? "note"
        : "ok";
  const pressureTitle = opens
    ? `At stagnation the loop reaches the ${ps.reliefValveBar} bar relief setting: the relief valve lifts and loses fluid`
    : weeps
      ? `At stagnation the loop reaches about ${round(p.stagnationBar, 1)} bar, above the ${round(p.pe, 2)} bar design limit, where relief valves start to weep`
      : `At stagnation the loop reaches about ${round(p.stagnationBar, 1)} bar, within the ${round(p.pe, 2)} bar design limit`;
  out.push({
    key: "relief-margin",
    level: reliefLevel,
    title: under.length
      ? `The relief valve at ${ps.reliefValveBar} bar is set above the ${under.map((u) => u.name).join(" and ")} rating`
      : pressureTitle,
    values: [
      { label: "Relief setting", value: ps.reliefValveBar, unit: "bar" },
      { label: "Final design pressure", value: round(p.pe, 2), unit: "bar" },
      opens
        ? { label: "Pressure at stagnation (chosen vessel)", value: "over the relief setting" }
        : {
            label: "Pressure at stagnation (chosen vessel)",
            value: round(p.stagnationBar, 2),
            unit: "bar",
          },
      ...ratings.map((r) => ({
        label: `Maximum pressure, ${r.name}`,
        value: r.bar ?? "not given",
        ...(r.bar !== undefined ? { unit: "bar" } : {}),
      })),
    ],
    source: "EN 12977-1; EN 12828 (relief valve and final design pressure)",
    method:
      "Stagnation pressure from Boyle's law on the vessel's gas side after the expansion and the steam volume have entered it, starting from the one fill pressure. Final design pressure = relief setting − 0.5 bar up to 5 bar, 90 % of it above (EN 12828, from memory): above it relief valves begin to weep.",
    action: [
      under.length
        ? "Every part must be rated at or above the relief setting: replace the under-rated parts, or fit a lower-set relief valve and re-size the vessel."
        : "",
      opens || weeps
        ? "Use a larger vessel (see the vessel size) and check the pre-charge, so stagnation stays below the design limit."
        : "",
      unknown.length
        ? `Find the maximum operating pressure of the ${unknown.map((u) => u.name).join(", ")} (data plate or test report) and check it is at least ${ps.reliefValveBar} bar.`
        : "",
      reliefLevel === "ok"
        ? "No action. Pipe the relief discharge to a container that can take hot glycol."
        : "",
    ]
      .filter(Boolean)
      .join(" "),
  });

  // The vessel's temperature.
  const steamAtVessel =
    d.steam.reachesStation && !((ev.intermediateVesselL ?? 0) >= d.steam.volumeL);
  const shielded = ev.onCoolingLeg || ev.intermediateVesselL !== undefined;
  const seenAtVessel = steamAtVessel ? p.liquidMaxC : shielded ? COOLING_LEG_TEMP_C : p.liquidMaxC;
  const problems: string[] = [];
  if (ev.diaphragmMaxTempC < seenAtVessel)
    problems.push("its diaphragm is rated below the temperature it will see");
  if (!shielded) problems.push("it is not on a cooling leg");
  if (steamAtVessel) problems.push("steam can reach it");
  out.push({
    key: "vessel-rating",
    level: ev.diaphragmMaxTempC < seenAtVessel ? "fix" : shielded && !steamAtVessel ? "ok" : "note",
    title: problems.length
      ? `Expansion vessel: ${problems.join("; ")}`
      : `The expansion vessel (rated ${ev.diaphragmMaxTempC} °C) is kept cool on its leg`,
    values: [
      { label: "Diaphragm rating", value: ev.diaphragmMaxTempC, unit: "°C" },
      { label: "Temperature it may see", value: fmt(seenAtVessel, 0), unit: "°C" },
      { label: "On a cooling leg", value: ev.onCoolingLeg ? "yes" : "no" },
      {
        label:
          "Highest liquid temperature (boiling point at the stagnation pressure, at least 120 °C)",
        value: fmt(p.liquidMaxC, 0),
        unit: "°C",
      },
    ],
    source: "EN 13831 (vessels); common practice",
    method:
      "On an uninsulated leg below its connection, and with steam kept from the station, the vessel sees about 70 °C (common practice). Otherwise it sees the highest liquid temperature: at least 120 °C, or the boiling point at the stagnation pressure (IAPWS-IF97) if higher. Ordinary heating vessels are often limited to about 70 °C at the diaphragm (EN 13831 scope, from memory).",
    action: problems.length
      ? "Use a vessel made for solar loops and hang it below its connection on an uninsulated leg, with an intermediate vessel if steam reaches the pump station."
      : "No action.",
  });
  return out;
}

function freezeFindings(s: Sections, d: Derived, charts: LoopCheckResult["charts"]): Finding[] {
  if (!s.fluid || !s.site || !d.fluid)
    return [skipped("freeze", "Freeze protection", ["fluid", "site"])];
  const fluid = d.fluid;
  const min = s.site.designMinTempC;
  const kind = fluid.kind ?? (s.fluid.glycolType === "ethylene" ? "ethylene" : "propylene");
  const points: FreezePoint[] = [];
  for (let pc = 0; pc <= 60; pc += 5)
    points.push({ percent: pc, freezeC: round(fluidModel(kind, pc).freezeC, 1) });
  charts.freeze = { points, designMinC: min, percent: fluid.percent };

  const night = min - FREEZE_MARGIN_K;
  const fp = fluid.freezeC;
  const ice = fluid.iceFraction(night);
  const level: Level = fp <= night ? "ok" : ice >= BURST_ICE_FRACTION ? "stop" : "fix";
  const name = fluid.kind ? `The ${fluid.label} mix` : "Plain water";
  const findings: Finding[] = [
    {
      key: "freeze",
      level,
      title:
        level === "ok"
          ? `${name} starts to freeze at ${fmt(fp)} °C, safely below a ${fmt(night)} °C clear night at the collector`
          : level === "stop"
            ? `${name} freezes at ${fmt(fp)} °C: on a ${fmt(night)} °C night at the collector it turns about ${Math.round(ice * 100)} % to ice and can split the collector`
            : `${name} starts to freeze at ${fmt(fp)} °C: on a ${fmt(night)} °C night at the collector it turns to slush and blocks the flow`,
      values: [
        { label: "Fluid", value: fluid.label },
        { label: "Freezing point (first crystals)", value: fmt(fp), unit: "°C" },
        { label: "Site design minimum (air)", value: min, unit: "°C" },
        {
          label: `Collector under a clear night sky (${FREEZE_MARGIN_K} K colder)`,
          value: fmt(night),
          unit: "°C",
        },
        { label: "Ice at that temperature", value: Math.round(ice * 100), unit: "%" },
      ],
      source: fluid.kind ? `Melinder (2010), ${fluid.kind} glycol` : "Water freezes at 0 °C",
      method:
        "Freezing point (first ice crystals) from Melinder's published property data for the glycol in the loop; plain water and a 0 % mix are the same fluid. A collector under a clear sky runs about 5 K colder than the air (common practice). " +
        "The ice share follows from the freezing curve (lever rule: the ice is pure water, the liquid left is the richer mix that freezes at that temperature); beyond about half ice the slush can split tubes (common practice estimate).",
      action:
        level === "ok"
          ? "No action. Check the mix with a refractometer after filling and at every service."
          : `Use a solar fluid mixed to freeze at or below ${fmt(night)} °C (propylene glycol: about ${suggestPercent(night)} % by mass).`,
    },
  ];
  return findings;
}

/** The propylene glycol share (by mass, rounded up to 5 %) that freezes at or below `tempC`. */
function suggestPercent(tempC: number): number {
  for (let pc = 25; pc <= 60; pc += 5) if (fluidModel("propylene", pc).freezeC <= tempC) return pc;
  return 60;
}

function fluidFinding(s: Sections, d: Derived): Finding {
  if (!s.fluid || !d.fluid) return skipped("fluid", "Heat-transfer fluid", ["fluid"]);
  const f = s.fluid;
  const fluid = d.fluid;
  const problems: { level: Level; title: string; action: string }[] = [];
  if (f.glycolType === "ethylene") {
    problems.push({
      level: "fix",
      title: "Ethylene glycol beside drinking water",
      action:
        "Use an inhibited propylene glycol solar fluid: ethylene glycol is toxic, and a leaking coil would put it into the hot water. Local rules may allow it only with a double-walled heat exchanger.",
    });
  }
  if (f.glycolType !== "none" && !f.solarRated) {
    problems.push({
      level: "fix",
      title: "The fluid is not made for solar loops",
      action:
        "Use a solar heat-transfer fluid: ordinary antifreeze breaks down and turns acidic at stagnation temperatures.",
    });
  }
  if (fluid.percent > 0 && fluid.percent < INHIBITOR_MIN_PERCENT) {
    problems.push({
      level: "fix",
      title: `At ${fluid.percent} % the glycol's corrosion inhibitors are too dilute to protect the loop`,
      action: `Mix to at least ${INHIBITOR_MIN_PERCENT} % by mass (or as the fluid's maker says), whatever the frost risk.`,
    });
  }
  if (fluid.percent > 50) {
    problems.push({
      level: "note",
      title: `Above 50 % the fluid is thick and carries heat less well`,
      action: "Mix no stronger than the site needs; about 40 % suits most climates.",
    });
  }
  return {
    key: "fluid",
    level: worstLevel(problems),
    title: problems.length
      ? problems.map((p) => p.title).join("; ")
      : fluid.kind
        ? `The fluid (${fluid.label}, made for solar loops) suits the loop`
        : "Plain water: no glycol to age, but see the freeze check",
    values: [
      { label: "Fluid", value: fluid.label },
      { label: "Made for solar loops", value: f.solarRated ? "yes" : "no" },
    ],
    source: "Common practice",
    action: problems.length
      ? problems.map((p) => p.action).join(" ")
      : "Test the fluid at every service and after any stagnation: freezing point with a refractometer and pH (replace it when it turns acidic).",
  };
}

function flowFindings(s: Sections, d: Derived): Finding[] {
  if (!s.collectors || !s.pumpStation || !d.runGeoms || !d.fluid || d.apertureM2 === undefined)
    return [
      skipped("hydraulics", "Flow rate and pipe sizing", [
        "collectors",
        "pumpStation",
        "pipeRuns",
        "fluid",
      ]),
    ];
  const c = s.collectors;
  const ps = s.pumpStation;
  const fluid = d.fluid;
  const apertureM2 = d.apertureM2;
  const low = c.flowMode === "low_flow";
  const specific = c.makerFlowLphM2 ?? (low ? SPECIFIC_FLOW.lowDesign : SPECIFIC_FLOW.highDesign);
  const band = low
    ? { min: SPECIFIC_FLOW.lowMin, max: SPECIFIC_FLOW.lowMax }
    : { min: SPECIFIC_FLOW.highMin, max: SPECIFIC_FLOW.highMax };
  const designLph = specific * apertureM2;
  const covers = ps.flowMeterMinLph <= designLph && ps.flowMeterMaxLph >= designLph;
  const out: Finding[] = [
    {
      key: "flow-rate",
      level: covers ? "ok" : "fix",
      title: covers
        ? `Set the flow to about ${round(designLph, 0)} L/h; the flow meter (${ps.flowMeterMinLph}–${ps.flowMeterMaxLph} L/h) can show it`
        : `The flow meter (${ps.flowMeterMinLph}–${ps.flowMeterMaxLph} L/h) cannot show the ${round(designLph, 0)} L/h needed`,
      values: [
        { label: "Aperture area", value: round(apertureM2, 2), unit: "m²" },
        {
          label:
            c.makerFlowLphM2 !== undefined
              ? "Specific flow (maker's figure)"
              : `Specific flow (${low ? "low-flow" : "high-flow"})`,
          value: specific,
          unit: "L/(m²·h)",
        },
        { label: "Design flow", value: round(designLph, 0), unit: "L/h" },
        {
          label: `Usual ${low ? "low-flow" : "high-flow"} range`,
          value: `${round(band.min * apertureM2, 0)}–${round(band.max * apertureM2, 0)}`,
          unit: "L/h",
        },
      ],
      source: "Low-flow 12–24 L/(m²·h) (Kalogirou 2009); high-flow 30–50 (common practice)",
      method:
        "Design flow = specific flow × aperture area; the specific flow is the maker's figure when given, otherwise the middle of the chosen low-flow or high-flow band.",
      action: covers ? "No action." : "Fit a flow meter whose range includes the design flow.",
    },
  ];

  const running = HYDRAULIC_TEMP_C;
  const coldC = Math.min(
    s.design.fillTempC,
    Math.max(s.site?.designMinTempC ?? COLD_START_FLOOR_C, COLD_START_FLOOR_C, fluid.freezeC),
  );
  const flow = lphToM3s(designLph);
  const drops = (tempC: number) => {
    const rho = fluid.densityKgM3(tempC);
    const mu = fluid.viscosityPas(tempC);
    let pipesPa = 0;
    const perRun: { label: string; result: PipeFlowResult }[] = [];
    for (const { run, geom } of d.runGeoms!) {
      if (!geom) continue;
      const dm = geom.boreMm / 1000;
      const result = pipePressureDrop({
        flowM3s: flow,
        innerDiameterM: dm,
        lengthM: run.lengthM + run.fittingsCount * FITTING_EQUIVALENT_DIAMETERS * dm,
        roughnessM: ROUGHNESS_M[run.material],
        densityKgM3: rho,
        dynamicViscosityPas: mu,
      });
      pipesPa += result.pressureDropPa;
      perRun.push({ label: run.label, result });
    }
    return { rho, mu, pipesPa, perRun };
  };
  const run = drops(running);
  const cold = drops(coldC);
  // Collector and coil passages are narrow and laminar: their drop scales with viscosity
  // (Hagen–Poiseuille). The station's losses are mostly in valves and taken as fixed.
  const viscosityRatio = cold.mu / run.mu;
  const collectorsKPa = c.pressureDropKPa ?? COMPONENT_DROP_KPA.collectors;
  const partsKPa = collectorsKPa + COMPONENT_DROP_KPA.coil + COMPONENT_DROP_KPA.station;
  const partsColdKPa =
    (collectorsKPa + COMPONENT_DROP_KPA.coil) * viscosityRatio + COMPONENT_DROP_KPA.station;
  const runKPa = run.pipesPa / 1000 + partsKPa;
  const coldKPa = cold.pipesPa / 1000 + partsColdKPa;
  const headM = pressureToHeadM(runKPa * 1000, run.rho);
  const coldHeadM = pressureToHeadM(coldKPa * 1000, cold.rho);

  const fast = run.perRun.filter((r) => r.result.velocityMs > VELOCITY_BAND.hardMax);
  const quick = run.perRun.filter(
    (r) => r.result.velocityMs > VELOCITY_BAND.max && r.result.velocityMs <= VELOCITY_BAND.hardMax,
  );
  const slow = run.perRun.filter((r) => r.result.velocityMs < VELOCITY_BAND.min);
  const pumpHead = ps.pumpMaxHeadM;
  const pumpShort = pumpHead !== undefined && headM > pumpHead;
  const pumpTight = pumpHead !== undefined && !pumpShort && headM > 0.8 * pumpHead;
  const coldShort = pumpHead !== undefined && !pumpShort && coldHeadM > pumpHead;
  const level: Level =
    fast.length || pumpShort
      ? "fix"
      : quick.length || slow.length || pumpTight || coldShort || pumpHead === undefined
        ? "note"
        : "ok";
  const notes: string[] = [];
  if (fast.length)
    notes.push(`flow fast enough to wear the copper in ${fast.map((r) => r.label).join(", ")}`);
  if (quick.length) notes.push(`fast, noisy flow in ${quick.map((r) => r.label).join(", ")}`);
  if (slow.length)
    notes.push(`slow flow in ${slow.map((r) => r.label).join(", ")} (bubbles may not clear)`);
  if (pumpShort) notes.push("the pump cannot push the design flow round the loop");
  else if (pumpTight) notes.push("the pump has little to spare");
  if (coldShort) notes.push("on a cold start the flow stays low until the fluid warms");
  if (pumpHead === undefined) notes.push("the pump's maximum head is not given");
  out.push({
    key: "hydraulics",
    level,
    title: notes.length
      ? `Pipes and pump: ${notes.join("; ")}`
      : `Pipes and pump fit: the loop needs about ${round(headM, 1)} m of head running, ${round(coldHeadM, 1)} m on a cold start`,
    values: [
      ...run.perRun.map((r) => ({
        label: `${r.label}: speed of flow, ${r.result.laminar ? "laminar" : "turbulent"}`,
        value: round(r.result.velocityMs, 2),
        unit: "m/s",
      })),
      {
        label: "Pipe runs and fittings, running",
        value: round(run.pipesPa / 1000, 2),
        unit: "kPa",
      },
      {
        label: `Collectors${c.pressureDropKPa === undefined ? " (typical)" : ""}, coil (typical) and pump station (typical)`,
        value: round(partsKPa, 1),
        unit: "kPa",
      },
      { label: `Head needed, running at ${running} °C`, value: round(headM, 2), unit: "m" },
      {
        label: `Head needed, cold start at ${fmt(coldC)} °C`,
        value: round(coldHeadM, 2),
        unit: "m",
      },
      ...(pumpHead !== undefined
        ? [{ label: "Pump maximum head", value: pumpHead, unit: "m" }]
        : []),
      {
        label: `Fluid at ${running} °C / ${fmt(coldC)} °C`,
        value: `${round(run.mu * 1000, 2)} / ${round(cold.mu * 1000, 2)} mPa·s`,
      },
    ],
    source: "Darcy–Weisbach; Melinder (2010) and IAPWS viscosity and density",
    method:
      "Pipe runs by Darcy–Weisbach with Colebrook (turbulent) or 64/Re (laminar), fittings at 30 diameters each (common practice). Collectors, coil and pump station are added at typical drops (5, 3 and 8 kPa, common practice) unless the maker's collector figure is given; at a cold start the collector and coil drops grow with the viscosity. Velocity band 0.1–1.0 m/s, over 1.5 m/s wears copper (common practice).",
    action:
      level === "ok"
        ? "No action. Set the pump so the flow meter shows the design flow."
        : fast.length || quick.length
          ? "Use the next tube size up on the fast runs, or a lower flow."
          : pumpShort
            ? "Choose a pump with more head, larger tube, or a lower flow."
            : slow.length
              ? "Purge air with a filling pump at high flow when filling; a smaller tube on the slow runs would carry bubbles better."
              : pumpHead === undefined
                ? "Compare the head needed with the pump's curve (on its data plate or in its instructions)."
                : "Check the pump curve at the design flow; a cold start is normally fine once the fluid warms.",
  });
  return out;
}

function pipeInsulationFinding(s: Sections, d: Derived): Finding {
  if (!d.runGeoms) return skipped("pipe-insulation", "Pipe insulation", ["pipeRuns"]);
  const bare = d.runGeoms.filter(({ run, geom }) => !run.insulated && geom);
  const lossW = bare.reduce(
    (sum, { run, geom }) =>
      sum + pipeHeatLossWPerM(geom!.outerMm, 0, RUNNING_PIPE_C, 15) * run.lengthM,
    0,
  );
  const thinOrUnknown = d.runGeoms.filter(
    ({ run }) => run.insulated && run.insulationMm === undefined,
  );
  const arrayW =
    d.coeffs && d.apertureM2 !== undefined
      ? collectorOutputW(d.coeffs, d.apertureM2, 50, 20, REFERENCE_IRRADIANCE)
      : undefined;
  const heavy = arrayW !== undefined && lossW > BARE_LOSS_SHARE * arrayW;
  return {
    key: "pipe-insulation",
    level: heavy ? "fix" : bare.length ? "note" : "ok",
    title: bare.length
      ? `${bare.map(({ run }) => run.label).join(", ")} ${bare.length > 1 ? "are" : "is"} not insulated: about ${round(lossW, 0)} W lost while the loop runs`
      : "All pipe runs are insulated",
    values: [
      ...d.runGeoms.map(({ run }) => ({
        label: `${run.label}: insulation`,
        value: run.insulated
          ? run.insulationMm !== undefined
            ? `${run.insulationMm} mm`
            : "yes, thickness not given"
          : "none",
      })),
    ],
    source: "Radial heat loss (Incropera & DeWitt); common practice",
    method: `Heat loss of bare copper at ${RUNNING_PIPE_C} °C in 15 °C surroundings, about 10 W/(m²·K) at the surface (common practice). At stagnation insulation works the other way: less heat is lost, so steam reaches further, which the steam check accounts for (20 mm assumed where the thickness is not given).`,
    action: bare.length
      ? "Insulate the runs (UV-resistant outdoors, rated for stagnation near the collector), unless a bare run is a deliberate cooling leg for the vessel."
      : thinOrUnknown.length
        ? "No action. Enter the insulation thickness for a firmer steam-reach estimate."
        : "No action.",
  };
}

function componentRatingsFinding(s: Sections, d: Derived): Finding {
  if (!s.pumpStation || !s.safety)
    return skipped("component-ratings", "Component ratings", ["pumpStation", "safety"]);
  const steamAtStation = d.steam?.reachesStation ?? false;
  const liquidMaxC = d.pressure?.liquidMaxC ?? Math.max(s.design.maxLiquidTempC, MIN_LIQUID_TEMP_C);
  const returnC = steamAtStation ? liquidMaxC : RETURN_LEG_TEMP_C;
  const problems: { level: Level; text: string }[] = [];
  if (s.pumpStation.pumpMaxTempC < returnC) {
    problems.push({
      level: "fix",
      text: steamAtStation
        ? `circulator rated ${s.pumpStation.pumpMaxTempC} °C, but steam at ${fmt(returnC, 0)} °C reaches the station`
        : `circulator rated ${s.pumpStation.pumpMaxTempC} °C (the return may reach ${fmt(returnC, 0)} °C)`,
    });
  }
  if (!s.safety.airSeparator) {
    problems.push({ level: "note", text: "no air separator in the flow line" });
  } else if (s.safety.airSeparatorMaxTempC === undefined) {
    problems.push({ level: "note", text: "the air separator's temperature rating is not given" });
  } else if (s.safety.airSeparatorMaxTempC < liquidMaxC) {
    problems.push({
      level: "fix",
      text: `air separator rated ${s.safety.airSeparatorMaxTempC} °C (the flow line may reach ${fmt(liquidMaxC, 0)} °C)`,
    });
  }
  if (!s.safety.checkValve)
    problems.push({ level: "fix", text: "no check valve against night-time reverse circulation" });
  return {
    key: "component-ratings",
    level: worstLevel(problems),
    title: problems.length
      ? `Pump station parts: ${problems.map((p) => p.text).join("; ")}`
      : "The pump, air separator and check valve are rated for the loop",
    values: [
      { label: "Circulator rating", value: s.pumpStation.pumpMaxTempC, unit: "°C" },
      {
        label: "Air separator rating",
        value: s.safety.airSeparatorMaxTempC ?? (s.safety.airSeparator ? "not given" : "none"),
        ...(s.safety.airSeparatorMaxTempC !== undefined ? { unit: "°C" } : {}),
      },
      {
        label: "Highest liquid temperature in the flow line",
        value: fmt(liquidMaxC, 0),
        unit: "°C",
      },
      { label: "Highest temperature at the return", value: fmt(returnC, 0), unit: "°C" },
    ],
    source: "Common practice; IAPWS-IF97 boiling point",
    method:
      "The flow line must take the highest liquid temperature: at least 120 °C, or the boiling point at the stagnation pressure if higher. The circulator sits on the return, taken as up to 110 °C unless steam reaches the station (common practice).",
    action: problems.length
      ? "Use parts made for solar primary loops, rated for the temperatures above; put the circulator on the cooler return leg."
      : "No action.",
  };
}

function cylinderFindings(s: Sections, d: Derived): Finding[] {
  const out: Finding[] = [];
  // Scalding.
  if (s.safety) {
    const sf = s.safety;
    const set = sf.mixingValveSetC;
    const level: Level = !sf.mixingValve
      ? "fix"
      : set === undefined
        ? "note"
        : set > SCALD_LIMIT_C.bath
          ? "fix"
          : "ok";
    out.push({
      key: "scald",
      level,
      title: !sf.mixingValve
        ? "No mixing valve: on sunny days the hot taps can run at 80 °C or more and scald"
        : set === undefined
          ? "The mixing valve's setting is not given"
          : set > SCALD_LIMIT_C.bath
            ? `The mixing valve is set to ${set} °C: hot enough to scald at a bath or basin`
            : `The mixing valve at ${set} °C keeps the taps below scalding`,
      values: [
        { label: "Mixing valve", value: sf.mixingValve ? "fitted" : "none" },
        ...(set !== undefined ? [{ label: "Setting", value: set, unit: "°C" }] : []),
        { label: "Usual limit at a bath", value: SCALD_LIMIT_C.bath, unit: "°C" },
      ],
      source: "Local building rules (e.g. Approved Document G in England); HSE guidance",
      method:
        "Solar can heat the store well above 60 °C. 48 °C at a bath is the limit for new homes in England (Approved Document G, from memory); care settings use about 41 °C at showers and 44 °C at baths (HSE, from memory). Local rules decide.",
      action: !sf.mixingValve
        ? `Fit a thermostatic mixing valve on the hot outlet of the cylinder and set it to ${SCALD_LIMIT_C.bath} °C or lower (lower where children or older people bathe); follow local rules.`
        : level === "ok"
          ? `No action. Where children or older people bathe, consider ${SCALD_LIMIT_C.careBath} °C at baths and ${SCALD_LIMIT_C.careShower} °C at showers; local rules decide.`
          : `Set the mixing valve to ${SCALD_LIMIT_C.bath} °C or lower and check it at the tap with a thermometer; local rules decide the limit.`,
    });
  }
  if (!s.cylinder) return out;
  const cyl = s.cylinder;
  // Cylinder volume against the collector area.
  if (d.apertureM2 !== undefined) {
    const ratio = cyl.volumeL / d.apertureM2;
    const level: Level =
      ratio >= STORE_PER_M2.ok ? "ok" : ratio >= STORE_PER_M2.low ? "note" : "fix";
    out.push({
      key: "store-size",
      level,
      title:
        level === "ok"
          ? `The ${cyl.volumeL} L cylinder suits ${round(d.apertureM2, 1)} m² of collector`
          : `The ${cyl.volumeL} L cylinder is small for ${round(d.apertureM2, 1)} m² of collector: the loop will stagnate ${level === "fix" ? "on most sunny days" : "often in summer"}`,
      values: [
        { label: "Cylinder volume", value: cyl.volumeL, unit: "L" },
        { label: "Collector aperture", value: round(d.apertureM2, 2), unit: "m²" },
        { label: "Cylinder per m² of collector", value: round(ratio, 0), unit: "L/m²" },
      ],
      source: "Common practice",
      method: `About ${STORE_PER_M2.ok} L of cylinder or more per m² of collector keeps stagnation to the occasional hot day; below about ${STORE_PER_M2.low} L/m² it happens on most sunny days (common practice).`,
      action:
        level === "ok"
          ? "No action."
          : "Use a larger cylinder, fewer collectors, or a heat dump; frequent stagnation ages the fluid, so test it more often.",
    });
  }
  // Coil position.
  const rank = { bottom: 0, middle: 1, top: 2 } as const;
  const solar = cyl.coils.filter((c) => c.heatSource === "solar");
  const lowestSolar = Math.min(...solar.map((c) => rank[c.position]));
  const below = cyl.coils.filter((c) => c.heatSource !== "solar" && rank[c.position] < lowestSolar);
  const coilLevel: Level = below.length ? "fix" : lowestSolar > 0 ? "note" : "ok";
  out.push({
    key: "coil-position",
    level: coilLevel,
    title: below.length
      ? `The ${below.map((c) => c.heatSource.replace("_", " ")).join(" and ")} coil sits below the solar coil: the solar loop gets warm water and little sun is used`
      : lowestSolar > 0
        ? "The solar coil is not at the bottom of the cylinder"
        : "The solar coil is the lowest coil",
    values: cyl.coils.map((c, i) => ({
      label: `Coil ${i + 1} (${c.heatSource.replace("_", " ")})`,
      value: c.position,
    })),
    source: "Common practice",
    action:
      coilLevel === "ok"
        ? "No action. The hot flow from the collector enters the coil at its top."
        : "Feed the solar loop to the lowest coil (a twin-coil solar cylinder has it at the bottom), so the collectors see the coldest water.",
  });
  // Unvented cylinder.
  if (cyl.type === "unvented") {
    out.push({
      key: "unvented",
      level: "note",
      title:
        "Unvented cylinder: its safety devices are separate from the solar loop's and are licensed work",
      values: [{ label: "Cylinder", value: "unvented (mains pressure)" }],
      source: "Local building rules (e.g. Approved Document G in England)",
      method:
        "An unvented cylinder has its own temperature and pressure relief valve, expansion relief and expansion vessel, and a discharge pipe to a safe place; in many places only a person registered for unvented work may fit or change them.",
      action:
        "Have the cylinder's own relief valves, expansion vessel and discharge checked by someone competent under local rules; where local rules require it, the solar loop also needs a high-temperature cut-out that stops it heating the cylinder. Do not take the cylinder's devices for the solar loop's.",
    });
  }
  return out;
}

/** Run the loop check on a system description (complete or draft). */
export function runLoopCheck(draft: SystemDraft | null | undefined): LoopCheckResult {
  const findings: Finding[] = [];
  const s = parseSections(draft ?? {}, findings);
  const charts: LoopCheckResult["charts"] = {};
  const d = derive(s);

  if (s.collectors) findings.push(...collectorOutputFindings(s, d));
  findings.push(stagnationFinding(s, d));
  findings.push(steamReachFinding(s, d));
  findings.push(volumeFinding(d));
  findings.push(...pressureFindings(s, d, charts));
  findings.push(...freezeFindings(s, d, charts));
  findings.push(fluidFinding(s, d));
  findings.push(...flowFindings(s, d));
  findings.push(pipeInsulationFinding(s, d));
  findings.push(componentRatingsFinding(s, d));
  findings.push(...cylinderFindings(s, d));

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
