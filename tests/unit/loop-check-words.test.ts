/**
 * Users see words: every finding the loop check gives, for the example system, many variants of
 * it and a few hundred random systems inside the schema's bounds, has a title, a source and an
 * action in words, labels on its numbers, and never a field key, "NaN", "undefined" or an empty
 * phrase. (Product rule, platform.md / RULES.md: "users see words, never codes or field keys".)
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { runLoopCheck } from "@/lib/calc/loop-check";
import { demoSystem } from "@/lib/calc/demo-system";
import type { Finding } from "@/lib/calc/findings";
import type { SystemInput } from "@/lib/validation/system";
import { arbitrarySystem } from "../support/arbitrary-system";

type Edit = (s: SystemInput) => void;
const variant = (edit: Edit): SystemInput => {
  const s = structuredClone(demoSystem);
  edit(s);
  return s;
};

/** Variants that reach the branches the example does not: each a change a homeowner might make. */
const VARIANTS: [string, Edit][] = [
  ["the example", () => {}],
  ["evacuated tubes", (s) => (s.collectors.type = "evacuated_tube")],
  ["a flat plate that empties well", (s) => (s.collectors.emptying = "good")],
  ["a low-flow array", (s) => (s.collectors.flowMode = "low_flow")],
  ["a large vessel", (s) => (s.expansionVessel.nominalVolumeL = 35)],
  ["a tiny vessel", (s) => (s.expansionVessel.nominalVolumeL = 8)],
  ["a vessel off the cooling leg", (s) => (s.expansionVessel.onCoolingLeg = false)],
  ["an ordinary heating vessel", (s) => (s.expansionVessel.diaphragmMaxTempC = 70)],
  ["a low-rated vessel", (s) => (s.expansionVessel.maxPressureBar = 3)],
  ["a high pre-charge", (s) => (s.expansionVessel.prechargeBar = 3.5)],
  ["a low pre-charge", (s) => (s.expansionVessel.prechargeBar = 0.5)],
  ["a 3 bar relief valve", (s) => (s.pumpStation.reliefValveBar = 3)],
  ["a 10 bar relief valve", (s) => (s.pumpStation.reliefValveBar = 10)],
  ["a tall house", (s) => (s.pumpStation.staticHeightM = 18)],
  ["a bungalow", (s) => (s.pumpStation.staticHeightM = 2)],
  ["a weak pump", (s) => (s.pumpStation.pumpMaxHeadM = 1)],
  ["a pump rated for heating only", (s) => (s.pumpStation.pumpMaxTempC = 70)],
  ["a small flow meter", (s) => (s.pumpStation.flowMeterMaxLph = 120)],
  ["low-rated components", (s) => (s.pumpStation.lowestComponentMaxBar = 4)],
  ["plain water", (s) => (s.fluid = { ...s.fluid, glycolType: "none", glycolPercentMass: 0 })],
  ["a weak mix", (s) => (s.fluid.glycolPercentMass = 15)],
  ["a strong mix", (s) => (s.fluid.glycolPercentMass = 60)],
  ["ethylene glycol", (s) => (s.fluid.glycolType = "ethylene")],
  ["a fluid not rated for solar", (s) => (s.fluid.solarRated = false)],
  ["a very cold site", (s) => (s.site.designMinTempC = -30)],
  ["a mild site", (s) => (s.site.designMinTempC = 2)],
  ["soft-soldered joints", (s) => (s.safety.jointsAtCollector = "soft_soldered")],
  ["no check valve", (s) => (s.safety.checkValve = false)],
  ["no air separator", (s) => (s.safety.airSeparator = false)],
  ["a cool-rated air separator", (s) => (s.safety.airSeparatorMaxTempC = 110)],
  ["no mixing valve", (s) => (s.safety.mixingValve = false)],
  ["a hot mixing valve", (s) => (s.safety.mixingValveSetC = 60)],
  ["cheap insulation", (s) => (s.safety.insulationMaxTempC = 90)],
  ["a vented cylinder", (s) => (s.cylinder.type = "vented")],
  ["a small cylinder", (s) => (s.cylinder.volumeL = 80)],
  ["the solar coil at the top", (s) => (s.cylinder.coils[0]!.position = "top")],
  ["a low-rated coil", (s) => (s.cylinder.solarCoilMaxBar = 3)],
  ["no immersion heater", (s) => (s.cylinder.immersionHeater = false)],
  ["no high-point vent", (s) => (s.collectors.highPointVent = "none")],
  ["an automatic vent", (s) => (s.collectors.highPointVent = "automatic")],
  ["many collectors", (s) => (s.collectors.count = 8)],
  ["a north-facing roof", (s) => (s.collectors.azimuthDeg = 170)],
  ["a flat roof", (s) => (s.collectors.tiltDeg = 0)],
  ["a low-rated collector", (s) => (s.collectors.maxPressureBar = 4)],
  ["a hot fill", (s) => (s.design = { ...s.design!, fillTempC: 40 })],
  ["a higher design temperature", (s) => (s.design = { ...s.design!, maxLiquidTempC: 140 })],
  [
    "bare pipe",
    (s) => {
      for (const r of s.pipeRuns) r.insulated = false;
    },
  ],
  [
    "22 mm pipe",
    (s) => {
      for (const r of s.pipeRuns) if (r.material === "copper") r.copperSize = "22x0.9";
    },
  ],
  [
    "10 mm pipe",
    (s) => {
      for (const r of s.pipeRuns) if (r.material === "copper") r.copperSize = "10x0.6";
    },
  ],
  ["a very long run", (s) => (s.pipeRuns[1]!.lengthM = 80)],
  ["a short run", (s) => (s.pipeRuns = [{ ...s.pipeRuns[0]!, lengthM: 2 }])],
];

