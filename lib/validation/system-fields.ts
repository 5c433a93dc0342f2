/**
 * The words for the system description: one label (with unit, hint, option labels and the
 * blank form's starting value) per field of `systemSchema`. Everything else about a field —
 * its path, kind (number, choice, tick box, text), whether it is optional, its options, the
 * section it belongs to and the order of sections — is read from the zod schema itself.
 *
 * `FIELD_WORDS` is typed from `SystemInput`: a field added to the schema without words here, a
 * misspelt field name or a missing option label is a TypeScript error. The forms, the blank
 * project, the loop check's input messages and the property tests' generator all derive from
 * the schema and these words.
 */
import { z } from "zod";
import { REGIONS, type RegionId } from "@/lib/regions";
import { COPPER_TUBES, type CopperTubeId } from "@/lib/calc/tubes";
import { systemSchema, systemSections, type SystemInput, type SystemSection } from "./system";

// ------------------------------------------------------------------------------------------
// Types of the words, from the schema's input type.

interface Base {
  label: string;
  hint?: string;
}
export interface NumberWords extends Base {
  unit?: string;
  step?: string;
  blank?: number;
}
export interface TextWords extends Base {
  blank?: string;
}
export interface CheckboxWords extends Base {
  blank?: boolean;
}
export interface SelectWords<V extends string> extends Base {
  /** Every option's label, in the order shown. */
  options: Record<V, string>;
  blank?: V;
}
export interface ListWords<Row> {
  /** What one row is called: "Pipe run", "Coil". */
  itemLabel: string;
  fields: ObjectWords<Row>;
  /** A new row added with the "Add" button. */
  empty: Partial<Row>;
  /** The rows a blank description starts with. */
  blank?: Partial<Row>[];
}

type WordsFor<V> = [NonNullable<V>] extends [number]
  ? NumberWords
  : [NonNullable<V>] extends [boolean]
    ? CheckboxWords
    : [NonNullable<V>] extends [string]
      ? string extends NonNullable<V>
        ? TextWords
        : SelectWords<NonNullable<V>>
      : [NonNullable<V>] extends [readonly (infer Row)[]]
        ? ListWords<Row>
        : never;

export type ObjectWords<T> = { [F in keyof T]-?: WordsFor<T[F]> };

type SectionInput<K extends SystemSection> = NonNullable<SystemInput[K]>;
type SectionWords<K extends SystemSection> = {
  title: string;
} & (SectionInput<K> extends readonly (infer Row)[]
  ? { list: ListWords<Row> }
  : { fields: ObjectWords<SectionInput<K>> });

/** A path to a field of a section, e.g. "collectors.tiltDeg" (typed from the schema). */
export type SectionFieldPath = {
  [K in SystemSection]: SectionInput<K> extends readonly unknown[]
    ? never
    : `${K}.${Extract<keyof SectionInput<K>, string>}`;
}[SystemSection];

/** Where a repeatable list lives: a section that is a list, or a list field of a section. */
export type ListPath = {
  [K in SystemSection]: SectionInput<K> extends readonly unknown[]
    ? K
    : {
        [F in keyof SectionInput<K>]-?: NonNullable<SectionInput<K>[F]> extends readonly unknown[]
          ? `${K}.${Extract<F, string>}`
          : never;
      }[keyof SectionInput<K>];
}[SystemSection];

// ------------------------------------------------------------------------------------------
// The words.

const regionOptions = Object.fromEntries(REGIONS.map((r) => [r.id, r.name])) as Record<
  RegionId,
  string
>;
const tubeOptions = Object.fromEntries(
  COPPER_TUBES.map((t) => [t.id, `${t.outerMm} × ${t.wallMm} mm`]),
) as Record<CopperTubeId, string>;

