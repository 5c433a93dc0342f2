import { describe, expect, it } from "vitest";
import { buildChecklist } from "@/lib/checklist/build";
import { CATALOGUE, CATALOGUE_VERSION } from "@/lib/checklist/catalogue";
import { runLoopCheck } from "@/lib/calc/loop-check";
import { demoSystem } from "@/lib/calc/demo-system";
import { systemSchema, type SystemInput } from "@/lib/validation/system";

const build = (input: SystemInput) => {
  const system = systemSchema.parse(input);
  return buildChecklist(system, runLoopCheck(system).findings);
};

describe("buildChecklist", () => {
  it("an evacuated-tube system with an unvented cylinder and a second heat source gets those items", () => {
    const s = structuredClone(demoSystem);
    s.collectors = { ...s.collectors, type: "evacuated_tube", highPointVent: "none" };
    s.cylinder = {
      ...s.cylinder,
      type: "unvented",
      coils: [
        { heatSource: "solar", position: "bottom", contentL: 4 },
        { heatSource: "solid_fuel", position: "top", contentL: 3 },
      ],
    };
    const keys = build(s).items.map((i) => i.key);
    expect(keys).toContain("unvented");
    expect(keys).toContain("other-sources");
    expect(keys).not.toContain("high-point-vent");
    expect(keys.length).toBe(CATALOGUE.length - 1);
  });

  it("a vented cylinder with only the solar coil leaves out the unvented and other-sources items", () => {
    const s = structuredClone(demoSystem);
    s.cylinder = {
      ...s.cylinder,
      type: "vented",
      coils: [{ heatSource: "solar", position: "bottom", contentL: 4 }],
    };
    const keys = build(s).items.map((i) => i.key);
    expect(keys).not.toContain("unvented");
    expect(keys).not.toContain("other-sources");
    expect(keys).toContain("high-point-vent"); // the example has a manual vent
  });

  it("attaches the matching findings as evidence and records the catalogue version", () => {
    const list = build(demoSystem);
    expect(list.version).toBe(CATALOGUE_VERSION);
    const vessel = list.items.find((i) => i.key === "vessel-size");
    expect(vessel?.evidence.map((f) => f.key)).toEqual(["vessel-size"]);
    expect(list.items.find((i) => i.key === "roof-access")?.evidence).toEqual([]);
  });

  it("has unique keys, and every `computed` name is a finding key the loop check produces", () => {
    const keys = CATALOGUE.map((i) => i.key);
    expect(new Set(keys).size).toBe(keys.length);
    const produced = new Set(runLoopCheck(demoSystem).findings.map((f) => f.key));
    for (const item of CATALOGUE) {
      if (item.computed && item.computed !== "first-fill")
        expect(produced.has(item.computed), item.key).toBe(true);
    }
  });

  it("covers the hazards a practitioner's review added: steam at the station, return-side valves, heat traps, night pressure, fluid testing, the relief valve's temperature", () => {
    const keys = build(demoSystem).items.map((i) => i.key);
    for (const k of [
      "steam-reach",
      "return-side",
      "heat-trap",
      "night-pressure",
      "fluid-testing",
      "relief-temperature",
      "store-size",
      "pipe-insulation",
    ])
      expect(keys, k).toContain(k);
    const steam = build(demoSystem).items.find((i) => i.key === "steam-reach");
    expect(steam?.evidence.map((f) => f.key)).toEqual(["steam-reach"]);
    expect(steam?.photo).toMatch(/pump station/);
  });

  it("asks for a high-temperature cut-out only on an unvented cylinder", () => {
    const unvented = build(demoSystem).items.map((i) => i.key);
    expect(unvented).toContain("unvented-cutout");
    const s = structuredClone(demoSystem);
    s.cylinder = { ...s.cylinder, type: "vented" };
    expect(build(s).items.map((i) => i.key)).not.toContain("unvented-cutout");
  });

  it("has the loop pressure tested with the solar fluid itself, never water first (common practice)", () => {
    const test = CATALOGUE.find((i) => i.key === "pressure-test");
    expect(test?.check).toMatch(/solar fluid itself/);
    expect(test?.check).not.toMatch(/before it is filled/);
  });
});
