import { z } from "@/lib/zod";
import { REGION_IDS } from "@/lib/regions";
import { COPPER_TUBE_IDS } from "@/lib/calc/tubes";

/**
 * The system description of one solar primary loop: one schema for the forms, the server
 * actions, the route handlers and the loop check. Units are in the field names
 * (M metres, Mm millimetres, M2 square metres, L litres, Bar bar gauge, C degrees Celsius,
 * Lph litres per hour, Deg degrees). Bounds are what a domestic system can physically have;
 * they reject typing slips (a 60 m² collector, a 60 bar relief valve), not unusual designs.
 */

/** "1 collector", "2 collectors": a counted word loses its "s" for one; symbols stay as they are. */
const countUnit = (n: number, unit: string) =>
  n === 1 && /^[a-z]+s$/.test(unit) ? unit.slice(0, -1) : unit;

const num = (min: number, max: number, unit: string) =>
  z
    .number({ error: `Enter a number (${unit})` })
    .min(min, `At least ${min} ${countUnit(min, unit)}`)
    .max(max, `At most ${max} ${countUnit(max, unit)}`);

const int = (min: number, max: number, unit: string) =>
  num(min, max, unit).int("Whole numbers only");

export const collectorTypes = ["flat_plate", "evacuated_tube"] as const;
export const jointKinds = ["compression", "press", "brazed", "soft_soldered"] as const;
export const ventKinds = ["none", "manual", "automatic_isolatable", "automatic"] as const;
export const heatSources = ["solar", "boiler", "solid_fuel", "heat_pump"] as const;
export const glycolTypes = ["propylene", "ethylene", "none"] as const;
/** How well the collector empties of liquid when it boils (VDI 6002-1 steam-producing power). */
export const emptyingKinds = ["good", "poor", "unknown"] as const;
/** Low-flow 12–24 L/(m²·h) (Kalogirou 2009) or high-flow 30–50 (common practice). */
export const flowModes = ["high_flow", "low_flow"] as const;

export const siteSchema = z.object({
  region: z.enum(REGION_IDS, { error: "Choose a region" }),
  postcodeArea: z
    .string()
    .trim()
    .max(8, "At most 8 characters")
    .regex(/^[A-Za-z0-9 ]*$/, "Letters and digits only")
    .optional(),
  designMinTempC: num(-45, 15, "°C"),
});

export const collectorArraySchema = z
  .object({
    type: z.enum(collectorTypes, { error: "Choose flat plate or evacuated tube" }),
    count: int(1, 40, "collectors"),
    grossAreaM2Each: num(0.3, 8, "m²"),
    apertureAreaM2Each: num(0.2, 8, "m²"),
    fluidContentLEach: num(0.1, 15, "L"),
    eta0: num(0.3, 0.95, "").optional(),
    a1: num(0, 15, "W/(m²·K)").optional(),
    a2: num(0, 0.2, "W/(m²·K²)").optional(),
    tiltDeg: num(0, 90, "°"),
    /** 0 = due south (north in the southern hemisphere), negative east, positive west. */
    azimuthDeg: num(-180, 180, "°"),
    highPointVent: z.enum(ventKinds),
    ventMaxTempC: num(60, 250, "°C").optional(),
    /** From the collector's EN ISO 9806 test report. */
    stagnationTempC: num(100, 350, "°C").optional(),
    emptying: z.enum(emptyingKinds).default("unknown"),
    /** The collector's maximum operating pressure (data plate or test report). */
    maxPressureBar: num(2, 25, "bar").optional(),
    flowMode: z.enum(flowModes).default("high_flow"),
    /** The collector maker's specific flow, when given: it replaces the low/high-flow figure. */
    makerFlowLphM2: num(5, 100, "L/(m²·h)").optional(),
    /** Pressure drop of the whole array at the design flow, from the maker's figures. */
    pressureDropKPa: num(0, 200, "kPa").optional(),
  })
  .refine((c) => c.apertureAreaM2Each <= c.grossAreaM2Each, {
    path: ["apertureAreaM2Each"],
    message: "Aperture area cannot be larger than gross area",
  });

export const pipeRunSchema = z
  .object({
    label: z.string().trim().min(1, "Name the run").max(60),
    material: z.enum(["copper", "stainless_flex"]),
    copperSize: z.enum(COPPER_TUBE_IDS).optional(),
    /** Flexible corrugated pipe: bore and content come from the maker's figures. */
    flexBoreMm: num(8, 40, "mm").optional(),
    flexContentLPerM: num(0.03, 1.5, "L/m").optional(),
    lengthM: num(0.1, 150, "m"),
    insulated: z.boolean(),
    /** Insulation wall thickness; 20 mm is assumed for an insulated run when not given. */
    insulationMm: num(5, 100, "mm").optional(),
    fittingsCount: int(0, 100, "fittings"),
  })
  .superRefine((run, ctx) => {
    if (run.material === "copper" && !run.copperSize) {
      ctx.addIssue({ code: "custom", path: ["copperSize"], message: "Choose a tube size" });
    }
  });

