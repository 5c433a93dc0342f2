import fc from "fast-check";
import { z } from "zod";
import { systemSchema, type SystemInput } from "@/lib/validation/system";

/**
 * Random systems inside the schema's bounds (used by the property tests and the benchmark),
 * generated from `systemSchema` itself: every field, its bounds, its options and whether it is
 * optional come from the schema, so a new field is covered without an edit here. Only the
 * schema's cross-field rules are repaired afterwards (`repair`), and anything still invalid is
 * filtered out.
 */

/** Longest random list: enough variety without making each run slow. */
const MAX_ROWS = 6;

function checkValue(schema: z.ZodType, check: string, key: "minimum" | "maximum") {
  const checks = (schema.def as { checks?: { _zod: { def: Record<string, unknown> } }[] }).checks;
  const c = checks?.find((x) => x._zod.def.check === check);
  return c ? (c._zod.def[key] as number) : undefined;
}

function arbitraryFor(schema: z.ZodType): fc.Arbitrary<unknown> {
  if (schema instanceof z.ZodOptional)
    return fc.option(arbitraryFor(schema.unwrap() as z.ZodType), { nil: undefined, freq: 2 });
  if (schema instanceof z.ZodDefault)
    // Missing (half the time), so the default applies, or a value of its own.
    return fc.option(arbitraryFor(schema.unwrap() as z.ZodType), { nil: undefined, freq: 2 });
  if (schema instanceof z.ZodObject) {
    const shape = schema.shape as Record<string, z.ZodType>;
    return fc.record(
      Object.fromEntries(Object.entries(shape).map(([k, v]) => [k, arbitraryFor(v)])),
    );
  }
  if (schema instanceof z.ZodArray) {
    const min = checkValue(schema, "min_length", "minimum") ?? 0;
    const max = Math.min(checkValue(schema, "max_length", "maximum") ?? MAX_ROWS, MAX_ROWS);
    return fc.array(arbitraryFor(schema.element as z.ZodType), { minLength: min, maxLength: max });
  }
  if (schema instanceof z.ZodNumber) {
    const min = schema.minValue ?? -1e6;
    const max = schema.maxValue ?? 1e6;
    return schema.isInt
      ? fc.integer({ min: Math.ceil(min), max: Math.floor(max) })
      : fc.double({ min, max, noNaN: true, noDefaultInfinity: true });
  }
  if (schema instanceof z.ZodEnum) return fc.constantFrom(...(schema.options as string[]));
  if (schema instanceof z.ZodBoolean) return fc.boolean();
  if (schema instanceof z.ZodString) {
    const max = Math.min(schema.maxLength ?? 12, 12);
    return fc.stringMatching(new RegExp(`^[A-Za-z0-9]{1,${Math.max(max, 1)}}$`));
  }
  throw new TypeError(`no generator for ${schema.constructor.name}`);
}

type Draft = Record<string, Record<string, unknown> & unknown[]>;

/** Make a random system meet the schema's cross-field rules, as a homeowner's form would. */
function repair(raw: unknown): SystemInput {
  const s = structuredClone(raw) as Draft;
  const c = s.collectors as unknown as Record<string, number>;
  c.apertureAreaM2Each = Math.min(c.apertureAreaM2Each!, c.grossAreaM2Each!);
  const ps = s.pumpStation as unknown as Record<string, number>;
  const [lo, hi] = [ps.flowMeterMinLph!, ps.flowMeterMaxLph!].sort((a, b) => a - b);
  ps.flowMeterMinLph = Math.min(lo!, 2990);
  ps.flowMeterMaxLph = Math.max(hi!, ps.flowMeterMinLph + 10);
  for (const run of s.pipeRuns as unknown as Record<string, unknown>[])
    if (run.material === "copper" && run.copperSize === undefined) run.copperSize = "15x0.7";
  const fluid = s.fluid as unknown as Record<string, unknown>;
  if (fluid.glycolType === "none") fluid.glycolPercentMass = 0;
  const cylinder = s.cylinder as unknown as { coils: Record<string, unknown>[] };
  cylinder.coils[0]!.heatSource = "solar";
  const design = s.design as unknown as Record<string, unknown> | undefined;
  if (design?.steamReachM !== undefined) design.steamReachReason = "measured at a stagnation test";
  return s as unknown as SystemInput;
}

export const arbitrarySystem: fc.Arbitrary<SystemInput> = arbitraryFor(systemSchema)
  .map(repair)
  .filter((s) => systemSchema.safeParse(s).success);