export const FIELD_WORDS: { [K in SystemSection]: SectionWords<K> } = {
  site: {
    title: "Site",
    fields: {
      region: { label: "Region", options: regionOptions, blank: "south-west" },
      postcodeArea: { label: "Postcode area", hint: "The first half only, e.g. AB1", blank: "" },
      designMinTempC: { label: "Design minimum outdoor temperature", unit: "°C", step: "0.5" },
    },
  },
  collectors: {
    title: "Collector array",
    fields: {
      type: {
        label: "Collector type",
        options: { flat_plate: "Flat plate", evacuated_tube: "Evacuated tube" },
        blank: "flat_plate",
      },
      count: { label: "Number of collectors", blank: 2 },
      grossAreaM2Each: { label: "Gross area, each", unit: "m²", step: "0.01" },
      apertureAreaM2Each: { label: "Aperture area, each", unit: "m²", step: "0.01" },
      fluidContentLEach: { label: "Fluid content, each", unit: "L", step: "0.01" },
      eta0: {
        label: "η₀ (optical efficiency)",
        step: "0.001",
        hint: "From the EN ISO 9806 test report, if you have it",
      },
      a1: { label: "a₁", unit: "W/(m²·K)", step: "0.001" },
      a2: { label: "a₂", unit: "W/(m²·K²)", step: "0.0001" },
      tiltDeg: { label: "Tilt", unit: "°", step: "1" },
      azimuthDeg: {
        label: "Azimuth from south",
        unit: "°",
        step: "1",
        hint: "Negative east, positive west",
        blank: 0,
      },
      highPointVent: {
        label: "Vent at the high point",
        options: {
          none: "None",
          manual: "Manual vent",
          automatic_isolatable: "Automatic vent with isolating valve",
          automatic: "Automatic vent, no isolation",
        },
        blank: "manual",
      },
      ventMaxTempC: { label: "Vent temperature rating", unit: "°C", step: "1" },
      stagnationTempC: {
        label: "Stagnation temperature",
        unit: "°C",
        step: "1",
        hint: "From the collector's test report; a cautious typical figure is used if empty",
      },
      emptying: {
        label: "How the collector empties when it boils",
        options: {
          unknown: "Not known",
          good: "Empties well (the maker says so)",
          poor: "Empties poorly",
        },
        hint: "Decides how far steam travels down the pipes",
      },
      maxPressureBar: { label: "Collector maximum operating pressure", unit: "bar", step: "0.5" },
      flowMode: {
        label: "Flow through the collectors",
        options: {
          high_flow: "High-flow (30–50 L per m² per hour)",
          low_flow: "Low-flow (12–24 L per m² per hour)",
        },
      },
      makerFlowLphM2: {
        label: "Maker's flow per m² of collector",
        unit: "L/(m²·h)",
        step: "1",
        hint: "If the maker gives one, it replaces the figure above",
      },
      pressureDropKPa: {
        label: "Collector array pressure drop at that flow",
        unit: "kPa",
        step: "0.1",
      },
    },
  },
  pipeRuns: {
    title: "Pipe runs",
    list: {
      itemLabel: "Pipe run",
      empty: {
        label: "",
        material: "copper",
        copperSize: "15x0.7",
        lengthM: 5,
        insulated: true,
        fittingsCount: 4,
      },
      blank: [
        {
          label: "Roof to cylinder",
          material: "copper",
          copperSize: "15x0.7",
          insulated: true,
          fittingsCount: 8,
        },
      ],
      fields: {
        label: { label: "Name" },
        material: {
          label: "Material",
          options: { copper: "Copper (EN 1057)", stainless_flex: "Flexible stainless" },
        },
        copperSize: { label: "Copper tube size", options: tubeOptions },
        flexBoreMm: { label: "Flexible pipe bore", unit: "mm", step: "0.1" },
        flexContentLPerM: { label: "Flexible pipe content", unit: "L/m", step: "0.01" },
        lengthM: { label: "Length (flow and return together)", unit: "m", step: "0.1" },
        fittingsCount: { label: "Bends, tees and valves" },
        insulated: { label: "Insulated" },
        insulationMm: {
          label: "Insulation thickness",
          unit: "mm",
          step: "1",
          hint: "20 mm is assumed if empty",
        },
      },
    },
  },
  pumpStation: {
    title: "Pump station",
    fields: {
      staticHeightM: {
        label: "Static height, pump station to collector top",
        unit: "m",
        step: "0.1",
      },
      reliefValveBar: { label: "Relief valve setting", unit: "bar", step: "0.1", blank: 6 },
      flowMeterMinLph: { label: "Flow meter range, from", unit: "L/h", step: "1" },
      flowMeterMaxLph: { label: "Flow meter range, to", unit: "L/h", step: "1" },
      pumpMaxTempC: { label: "Circulator temperature rating", unit: "°C", step: "1" },
      pumpMaxHeadM: { label: "Circulator maximum head", unit: "m", step: "0.1" },
      stationContentL: {
        label: "Pump station fluid content",
        unit: "L",
        step: "0.1",
        blank: 1,
      },
      lowestComponentMaxBar: {
        label: "Lowest pressure rating of any loop component",
        unit: "bar",
        step: "0.1",
      },
      pipeToStationM: {
        label: "Pipe from the collector to the pump station (flow and return together)",
        unit: "m",
        step: "0.1",
        hint: "Leave empty if the station is at the end of the pipe runs",
      },
    },
  },
  expansionVessel: {
    title: "Expansion vessel",
    fields: {
      nominalVolumeL: { label: "Nominal volume", unit: "L", step: "1" },
      prechargeBar: { label: "Pre-charge", unit: "bar", step: "0.1" },
      maxPressureBar: { label: "Maximum pressure", unit: "bar", step: "0.5" },
      diaphragmMaxTempC: { label: "Diaphragm temperature rating", unit: "°C", step: "1" },
      onCoolingLeg: {
        label: "Hangs below its connection on an uninsulated cooling leg",
        blank: true,
      },
      intermediateVesselL: {
        label: "Intermediate (cooling) vessel, if fitted",
        unit: "L",
        step: "1",
      },
    },
  },
  fluid: {
    title: "Heat-transfer fluid",
    fields: {
      glycolType: {
        label: "Glycol",
        options: {
          propylene: "Propylene glycol",
          ethylene: "Ethylene glycol",
          none: "None (plain water)",
        },
        blank: "propylene",
      },
      glycolPercentMass: {
        label: "Glycol concentration",
        unit: "% by mass",
        step: "1",
        blank: 40,
      },
      solarRated: { label: "Sold as a solar heat-transfer fluid", blank: true },
    },
  },
  cylinder: {
    title: "Cylinder and coils",
    fields: {
      volumeL: { label: "Cylinder volume", unit: "L", step: "1" },
      type: {
        label: "Cylinder type",
        options: {
          unvented: "Unvented (mains pressure)",
          vented: "Vented (fed from a cold tank)",
        },
        blank: "unvented",
      },
      immersionHeater: { label: "Has an immersion heater", blank: true },
      solarCoilMaxBar: { label: "Solar coil maximum operating pressure", unit: "bar", step: "0.5" },
      coils: {
        itemLabel: "Coil",
        empty: { heatSource: "boiler", position: "top", contentL: 3 },
        blank: [{ heatSource: "solar", position: "bottom" }],
        fields: {
          heatSource: {
            label: "Fed by",
            options: {
              solar: "Solar loop",
              boiler: "Boiler",
              solid_fuel: "Solid-fuel stove",
              heat_pump: "Heat pump",
            },
          },
          position: {
            label: "Position",
            options: { bottom: "Bottom", middle: "Middle", top: "Top" },
          },
          contentL: { label: "Coil content", unit: "L", step: "0.1" },
        },
      },
    },
  },
  safety: {
    title: "Fittings and safety devices",
    fields: {
      jointsAtCollector: {
        label: "Joints at the collector",
        options: {
          compression: "Compression",
          press: "Press (high-temperature seals)",
          brazed: "Brazed",
          soft_soldered: "Soft-soldered",
        },
        blank: "compression",
      },
      insulationMaxTempC: { label: "Collector pipe insulation rating", unit: "°C", step: "1" },
      checkValve: { label: "Check valve fitted", blank: true },
      airSeparator: { label: "Air separator in the flow line", blank: true },
      airSeparatorMaxTempC: { label: "Air separator temperature rating", unit: "°C", step: "1" },
      mixingValve: { label: "Thermostatic mixing valve at the outlet", blank: true },
      mixingValveSetC: { label: "Mixing valve setting", unit: "°C", step: "1" },
    },
  },
  design: {
    title: "Design temperatures",
    fields: {
      fillTempC: { label: "Fluid temperature at filling", unit: "°C", step: "1", blank: 15 },
      maxLiquidTempC: {
        label: "Highest liquid temperature",
        unit: "°C",
        step: "1",
        hint: "120 °C unless a reviewer advises otherwise",
        blank: 120,
      },
      steamReachM: {
        label: "Steam reach, if known better than the estimate",
        unit: "m",
        step: "0.1",
        hint: "Only with a reason, e.g. a stagnation test",
      },
      steamReachReason: { label: "Where that steam reach comes from" },
    },
  },
};

