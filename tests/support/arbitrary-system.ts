import fc from "fast-check";
import { REGION_IDS } from "@/lib/regions";
import { COPPER_TUBE_IDS } from "@/lib/calc/tubes";
import type { SystemInput } from "@/lib/validation/system";

const d = (min: number, max: number) =>
  fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
const maybe = <T>(a: fc.Arbitrary<T>) => fc.option(a, { nil: undefined });
const position = fc.constantFrom("bottom" as const, "middle" as const, "top" as const);

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
    coeffs: maybe(fc.record({ eta0: d(0.3, 0.95), a1: d(0.5, 15), a2: d(0, 0.2) })),
    tilt: d(0, 90),
    azimuth: d(-180, 180),
    vent: fc.constantFrom(
      "none" as const,
      "manual" as const,
      "automatic_isolatable" as const,
      "automatic" as const,
    ),
    ventMax: maybe(d(60, 250)),
    stagnation: maybe(d(100, 350)),
    emptying: fc.constantFrom("good" as const, "poor" as const, "unknown" as const),
    collectorMaxBar: maybe(d(2, 25)),
    flowMode: fc.constantFrom("high_flow" as const, "low_flow" as const),
    makerFlow: maybe(d(5, 100)),
    arrayDrop: maybe(d(0, 200)),
    runs: fc.array(
      fc.record({
        copper: fc.boolean(),
        size: fc.constantFrom(...COPPER_TUBE_IDS),
        bore: d(8, 40),
        length: d(0.1, 150),
        insulated: fc.boolean(),
        insulationMm: maybe(d(5, 100)),
        fittings: fc.integer({ min: 0, max: 100 }),
      }),
      { minLength: 1, maxLength: 6 },
    ),
    staticHeight: d(0, 40),
    relief: d(1.5, 10),
    meterMin: d(0, 500),
    meterSpan: d(10, 2500),
    pumpTemp: d(40, 200),
    head: maybe(d(0.5, 20)),
    lowestBar: maybe(d(2, 25)),
    pipeToStation: maybe(d(0, 300)),
    vesselL: d(2, 300),
    precharge: d(0.3, 6),
    vesselMax: d(2, 16),
    diaphragm: d(40, 160),
    cooling: fc.boolean(),
    intermediate: maybe(d(1, 100)),
    glycolType: fc.constantFrom("propylene" as const, "ethylene" as const, "none" as const),
    glycol: d(0, 60),
    solarRated: fc.boolean(),
    cylinderL: d(50, 2000),
    unvented: fc.boolean(),
    solarPosition: position,
    extraCoil: maybe(position),
    coilMaxBar: maybe(d(2, 25)),
    joints: fc.constantFrom(
      "compression" as const,
      "press" as const,
      "brazed" as const,
      "soft_soldered" as const,
    ),
    checkValve: fc.boolean(),
    airSeparator: fc.boolean(),
    airSeparatorMax: maybe(d(60, 250)),
    mixingValve: fc.boolean(),
    mixingSet: maybe(d(35, 65)),
    insulationMax: maybe(d(60, 300)),
    fill: d(2, 40),
    maxT: d(120, 160),
    reach: maybe(d(0, 300)),
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
      ventMaxTempC: r.ventMax,
      stagnationTempC: r.stagnation,
      emptying: r.emptying,
      maxPressureBar: r.collectorMaxBar,
      flowMode: r.flowMode,
      makerFlowLphM2: r.makerFlow,
      pressureDropKPa: r.arrayDrop,
    },
    pipeRuns: r.runs.map((run, i) => ({
      label: `Run ${i + 1}`,
      material: run.copper ? ("copper" as const) : ("stainless_flex" as const),
      copperSize: run.copper ? run.size : undefined,
      flexBoreMm: run.copper ? undefined : run.bore,
      lengthM: run.length,
      insulated: run.insulated,
      insulationMm: run.insulationMm,
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
      lowestComponentMaxBar: r.lowestBar,
      pipeToStationM: r.pipeToStation,
    },
    expansionVessel: {
      nominalVolumeL: r.vesselL,
      prechargeBar: r.precharge,
      maxPressureBar: r.vesselMax,
      diaphragmMaxTempC: r.diaphragm,
      onCoolingLeg: r.cooling,
      intermediateVesselL: r.intermediate,
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
        { heatSource: "solar", position: r.solarPosition, contentL: 4 },
        ...(r.extraCoil
          ? [{ heatSource: "boiler" as const, position: r.extraCoil, contentL: 3 }]
          : []),
      ],
      immersionHeater: false,
      solarCoilMaxBar: r.coilMaxBar,
    },
    safety: {
      jointsAtCollector: r.joints,
      checkValve: r.checkValve,
      airSeparator: r.airSeparator,
      airSeparatorMaxTempC: r.airSeparatorMax,
      mixingValve: r.mixingValve,
      mixingValveSetC: r.mixingSet,
      insulationMaxTempC: r.insulationMax,
    },
    design: {
      fillTempC: r.fill,
      maxLiquidTempC: r.maxT,
      ...(r.reach !== undefined
        ? { steamReachM: r.reach, steamReachReason: "measured at a stagnation test" }
        : {}),
    },
  }));
