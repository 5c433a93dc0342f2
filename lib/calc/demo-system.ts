import type { SystemInput } from "@/lib/validation/system";

/**
 * The example system on the public loop-check page: an invented two-storey house with two
 * flat-plate collectors on a south-west roof. Demo figures, not from any real installation.
 * Its 12 L vessel is deliberately too small once the steam reach is computed, so the example
 * shows what the check finds.
 */
export const demoSystem: SystemInput = {
  site: { region: "south-west", postcodeArea: "", designMinTempC: -12 },
  collectors: {
    type: "flat_plate",
    count: 2,
    grossAreaM2Each: 2.3,
    apertureAreaM2Each: 2.1,
    fluidContentLEach: 1.6,
    tiltDeg: 40,
    azimuthDeg: 20,
    highPointVent: "manual",
    emptying: "unknown",
    maxPressureBar: 10,
    flowMode: "high_flow",
  },
  pipeRuns: [
    {
      label: "Roof to loft",
      material: "copper",
      copperSize: "15x0.7",
      lengthM: 4,
      insulated: true,
      fittingsCount: 4,
    },
    {
      label: "Loft to cylinder",
      material: "copper",
      copperSize: "15x0.7",
      lengthM: 22,
      insulated: true,
      fittingsCount: 12,
    },
  ],
  pumpStation: {
    staticHeightM: 8,
    reliefValveBar: 6,
    flowMeterMinLph: 60,
    flowMeterMaxLph: 480,
    pumpMaxTempC: 110,
    pumpMaxHeadM: 6,
    stationContentL: 1,
    lowestComponentMaxBar: 10,
  },
  expansionVessel: {
    nominalVolumeL: 12,
    prechargeBar: 1.2,
    maxPressureBar: 8,
    diaphragmMaxTempC: 100,
    onCoolingLeg: true,
  },
  fluid: { glycolType: "propylene", glycolPercentMass: 40, solarRated: true },
  cylinder: {
    volumeL: 210,
    type: "unvented",
    coils: [
      { heatSource: "solar", position: "bottom", contentL: 4.5 },
      { heatSource: "boiler", position: "top", contentL: 3 },
    ],
    immersionHeater: true,
    solarCoilMaxBar: 10,
  },
  safety: {
    jointsAtCollector: "compression",
    checkValve: true,
    airSeparator: true,
    airSeparatorMaxTempC: 180,
    mixingValve: true,
    mixingValveSetC: 48,
    insulationMaxTempC: 175,
  },
  design: { fillTempC: 15, maxLiquidTempC: 120 },
};