// ------------------------------------------------------------------------------------------
// Reading the schema.

/** Strip `.optional()` and `.default()` to the field's own type. */
function unwrap(schema: z.ZodType): { inner: z.ZodType; optional: boolean; defaultValue: unknown } {
  let inner: z.ZodType = schema;
  let optional = false;
  let defaultValue: unknown = undefined;
  for (;;) {
    if (inner instanceof z.ZodOptional) {
      optional = true;
      inner = inner.unwrap() as z.ZodType;
    } else if (inner instanceof z.ZodDefault) {
      const d = inner.def.defaultValue;
      defaultValue = typeof d === "function" ? (d as () => unknown)() : d;
      inner = inner.unwrap() as z.ZodType;
    } else return { inner, optional, defaultValue };
  }
}

/** The object schema of a section or list row (refinements and defaults stripped). */
export function objectOf(schema: z.ZodType): z.ZodObject {
  const { inner } = unwrap(schema);
  if (inner instanceof z.ZodObject) return inner;
  if (inner instanceof z.ZodArray) return objectOf(inner.element as z.ZodType);
  throw new TypeError("not an object schema");
}

// ------------------------------------------------------------------------------------------
// What the forms render.

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

export interface ListDef {
  name: ListPath;
  itemLabel: string;
  fields: FieldDef[];
  empty: Record<string, unknown>;
}

