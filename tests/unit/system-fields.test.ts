import { describe, expect, it } from "vitest";
import { z } from "zod";
import { systemSchema, systemSections, sectionSchemas } from "@/lib/validation/system";
import {
  blankSystem,
  describeFieldPath,
  objectOf,
  SECTIONS,
  type FieldDef,
} from "@/lib/validation/system-fields";
import { demoSystem } from "@/lib/calc/demo-system";
import { runLoopCheck } from "@/lib/calc/loop-check";

const unwrap = (s: z.ZodType): { inner: z.ZodType; optional: boolean } => {
  let inner = s;
  let optional = false;
  while (inner instanceof z.ZodOptional || inner instanceof z.ZodDefault) {
    optional ||= inner instanceof z.ZodOptional;
    inner = inner.unwrap() as z.ZodType;
  }
  return { inner, optional };
};

/** Every form control, as [schema path, definition]. */
const controls = (): [string, FieldDef][] =>
  SECTIONS.flatMap((s) => [
    ...s.fields.map((f): [string, FieldDef] => [f.name, f]),
    ...(s.list?.fields ?? []).map((f): [string, FieldDef] => [`${s.list!.name}.*.${f.name}`, f]),
  ]);

/** Every leaf field of the schema, as a path with `*` for list rows. */
function leaves(schema: z.ZodType, prefix: string): [string, z.ZodType][] {
  const { inner } = unwrap(schema);
  if (inner instanceof z.ZodArray) return leaves(inner.element as z.ZodType, `${prefix}.*`);
  if (inner instanceof z.ZodObject)
    return Object.entries(inner.shape as Record<string, z.ZodType>).flatMap(([k, v]) =>
      leaves(v, `${prefix}.${k}`),
    );
  return [[prefix.slice(1), schema]];
}

describe("the form is derived from the schema", () => {
  it("has the schema's sections in the schema's order", () => {
    expect(SECTIONS.map((s) => s.id)).toEqual(Object.keys(systemSchema.shape));
    expect([...systemSections]).toEqual(Object.keys(systemSchema.shape));
    expect(Object.keys(sectionSchemas)).toEqual(Object.keys(systemSchema.shape));
  });

  it("has one control for every field of the schema, and no other", () => {
    const schemaPaths = leaves(systemSchema, "")
      .map(([p]) => p)
      .sort();
    expect(
      controls()
        .map(([p]) => p)
        .sort(),
    ).toEqual(schemaPaths);
  });

  it("takes each control's kind, options and optionality from the schema", () => {
    const bySchema = new Map(leaves(systemSchema, ""));
    for (const [path, def] of controls()) {
      const { inner, optional } = unwrap(bySchema.get(path)!);
      if (inner instanceof z.ZodNumber) {
        expect(def.kind, path).toBe("number");
        if (def.kind === "number") expect(def.optional, path).toBe(optional);
      } else if (inner instanceof z.ZodEnum) {
        expect(def.kind, path).toBe("select");
        if (def.kind === "select")
          expect(def.options.map((o) => o.value).sort(), path).toEqual([...inner.options].sort());
      } else if (inner instanceof z.ZodBoolean) expect(def.kind, path).toBe("checkbox");
      else expect(def.kind, path).toBe("text");
      expect(def.label.length, path).toBeGreaterThan(0);
    }
  });

  it("labels are unique within a section, so a person can tell the fields apart", () => {
    for (const s of SECTIONS) {
      const labels = [...s.fields, ...(s.list?.fields ?? [])].map((f) => f.label);
      expect(new Set(labels).size, s.id).toBe(labels.length);
    }
  });
});

describe("the blank description", () => {
  it("pre-sets every choice and leaves only measured numbers empty", () => {
    const r = systemSchema.safeParse(blankSystem());
    expect(r.success).toBe(false);
    const bySchema = new Map(leaves(systemSchema, ""));
    for (const issue of r.error!.issues) {
      const path = issue.path.map((p) => (typeof p === "number" ? "*" : String(p))).join(".");
      expect(unwrap(bySchema.get(path)!).inner, path).toBeInstanceOf(z.ZodNumber);
      expect(issue.message, path).toMatch(/Enter a number/);
    }
  });

  it("becomes a valid description once the numbers are filled in", () => {
    // The blank's choices over the example's measurements, row by row.
    const merge = (measured: unknown, blank: unknown): unknown => {
      if (Array.isArray(measured) && Array.isArray(blank))
        return measured.map((row, i) => merge(row, blank[i]));
      if (measured && typeof measured === "object" && blank && typeof blank === "object")
        return Object.fromEntries(
          Object.keys({ ...measured, ...blank }).map((k) => [
            k,
            merge((measured as Record<string, unknown>)[k], (blank as Record<string, unknown>)[k]),
          ]),
        );
      return blank === undefined ? measured : blank;
    };
    const filled = merge(demoSystem, blankSystem());
    expect(systemSchema.safeParse(filled).error?.issues ?? []).toEqual([]);
  });

  it("has a row defaults object that the row schema accepts once measured", () => {
    const runs = SECTIONS.find((s) => s.id === "pipeRuns")!.list!;
    expect(
      objectOf(systemSchema.shape.pipeRuns).safeParse({ ...runs.empty, label: "Attic" }).success,
    ).toBe(true);
  });
});

describe("messages name fields in words, never by their keys", () => {
  it("describes paths inside sections and list rows", () => {
    expect(describeFieldPath("collectors", ["apertureAreaM2Each"])).toBe("Aperture area, each");
    expect(describeFieldPath("pipeRuns", [1, "lengthM"])).toBe(
      "Pipe run 2: Length (flow and return together)",
    );
    expect(describeFieldPath("cylinder", ["coils", 0, "contentL"])).toBe("Coil 1: Coil content");
    expect(describeFieldPath("cylinder", ["coils"])).toBe("Coils");
  });

  it("a bad number anywhere in the example gives an input finding with the field's label", () => {
    for (const section of SECTIONS) {
      for (const def of section.fields) {
        if (def.kind !== "number") continue;
        const s = structuredClone(demoSystem) as unknown as Record<string, Record<string, unknown>>;
        const key = def.name.split(".")[1]!;
        s[section.id] = { ...s[section.id], [key]: 1e9 };
        const input = runLoopCheck(s).findings.filter((f) => f.key === "input");
        expect(input.length, def.name).toBeGreaterThan(0);
        expect(input[0]!.title, def.name).toContain(def.label);
        expect(input[0]!.title, def.name).not.toContain(key);
      }
    }
  });
});
