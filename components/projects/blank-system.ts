import type { SystemDraft, SystemInput } from "@/lib/validation/system";

/**
 * What a new project's form starts from: choices pre-set to the common case, every measured
 * number left empty for the homeowner to fill in (the loop check never guesses a measurement).
 */
export const BLANK_SYSTEM = {
  site: { region: "south-west", postcodeArea: "", designMinTempC: undefined },
  collectors: {
    type: "flat_plate",
    count: 2,
    grossAreaM2Each: undefined,
    apertureAreaM2Each: undefined,
    fluidContentLEach: undefined,
    tiltDeg: undefined,
    azimuthDeg: 0,
    highPointVent: "manual",
    emptying: "unknown",
    flowMode: "high_flow",
  },
  pipeRuns: [
    {
      label: "Roof to cylinder",
      material: "copper",
      copperSize: "15x0.7",
      lengthM: undefined,
      insulated: true,
      fittingsCount: 8,
    },
  ],
  pumpStation: {
    staticHeightM: undefined,
    reliefValveBar: 6,
    flowMeterMinLph: undefined,
    flowMeterMaxLph: undefined,
    pumpMaxTempC: undefined,
    stationContentL: 1,
  },
  expansionVessel: {
    nominalVolumeL: undefined,
    prechargeBar: undefined,
    maxPressureBar: undefined,
    diaphragmMaxTempC: undefined,
    onCoolingLeg: true,
  },
  fluid: { glycolType: "propylene", glycolPercentMass: 40, solarRated: true },
  cylinder: {
    volumeL: undefined,
    type: "unvented",
    coils: [{ heatSource: "solar", position: "bottom", contentL: undefined }],
    immersionHeater: true,
  },
  safety: {
    jointsAtCollector: "compression",
    checkValve: true,
    airSeparator: true,
    mixingValve: true,
  },
  design: { fillTempC: 15, maxLiquidTempC: 120 },
} as unknown as SystemInput;

export function formDefaults(saved: SystemDraft): SystemInput {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(BLANK_SYSTEM))
    out[k] = (saved as Record<string, unknown>)[k] ?? v;
  return out as SystemInput;
}