export interface SectionDef {
  id: SystemSection;
  title: string;
  /** Fields of the section, named by their full path ("site.region"). */
  fields: (FieldDef & { name: SectionFieldPath })[];
  /** A repeatable list (pipe runs, coils): the fields of one row, named within the row. */
  list?: ListDef;
}

type AnyWords = NumberWords | TextWords | CheckboxWords | SelectWords<string> | ListWords<unknown>;
const isList = (w: AnyWords): w is ListWords<unknown> => "itemLabel" in w;

function fieldDef(name: string, schema: z.ZodType, words: AnyWords): FieldDef {
  const { inner, optional } = unwrap(schema);
  const hint = "hint" in words ? words.hint : undefined;
  const label = "label" in words ? words.label : "";
  if (inner instanceof z.ZodNumber) {
    const w = words as NumberWords;
    return {
      kind: "number",
      name,
      label,
      unit: w.unit,
      optional,
      step: w.step ?? (inner.isInt ? "1" : undefined),
      hint,
    };
  }
  if (inner instanceof z.ZodEnum) {
    const w = words as SelectWords<string>;
    return {
      kind: "select",
      name,
      label,
      options: Object.entries(w.options).map(([value, optionLabel]) => ({
        value,
        label: optionLabel,
      })),
      hint,
    };
  }
  if (inner instanceof z.ZodBoolean) return { kind: "checkbox", name, label, hint };
  if (inner instanceof z.ZodString) return { kind: "text", name, label, optional, hint };
  throw new TypeError(`no form control for ${name}`);
}

function rowDefs(row: z.ZodObject, words: Record<string, AnyWords>, prefix: string): FieldDef[] {
  const shape = row.shape as Record<string, z.ZodType>;
  return Object.entries(words)
    .filter(([, w]) => !isList(w))
    .map(([key, w]) => fieldDef(`${prefix}${key}`, shape[key]!, w));
}

function listDef(name: ListPath, schema: z.ZodType, words: ListWords<unknown>): ListDef {
  const row = objectOf(schema);
  return {
    name,
    itemLabel: words.itemLabel,
    fields: rowDefs(row, words.fields as Record<string, AnyWords>, ""),
    empty: rowDefaults(row, words.fields as Record<string, AnyWords>, words.empty as object),
  };
}

function sectionDef(id: SystemSection): SectionDef {
  const schema = systemSchema.shape[id] as z.ZodType;
  const words = FIELD_WORDS[id] as { title: string; fields?: Record<string, AnyWords> } & {
    list?: ListWords<unknown>;
  };
  if (words.list) {
    return {
      id,
      title: words.title,
      fields: [],
      list: listDef(id as ListPath, schema, words.list),
    };
  }
  const obj = objectOf(schema);
  const fieldWords = words.fields ?? {};
  const listEntry = Object.entries(fieldWords).find(([, w]) => isList(w));
  return {
    id,
    title: words.title,
    fields: rowDefs(obj, fieldWords, `${id}.`) as SectionDef["fields"],
    list: listEntry
      ? listDef(
          `${id}.${listEntry[0]}` as ListPath,
          (obj.shape as Record<string, z.ZodType>)[listEntry[0]]!,
          listEntry[1] as ListWords<unknown>,
        )
      : undefined,
  };
}

