import { REGIONS } from "@/lib/regions";
import { COPPER_TUBES } from "@/lib/calc/tubes";

/**
 * The fields of the system description, as data: the public loop-check form and the
 * project's stepped form both render from this list, so labels and units live in one place.
 */
export type FieldDef =
  | {
      kind: "number";
      name: string;
      label: string;
      unit?: string;
      optional?: boolean;
      step?: string;
      hint?: string;
    }
  | {
      kind: "select";
      name: string;
      label: string;
      options: readonly { value: string; label: string }[];
      hint?: string;
    }
  | { kind: "checkbox"; name: string; label: string; hint?: string }
  | { kind: "text"; name: string; label: string; optional?: boolean; hint?: string };

export interface SectionDef {
  id:
    | "site"
    | "collectors"
    | "pipeRuns"
    | "pumpStation"
    | "expansionVessel"
    | "fluid"
    | "cylinder"
    | "safety"
    | "design";
  title: string;
  fields: FieldDef[];
  /** For repeatable lists (pipe runs, coils): the fields of one row. */
  list?: { name: string; itemLabel: string; fields: FieldDef[]; empty: Record<string, unknown> };
}

export const SECTIONS: SectionDef[] = [
  {
    id: "site",
    title: "Site",
    fields: [
      {
        kind: "select",
        name: "site.region",
        label: "Region",
        options: REGIONS.map((r) => ({ value: r.id, label: r.name })),
      },
      {
        kind: "text",
        name: "site.postcodeArea",
        label: "Postcode area",
        optional: true,
        hint: "The first half only, e.g. AB1",
      },
      {
        kind: "number",
        name: "site.designMinTempC",
        label: "Design minimum outdoor temperature",
        unit: "°C",
        step: "0.5",
      },
    ],
  },
  {
    id: "collectors",
    title: "Collector array",
    fields: [
      {
        kind: "select",
        name: "collectors.type",
        label: "Collector type",
        options: [
          { value: "flat_plate", label: "Flat plate" },
          { value: "evacuated_tube", label: "Evacuated tube" },
        ],
      },
      { kind: "number", name: "collectors.count", label: "Number of collectors", step: "1" },
      {
        kind: "number",
        name: "collectors.grossAreaM2Each",
        label: "Gross area, each",
        unit: "m²",
        step: "0.01",
      },
      {
        kind: "number",
        name: "collectors.apertureAreaM2Each",
        label: "Aperture area, each",
        unit: "m²",
        step: "0.01",
      },
      {
        kind: "number",
        name: "collectors.fluidContentLEach",
        label: "Fluid content, each",
        unit: "L",
        step: "0.01",
      },
      {
        kind: "number",
        name: "collectors.eta0",
        label: "η₀ (optical efficiency)",
        optional: true,
        step: "0.001",
        hint: "From the EN ISO 9806 test report, if you have it",
      },
      {
        kind: "number",
        name: "collectors.a1",
        label: "a₁",
        unit: "W/(m²·K)",
        optional: true,
        step: "0.001",
      },
      {
        kind: "number",
        name: "collectors.a2",
        label: "a₂",
        unit: "W/(m²·K²)",
        optional: true,
        step: "0.0001",
      },
      { kind: "number", name: "collectors.tiltDeg", label: "Tilt", unit: "°", step: "1" },
      {
        kind: "number",
        name: "collectors.azimuthDeg",
        label: "Azimuth from south",
        unit: "°",
        step: "1",
        hint: "Negative east, positive west",
      },
      {
        kind: "select",
        name: "collectors.highPointVent",
        label: "Vent at the high point",
        options: [
          { value: "none", label: "None" },
          { value: "manual", label: "Manual vent" },
          { value: "automatic_isolatable", label: "Automatic vent with isolating valve" },
          { value: "automatic", label: "Automatic vent, no isolation" },
        ],
      },
      {
        kind: "number",
        name: "collectors.ventMaxTempC",
        label: "Vent temperature rating",
        unit: "°C",
        optional: true,
        step: "1",
      },
      {
        kind: "number",
        name: "collectors.stagnationTempC",
        label: "Stagnation temperature",
        unit: "°C",
        optional: true,
        step: "1",
        hint: "From the collector's test report; a cautious typical figure is used if empty",
      },
      {
        kind: "select",
        name: "collectors.emptying",
        label: "How the collector empties when it boils",
        options: [
          { value: "unknown", label: "Not known" },
          { value: "good", label: "Empties well (the maker says so)" },
          { value: "poor", label: "Empties poorly" },
        ],
        hint: "Decides how far steam travels down the pipes",
      },
      {
        kind: "number",
        name: "collectors.maxPressureBar",
        label: "Collector maximum operating pressure",
        unit: "bar",
        optional: true,
        step: "0.5",
      },
      {
        kind: "select",
        name: "collectors.flowMode",
        label: "Flow through the collectors",
        options: [
          { value: "high_flow", label: "High-flow (30–50 L per m² per hour)" },
          { value: "low_flow", label: "Low-flow (12–24 L per m² per hour)" },
        ],
      },
      {
        kind: "number",
        name: "collectors.makerFlowLphM2",
        label: "Maker's flow per m² of collector",
        unit: "L/(m²·h)",
        optional: true,
        step: "1",
        hint: "If the maker gives one, it replaces the figure above",
      },
      {
        kind: "number",
        name: "collectors.pressureDropKPa",
        label: "Collector array pressure drop at that flow",
        unit: "kPa",
        optional: true,
        step: "0.1",
      },
    ],
  },
  {
    id: "pipeRuns",
    title: "Pipe runs",
    fields: [],
    list: {
      name: "pipeRuns",
      itemLabel: "Pipe run",
      empty: {
        label: "",
        material: "copper",
        copperSize: "15x0.7",
        lengthM: 5,
        insulated: true,
        fittingsCount: 4,
      },
      fields: [
        { kind: "text", name: "label", label: "Name" },
        {
          kind: "select",
          name: "material",
          label: "Material",
          options: [
            { value: "copper", label: "Copper (EN 1057)" },
            { value: "stainless_flex", label: "Flexible stainless" },
          ],
        },
        {
          kind: "select",
          name: "copperSize",
          label: "Copper tube size",
          options: COPPER_TUBES.map((t) => ({
            value: t.id,
            label: `${t.outerMm} × ${t.wallMm} mm`,
          })),
        },
        {
          kind: "number",
          name: "flexBoreMm",
          label: "Flexible pipe bore",
          unit: "mm",
          optional: true,
          step: "0.1",
        },
        {
          kind: "number",
          name: "flexContentLPerM",
          label: "Flexible pipe content",
          unit: "L/m",
          optional: true,
          step: "0.01",
        },
        {
          kind: "number",
          name: "lengthM",
          label: "Length (flow and return together)",
          unit: "m",
          step: "0.1",
        },
        { kind: "number", name: "fittingsCount", label: "Bends, tees and valves", step: "1" },
        { kind: "checkbox", name: "insulated", label: "Insulated" },
        {
          kind: "number",
          name: "insulationMm",
          label: "Insulation thickness",
          unit: "mm",
          optional: true,
          step: "1",
          hint: "20 mm is assumed if empty",
        },
      ],
    },
  },
  {
    id: "pumpStation",
    title: "Pump station",
    fields: [
      {
        kind: "number",
        name: "pumpStation.staticHeightM",
        label: "Static height, pump station to collector top",
        unit: "m",
        step: "0.1",
      },
      {
        kind: "number",
        name: "pumpStation.reliefValveBar",
        label: "Relief valve setting",
        unit: "bar",
        step: "0.1",
      },
      {
        kind: "number",
        name: "pumpStation.flowMeterMinLph",
        label: "Flow meter range, from",
        unit: "L/h",
        step: "1",
      },
      {
        kind: "number",
        name: "pumpStation.flowMeterMaxLph",
        label: "Flow meter range, to",
        unit: "L/h",
        step: "1",
      },
      {
        kind: "number",
        name: "pumpStation.pumpMaxTempC",
        label: "Circulator temperature rating",
        unit: "°C",
        step: "1",
      },
      {
        kind: "number",
        name: "pumpStation.pumpMaxHeadM",
        label: "Circulator maximum head",
        unit: "m",
        optional: true,
        step: "0.1",
      },
      {
        kind: "number",
        name: "pumpStation.stationContentL",
        label: "Pump station fluid content",
        unit: "L",
        step: "0.1",
      },
      {
        kind: "number",
        name: "pumpStation.lowestComponentMaxBar",
        label: "Lowest pressure rating of any loop component",
        unit: "bar",
        optional: true,
        step: "0.1",
      },
      {
        kind: "number",
        name: "pumpStation.pipeToStationM",
        label: "Pipe from the collector to the pump station (flow and return together)",
        unit: "m",
        optional: true,
        step: "0.1",
        hint: "Leave empty if the station is at the end of the pipe runs",
      },
    ],
  },
  {
    id: "expansionVessel",
    title: "Expansion vessel",
    fields: [
      {
        kind: "number",
        name: "expansionVessel.nominalVolumeL",
        label: "Nominal volume",
        unit: "L",
        step: "1",
      },
      {
        kind: "number",
        name: "expansionVessel.prechargeBar",
        label: "Pre-charge",
        unit: "bar",
        step: "0.1",
      },
      {
        kind: "number",
        name: "expansionVessel.maxPressureBar",
        label: "Maximum pressure",
        unit: "bar",
        step: "0.5",
      },
      {
        kind: "number",
        name: "expansionVessel.diaphragmMaxTempC",
        label: "Diaphragm temperature rating",
        unit: "°C",
        step: "1",
      },
      {
        kind: "checkbox",
        name: "expansionVessel.onCoolingLeg",
        label: "Hangs below its connection on an uninsulated cooling leg",
      },
      {
        kind: "number",
        name: "expansionVessel.intermediateVesselL",
        label: "Intermediate (cooling) vessel, if fitted",
        unit: "L",
        optional: true,
        step: "1",
      },
    ],
  },
  {
    id: "fluid",
    title: "Heat-transfer fluid",
    fields: [
      {
        kind: "select",
        name: "fluid.glycolType",
        label: "Glycol",
        options: [
          { value: "propylene", label: "Propylene glycol" },
          { value: "ethylene", label: "Ethylene glycol" },
          { value: "none", label: "None (plain water)" },
        ],
      },
      {
        kind: "number",
        name: "fluid.glycolPercentMass",
        label: "Glycol concentration",
        unit: "% by mass",
        step: "1",
      },
      { kind: "checkbox", name: "fluid.solarRated", label: "Sold as a solar heat-transfer fluid" },
    ],
  },
  {
    id: "cylinder",
    title: "Cylinder and coils",
    fields: [
      { kind: "number", name: "cylinder.volumeL", label: "Cylinder volume", unit: "L", step: "1" },
      {
        kind: "select",
        name: "cylinder.type",
        label: "Cylinder type",
        options: [
          { value: "unvented", label: "Unvented (mains pressure)" },
          { value: "vented", label: "Vented (fed from a cold tank)" },
        ],
      },
      { kind: "checkbox", name: "cylinder.immersionHeater", label: "Has an immersion heater" },
      {
        kind: "number",
        name: "cylinder.solarCoilMaxBar",
        label: "Solar coil maximum operating pressure",
        unit: "bar",
        optional: true,
        step: "0.5",
      },
    ],
    list: {
      name: "cylinder.coils",
      itemLabel: "Coil",
      empty: { heatSource: "boiler", position: "top", contentL: 3 },
      fields: [
        {
          kind: "select",
          name: "heatSource",
          label: "Fed by",
          options: [
            { value: "solar", label: "Solar loop" },
            { value: "boiler", label: "Boiler" },
            { value: "solid_fuel", label: "Solid-fuel stove" },
            { value: "heat_pump", label: "Heat pump" },
          ],
        },
        {
          kind: "select",
          name: "position",
          label: "Position",
          options: [
            { value: "bottom", label: "Bottom" },
            { value: "middle", label: "Middle" },
            { value: "top", label: "Top" },
          ],
        },
        { kind: "number", name: "contentL", label: "Coil content", unit: "L", step: "0.1" },
      ],
    },
  },
  {
    id: "safety",
    title: "Fittings and safety devices",
    fields: [
      {
        kind: "select",
        name: "safety.jointsAtCollector",
        label: "Joints at the collector",
        options: [
          { value: "compression", label: "Compression" },
          { value: "press", label: "Press (high-temperature seals)" },
          { value: "brazed", label: "Brazed" },
          { value: "soft_soldered", label: "Soft-soldered" },
        ],
      },
      {
        kind: "number",
        name: "safety.insulationMaxTempC",
        label: "Collector pipe insulation rating",
        unit: "°C",
        optional: true,
        step: "1",
      },
      { kind: "checkbox", name: "safety.checkValve", label: "Check valve fitted" },
      { kind: "checkbox", name: "safety.airSeparator", label: "Air separator in the flow line" },
      {
        kind: "number",
        name: "safety.airSeparatorMaxTempC",
        label: "Air separator temperature rating",
        unit: "°C",
        optional: true,
        step: "1",
      },
      {
        kind: "checkbox",
        name: "safety.mixingValve",
        label: "Thermostatic mixing valve at the outlet",
      },
      {
        kind: "number",
        name: "safety.mixingValveSetC",
        label: "Mixing valve setting",
        unit: "°C",
        optional: true,
        step: "1",
      },
    ],
  },
  {
    id: "design",
    title: "Design temperatures",
    fields: [
      {
        kind: "number",
        name: "design.fillTempC",
        label: "Fluid temperature at filling",
        unit: "°C",
        step: "1",
      },
      {
        kind: "number",
        name: "design.maxLiquidTempC",
        label: "Highest liquid temperature",
        unit: "°C",
        step: "1",
        hint: "120 °C unless a reviewer advises otherwise",
      },
      {
        kind: "number",
        name: "design.steamReachM",
        label: "Steam reach, if known better than the estimate",
        unit: "m",
        optional: true,
        step: "0.1",
        hint: "Only with a reason, e.g. a stagnation test",
      },
      {
        kind: "text",
        name: "design.steamReachReason",
        label: "Where that steam reach comes from",
        optional: true,
      },
    ],
  },
];
