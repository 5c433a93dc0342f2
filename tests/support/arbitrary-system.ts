import fc from "fast-check";
import { REGION_IDS } from "@/lib/regions";
import { COPPER_TUBE_IDS } from "@/lib/calc/tubes";
import type { SystemInput } from "@/lib/validation/system";

const d = (min: number, max: number) =>
  fc.double({ min, max, noNaN: true, noDefaultInfinity: true });

/** Random systems inside the schema's bounds (used by the property tests and the benchmark). */
export const arbitrarySystem: fc.Arbitrary<SystemInput> = fc
  .record({
    region: fc.constantFrom(...REGION_IDS),
    designMinTempC: d(-45, 15),
    type: fc.constantFrom("flat_plate" as const, "evacuated_tube" as const),
    count: fc.integer({ min: 1, max: 40 }),
    gross: d(0.5, 8),
    apertureShare: d(0.5, 1),
    content: d(0.1, 15),
    coeffs: fc.option(fc.record({ eta0: d(0.3, 0.95), a1: d(0.5, 15), a2: d(0, 0.2) }), {
      nil: undefined,
    }),
    tilt: d(0, 90),
    azimuth: d(-180, 180),
    vent: fc.constantFrom(
      "none" as const,
      "manual" as const,
      "automatic_isolatable" as const,
      "automatic" as const,
    ),
    runs: fc.array(
      fc.record({
        copper: fc.boolean(),
        size: fc.constantFrom(...COPPER_TUBE_IDS),
        bore: d(8, 40),
        length: d(0.1, 150),
        steam: fc.boolean(),
        fittings: fc.integer({ min: 0, max: 100 }),
      }),
      { minLength: 1, maxLength: 6 },
    ),
    staticHeight: d(0, 40),
    relief: d(1.5, 10),
    meterMin: d(0, 500),
    meterSpan: d(10, 2500),
    pumpTemp: d(40, 200),
    head: fc.option(d(0.5, 20), { nil: undefined }),
    vesselL: d(2, 300),
    precharge: d(0.3, 6),
    vesselMax: d(2, 16),
    diaphragm: d(40, 160),
    cooling: fc.boolean(),
    glycolType: fc.constantFrom("propylene" as const, "ethylene" as const, "none" as const),
    glycol: d(0, 60),
    solarRated: fc.boolean(),
    cylinderL: d(50, 2000),
    unvented: fc.boolean(),
    extraCoil: fc.boolean(),
    joints: fc.constantFrom(
      "compression" as const,
      "press" as const,
      "brazed" as const,
      "soft_soldered" as const,
    ),
    fill: d(2, 40),
    maxT: d(80, 150),
  })
  .map((r): SystemInput => ({
    site: { region: r.region, designMinTempC: r.designMinTempC },
    collectors: {
      type: r.type,
      count: r.count,
      grossAreaM2Each: r.gross,
      apertureAreaM2Each: r.gross * r.apertureShare,
      fluidContentLEach: r.content,
      ...(r.coeffs ?? {}),
      tiltDeg: r.tilt,
      azimuthDeg: r.azimuth,
      highPointVent: r.vent,
    },
    pipeRuns: r.runs.map((run, i) => ({
      label: `Run ${i + 1}`,
      material: run.copper ? ("copper" as const) : ("stainless_flex" as const),
      copperSize: run.copper ? run.size : undefined,
      flexBoreMm: run.copper ? undefined : run.bore,
      lengthM: run.length,
      insulated: true,
      inSteamReach: run.steam,
      fittingsCount: run.fittings,
    })),
    pumpStation: {
      staticHeightM: r.staticHeight,
      reliefValveBar: r.relief,
      flowMeterMinLph: r.meterMin,
      flowMeterMaxLph: Math.min(3000, r.meterMin + r.meterSpan),
      pumpMaxTempC: r.pumpTemp,
      pumpMaxHeadM: r.head,
      stationContentL: 1,
    },
    expansionVessel: {
      nominalVolumeL: r.vesselL,
      prechargeBar: r.precharge,
      maxPressureBar: r.vesselMax,
      diaphragmMaxTempC: r.diaphragm,
      onCoolingLeg: r.cooling,
    },
    fluid: {
      glycolType: r.glycolType,
      glycolPercentMass: r.glycolType === "none" ? 0 : r.glycol,
      solarRated: r.solarRated,
    },
    cylinder: {
      volumeL: r.cylinderL,
      type: r.unvented ? "unvented" : "vented",
      coils: [
        { heatSource: "solar", position: "bottom", contentL: 4 },
        ...(r.extraCoil
          ? [{ heatSource: "boiler" as const, position: "top" as const, contentL: 3 }]
          : []),
      ],
      immersionHeater: false,
    },
    safety: {
      jointsAtCollector: r.joints,
      checkValve: true,
      airSeparator: true,
      mixingValve: true,
    },
    design: { fillTempC: r.fill, maxLiquidTempC: r.maxT },
  }));