const FORBIDDEN = /NaN|undefined|null|Infinity|\[object|\s{2,}|\s[,.;:]|^\s|\s$/;

function wordsOf(f: Finding, where: string, ownWords = true) {
  expect(f.title.length, `${where}: ${f.key} title`).toBeGreaterThan(10);
  expect(f.title, `${where}: ${f.key} title`).not.toMatch(FORBIDDEN);
  expect(f.source.length, `${where}: ${f.key} source`).toBeGreaterThan(5);
  expect(f.action.length, `${where}: ${f.key} action`).toBeGreaterThan(5);
  expect(f.action, `${where}: ${f.key} action`).not.toMatch(FORBIDDEN);
  if (f.method !== undefined) {
    expect(f.method.length, `${where}: ${f.key} method`).toBeGreaterThan(10);
    expect(f.method, `${where}: ${f.key} method`).not.toMatch(/NaN|undefined|\[object/);
  }
  for (const v of f.values) {
    expect(v.label.length, `${where}: ${f.key} value label`).toBeGreaterThan(1);
    if (typeof v.value === "string")
      expect(v.value.length, `${where}: ${f.key} ${v.label}`).toBeGreaterThan(0);
    if (v.unit !== undefined) expect(v.unit.length, `${where}: ${f.key} unit`).toBeGreaterThan(0);
  }
  // Plain words start with a capital, never a field key (random pipe labels are the user's own).
  if (!ownWords) return;
  expect(f.title[0], `${where}: ${f.key} title`).toBe(f.title[0]!.toUpperCase());
  expect(f.title, `${where}: ${f.key} title`).not.toMatch(/\b[a-z]{2,}[A-Z][a-z]|[a-z]_[a-z]/);
}

describe("loop-check findings are in words", () => {
  it.each(VARIANTS)("%s", (name, edit) => {
    const r = runLoopCheck(variant(edit));
    expect(r.findings.length, name).toBeGreaterThan(5);
    for (const f of r.findings) wordsOf(f, name);
  });

  it("for random systems inside the schema's bounds (fast-check, fixed seed)", () => {
    for (const s of fc.sample(arbitrarySystem, { numRuns: 60, seed: 19 })) {
      for (const f of runLoopCheck(s).findings) wordsOf(f, "random system", false);
    }
  });

  it("for a description half filled in: each missing part is said in words", () => {
    const r = runLoopCheck({ collectors: demoSystem.collectors, pipeRuns: [] });
    const titles = r.findings.filter((f) => f.key === "input").map((f) => f.title);
    expect(titles.length).toBeGreaterThan(3);
    for (const f of r.findings) wordsOf(f, "half filled in");
  });
});