export const pumpStationSchema = z
  .object({
    staticHeightM: num(0, 40, "m"),
    reliefValveBar: num(1.5, 10, "bar"),
    flowMeterMinLph: num(0, 3000, "L/h"),
    flowMeterMaxLph: num(10, 3000, "L/h"),
    pumpMaxTempC: num(40, 200, "°C"),
    pumpMaxHeadM: num(0.5, 20, "m").optional(),
    stationContentL: num(0, 10, "L"),
    /** The lowest maximum-pressure rating of any valve, meter or seal in the loop. */
    lowestComponentMaxBar: num(2, 25, "bar").optional(),
    /** Pipe between the collector and the pump station, flow and return together; all runs when not given. */
    pipeToStationM: num(0, 300, "m").optional(),
  })
  .refine((p) => p.flowMeterMaxLph > p.flowMeterMinLph, {
    path: ["flowMeterMaxLph"],
    message: "The top of the flow meter's range must be above the bottom",
  });

export const expansionVesselSchema = z.object({
  nominalVolumeL: num(2, 300, "L"),
  prechargeBar: num(0.3, 6, "bar"),
  maxPressureBar: num(2, 16, "bar"),
  diaphragmMaxTempC: num(40, 160, "°C"),
  /** On an uninsulated leg below its connection, or behind an intermediate cooling vessel. */
  onCoolingLeg: z.boolean(),
  /** An intermediate (cooling) vessel between the loop and the expansion vessel, if fitted. */
  intermediateVesselL: num(1, 100, "L").optional(),
});

export const fluidSchema = z
  .object({
    glycolType: z.enum(glycolTypes),
    glycolPercentMass: num(0, 60, "% by mass"),
    solarRated: z.boolean(),
  })
  .refine((f) => f.glycolType !== "none" || f.glycolPercentMass === 0, {
    path: ["glycolPercentMass"],
    message: "Plain water has 0 % glycol",
  });

export const coilSchema = z.object({
  heatSource: z.enum(heatSources),
  position: z.enum(["bottom", "middle", "top"]),
  contentL: num(0.2, 30, "L"),
});

export const cylinderSchema = z
  .object({
    volumeL: num(50, 2000, "L"),
    type: z.enum(["vented", "unvented"]),
    coils: z.array(coilSchema).min(1, "Add the solar coil").max(4, "At most 4 coils"),
    immersionHeater: z.boolean(),
    /** The solar coil's maximum operating pressure (cylinder data plate). */
    solarCoilMaxBar: num(2, 25, "bar").optional(),
  })
  .refine((c) => c.coils.some((coil) => coil.heatSource === "solar"), {
    path: ["coils"],
    message: "One coil must be fed by the solar loop",
  });

export const safetySchema = z.object({
  jointsAtCollector: z.enum(jointKinds),
  checkValve: z.boolean(),
  airSeparator: z.boolean(),
  airSeparatorMaxTempC: num(60, 250, "°C").optional(),
  mixingValve: z.boolean(),
  mixingValveSetC: num(35, 65, "°C").optional(),
  insulationMaxTempC: num(60, 300, "°C").optional(),
});

export const designSchema = z
  .object({
    fillTempC: num(2, 40, "°C"),
    /** Highest liquid temperature for the expansion; never below 120 °C (common practice). */
    maxLiquidTempC: num(120, 160, "°C"),
    /** A steam reach known better than the estimate (a stagnation test, a reviewer's figure). */
    steamReachM: num(0, 300, "m").optional(),
    steamReachReason: z.string().trim().max(200, "At most 200 characters").optional(),
  })
  .refine((d) => d.steamReachM === undefined || (d.steamReachReason ?? "").length >= 10, {
    path: ["steamReachReason"],
    message: "Say where the steam reach comes from (at least 10 characters)",
  })
  .default({ fillTempC: 15, maxLiquidTempC: 120 });

export const systemSchema = z.object({
  site: siteSchema,
  collectors: collectorArraySchema,
  pipeRuns: z.array(pipeRunSchema).min(1, "Add at least one pipe run").max(30, "At most 30 runs"),
  pumpStation: pumpStationSchema,
  expansionVessel: expansionVesselSchema,
  fluid: fluidSchema,
  cylinder: cylinderSchema,
  safety: safetySchema,
  design: designSchema,
});

export type SystemInput = z.input<typeof systemSchema>;
export type System = z.output<typeof systemSchema>;

/**
 * The sections of a description in the order the stepped form asks for them: the keys of
 * `systemSchema`, so a new section is added there and nowhere else.
 */
export type SystemSection = keyof typeof systemSchema.shape;
export const systemSections = Object.keys(systemSchema.shape) as readonly SystemSection[];

/**
 * A draft: any section may be missing or half-filled (a homeowner saves step by step).
 * The loop check takes drafts and says what is missing instead of failing.
 */
export type SystemDraft = { [K in SystemSection]?: unknown };

export const systemDraftSchema = z.object(
  Object.fromEntries(systemSections.map((s) => [s, z.unknown().optional()])) as Record<
    SystemSection,
    z.ZodOptional<z.ZodUnknown>
  >,
);

/** Each step's schema, for saving one step of a draft at a time. */
export const sectionSchemas: { [K in SystemSection]: (typeof systemSchema.shape)[K] } =
  systemSchema.shape;