/** The sections of the description, in the schema's order, with their fields. */
export const SECTIONS: readonly SectionDef[] = systemSections.map(sectionDef);

// ------------------------------------------------------------------------------------------
// The blank description a new project starts from.

function rowDefaults(
  row: z.ZodObject,
  words: Record<string, AnyWords>,
  given: object = {},
): Record<string, unknown> {
  const shape = row.shape as Record<string, z.ZodType>;
  const out: Record<string, unknown> = {};
  for (const [key, w] of Object.entries(words)) {
    const fieldSchema = shape[key]!;
    const { inner, defaultValue } = unwrap(fieldSchema);
    const explicit = (given as Record<string, unknown>)[key];
    if (isList(w)) {
      const element = objectOf(fieldSchema);
      const rows = (explicit as object[] | undefined) ?? (w.blank as object[] | undefined) ?? [];
      out[key] = rows.map((r) => rowDefaults(element, w.fields as Record<string, AnyWords>, r));
      continue;
    }
    const blank = explicit !== undefined ? explicit : "blank" in w ? w.blank : undefined;
    if (blank !== undefined) out[key] = blank;
    else if (defaultValue !== undefined) out[key] = defaultValue;
    else if (inner instanceof z.ZodEnum)
      out[key] = Object.keys((w as SelectWords<string>).options)[0];
    else if (inner instanceof z.ZodBoolean) out[key] = false;
    // Numbers and text are left empty: the check never guesses a measurement.
  }
  return out;
}

type DeepPartial<T> = T extends readonly (infer R)[]
  ? DeepPartial<R>[]
  : T extends object
    ? { [K in keyof T]?: DeepPartial<T[K]> }
    : T;

/** A form's values: the description with any field still empty. */
export type SystemFormValues = DeepPartial<SystemInput>;

/**
 * A new project's form values: choices pre-set to the common case, every measured number left
 * empty for the homeowner to fill in.
 */
export function blankSystem(): SystemFormValues {
  const out = {} as Record<SystemSection, unknown>;
  for (const id of systemSections) {
    const schema = systemSchema.shape[id] as z.ZodType;
    const words = FIELD_WORDS[id] as { fields?: Record<string, AnyWords> } & {
      list?: ListWords<unknown>;
    };
    if (words.list) {
      const row = objectOf(schema);
      out[id] = (words.list.blank ?? []).map((r) =>
        rowDefaults(row, words.list!.fields as Record<string, AnyWords>, r as object),
      );
    } else {
      out[id] = rowDefaults(objectOf(schema), words.fields ?? {});
    }
  }
  // Built field by field from the typed words above, so it has the description's shape.
  return out as SystemFormValues;
}

// ------------------------------------------------------------------------------------------
// Words for error messages.

export const SECTION_TITLES = Object.fromEntries(
  systemSections.map((id) => [id, FIELD_WORDS[id].title]),
) as Record<SystemSection, string>;

/**
 * A field's label from a path inside a section, for messages: ["apertureAreaM2Each"] in
 * "collectors" is "Aperture area, each"; [0, "lengthM"] in "pipeRuns" is "Pipe run 1: Length
 * (flow and return together)". Unknown paths give "".
 */
export function describeFieldPath(section: SystemSection, path: readonly PropertyKey[]): string {
  const words = FIELD_WORDS[section] as { fields?: Record<string, AnyWords> } & {
    list?: ListWords<unknown>;
  };
  let current: Record<string, AnyWords> | undefined = words.fields;
  let list: ListWords<unknown> | undefined = words.list;
  const parts: string[] = [];
  for (const step of path) {
    if (typeof step === "number" && list) {
      parts.push(`${list.itemLabel} ${step + 1}`);
      current = list.fields as Record<string, AnyWords>;
      list = undefined;
      continue;
    }
    const w = typeof step === "string" ? current?.[step] : undefined;
    if (!w) break;
    if (isList(w)) {
      list = w;
      current = undefined;
      if (path.at(-1) === step) parts.push(`${w.itemLabel}s`);
    } else parts.push(w.label);
  }
  return parts.join(": ");
}
