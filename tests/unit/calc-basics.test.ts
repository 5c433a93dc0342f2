/**
 * The small building blocks of the loop check, each checked against a value from outside the
 * project (named beside it) or worked by hand from the published formula (working in the
 * comment). Written so the mutation run (tests/mutation/survivors.md) finds each rule stated.
 */
import { describe, expect, it } from "vitest";
import { CATALOGUE } from "@/lib/checklist/catalogue";
import { runLoopCheck } from "@/lib/calc/loop-check";
import { demoSystem } from "@/lib/calc/demo-system";
import {
  ATM_BAR,
  G,
  barGaugeToMPaAbs,
  barToPa,
  cToK,
  isFiniteNumber,
  kToC,
  lphToM3s,
  m3sToLph,
  paToBar,
  round,
} from "@/lib/calc/units";
import {
  COPPER_TUBE_IDS,
  FLEX_DEFAULTS,
  copperInnerDiameterMm,
  copperOuterDiameterMm,
  litresPerMetre,
  type CopperTubeId,
} from "@/lib/calc/tubes";
import { fluidModel } from "@/lib/calc/fluid";
import {
  ADVISORY_LINE,
  FINDING_KEYS,
  LEVELS,
  LEVEL_LABELS,
  isFiniteFinding,
  worstLevel,
  type Finding,
} from "@/lib/calc/findings";
import {
  CONSERVATIVE_STAGNATION_C,
  DEFAULT_COEFFICIENTS,
  collectorEfficiency,
  collectorOutputW,
  stagnationEstimate,
  stagnationTemperatureC,
} from "@/lib/calc/collector";
import { frictionFactor, pipePressureDrop, pressureToHeadM } from "@/lib/calc/hydraulics";

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe("units", () => {
  it("converts pressure, temperature and flow at the edges", () => {
    // 1 atm = 1.01325 bar and g_n = 9.80665 m/s² (CGPM definitions).
    expect(ATM_BAR).toBe(1.01325);
    expect(G).toBe(9.80665);
    expect(barToPa(2.5)).toBe(250_000); // 1 bar = 1e5 Pa (SI definition)
    expect(paToBar(150_000)).toBe(1.5);
    expect(cToK(20)).toBeCloseTo(293.15, 12); // T(K) = t(°C) + 273.15 (SI)
    expect(kToC(373.15)).toBeCloseTo(100, 12);
    // 2 bar gauge + 1.01325 bar atmosphere = 3.01325 bar abs = 0.301325 MPa (by hand).
    expect(barGaugeToMPaAbs(2)).toBeCloseTo(0.301325, 12);
    // 360 L/h = 0.36 m³ / 3600 s = 1e-4 m³/s (by hand).
    expect(lphToM3s(360)).toBeCloseTo(1e-4, 15);
    expect(m3sToLph(1e-4)).toBeCloseTo(360, 9);
  });

  it("rounds for display, to 2 places by default, and never shows -0", () => {
    expect(round(1.23456)).toBe(1.23);
    expect(round(1.23456, 3)).toBe(1.235);
    expect(round(7.5, 0)).toBe(8);
    expect(round(-2.5, 0)).toBe(-2); // Math.round rounds half up
    expect(Object.is(round(-0.001), 0)).toBe(true);
    expect(Object.is(round(-0.4, 0), 0)).toBe(true);
    expect(round(-1.236)).toBe(-1.24);
  });

  it("accepts only finite numbers as numbers", () => {
    expect(isFiniteNumber(3)).toBe(true);
    expect(isFiniteNumber(0)).toBe(true);
    expect(isFiniteNumber(Number.NaN)).toBe(false);
    expect(isFiniteNumber(Number.POSITIVE_INFINITY)).toBe(false);
    expect(isFiniteNumber("3")).toBe(false);
    expect(isFiniteNumber(null)).toBe(false);
  });
});

describe("tubes", () => {
  it("offers the EN 1057 sizes in order, and knows each outer diameter", () => {
    expect(COPPER_TUBE_IDS).toEqual([
      "10x0.6",
      "12x0.6",
      "15x0.7",
      "15x1.0",
      "22x0.9",
      "22x1.0",
      "28x0.9",
      "28x1.5",
    ]);
    expect(copperOuterDiameterMm("15x0.7")).toBe(15); // EN 1057 Table 3
    expect(copperOuterDiameterMm("28x1.5")).toBe(28);
  });

  it("refuses a tube it does not know, naming it", () => {
    expect(() => copperInnerDiameterMm("35x1.2" as CopperTubeId)).toThrow(
      new RangeError("unknown tube 35x1.2"),
    );
    expect(() => copperOuterDiameterMm("35x1.2" as CopperTubeId)).toThrow(
      new RangeError("unknown tube 35x1.2"),
    );
  });

  it("a 16 mm bore holds about 0.2 L/m, as the flexible DN16 default says (common practice)", () => {
    // π × 0.16² / 4 dm² = 0.2011 L/m (by hand).
    expect(litresPerMetre(16)).toBeCloseTo(0.2011, 4);
    expect(FLEX_DEFAULTS.DN16.contentLPerM).toBeGreaterThan(litresPerMetre(16) * 0.95);
    expect(FLEX_DEFAULTS.DN20.contentLPerM).toBeGreaterThan(litresPerMetre(20) * 0.95);
  });
});

describe("the loop's fluid model", () => {
  it("plain water (and a 0 % or negative mix) is one model: freezes at 0 °C, labelled in words", () => {
    for (const m of [
      fluidModel("none", 40),
      fluidModel("propylene", 0),
      fluidModel("ethylene", -5),
    ]) {
      expect(m.kind).toBeNull();
      expect(m.percent).toBe(0);
      expect(m.freezeC).toBe(0);
      expect(m.label).toBe("plain water");
      expect(m.iceFraction(-0.5)).toBe(1);
      expect(m.iceFraction(0)).toBe(0);
      expect(m.iceFraction(4)).toBe(0);
    }
  });

  it("water's density and viscosity, clamped to the liquid range 0–100 °C", () => {
    const w = fluidModel("none", 0);
    // CRC Handbook: ρ(20 °C) = 998.21 kg/m³ at 1 atm; at 3 bar abs about 0.1 kg/m³ more.
    expect(Math.abs(w.densityKgM3(20) - 998.21)).toBeLessThan(0.3);
    // CRC Handbook: ρ(0 °C) = 999.84; ρ(100 °C, saturated liquid) = 958.35 kg/m³.
    expect(Math.abs(w.densityKgM3(-10) - 999.84)).toBeLessThan(0.3);
    expect(Math.abs(w.densityKgM3(150) - 958.35)).toBeLessThan(0.5);
    // CRC Handbook: μ(20 °C) = 1.002 mPa·s; μ(0 °C) = 1.792 mPa·s; μ(100 °C) = 0.282 mPa·s.
    expect(rel(w.viscosityPas(20), 1.002e-3)).toBeLessThan(0.01);
    // (The Vogel fit reads about 2 % low at 0 °C.)
    expect(rel(w.viscosityPas(-5), 1.792e-3)).toBeLessThan(0.03);
    expect(rel(w.viscosityPas(130), 0.282e-3)).toBeLessThan(0.02);
  });

  it("a glycol mix uses its own glycol's properties and says which", () => {
    const pg = fluidModel("propylene", 40);
    expect(pg.kind).toBe("propylene");
    expect(pg.percent).toBe(40);
    expect(pg.label).toBe("40 % propylene glycol");
    // ASHRAE Fundamentals, propylene glycol 40 mass %: −21.1 °C (recalled from memory), ±1.5 K.
    expect(Math.abs(pg.freezeC - -21.1)).toBeLessThan(1.5);
    // MacBeth & Thompson (1951): 40 % at 35 °C, 1022.95 kg/m³, ±0.2 %.
    expect(rel(pg.densityKgM3(35), 1022.95)).toBeLessThan(0.002);
    expect(pg.iceFraction(-10)).toBe(0);
    expect(pg.iceFraction(-30)).toBeGreaterThan(0);
    // A glycol mix is more viscous than water: at 20 °C, 40 % PG is about 4–5 mPa·s
    // (ASHRAE Fundamentals secondary-coolant tables, recalled from memory).
    expect(pg.viscosityPas(20)).toBeGreaterThan(3e-3);
    expect(pg.viscosityPas(20)).toBeLessThan(6e-3);

    const eg = fluidModel("ethylene", 30);
    expect(eg.kind).toBe("ethylene");
    expect(eg.label).toBe("30 % ethylene glycol");
    // ASHRAE Fundamentals, ethylene glycol 30 mass %: about −15 °C (recalled from memory), ±1.5 K.
    expect(Math.abs(eg.freezeC - -15.4)).toBeLessThan(1.5);
    // CRC Handbook, ethylene glycol 30 mass % at 20 °C: about 1038 kg/m³ (recalled from memory).
    expect(rel(eg.densityKgM3(20), 1038)).toBeLessThan(0.005);
  });
});

describe("findings", () => {
  const f = (level: Finding["level"], value: number | string = 1): Finding => ({
    key: "input",
    level,
    title: "t",
    values: [{ label: "x", value }],
    source: "s",
    action: "a",
  });

  it("the worst level wins, ok when there is nothing", () => {
    expect(LEVELS).toEqual(["ok", "note", "fix", "stop"]);
    expect(worstLevel([])).toBe("ok");
    expect(worstLevel([f("ok")])).toBe("ok");
    expect(worstLevel([f("note"), f("ok")])).toBe("note");
    expect(worstLevel([f("fix"), f("note")])).toBe("fix");
    expect(worstLevel([f("note"), f("stop"), f("fix")])).toBe("stop");
  });

  it("shows levels in words and the advisory line", () => {
    expect(LEVEL_LABELS).toEqual({ ok: "OK", note: "Note", fix: "Fix", stop: "Stop" });
    expect(ADVISORY_LINE).toBe(
      "Advisory only: local building codes, the manufacturer's instructions and licensed practice take precedence over this check.",
    );
  });

  it("a finding with NaN or Infinity is not finite; words and finite numbers are", () => {
    expect(isFiniteFinding(f("ok", 2.5))).toBe(true);
    expect(isFiniteFinding(f("ok", "about 3 L"))).toBe(true);
    expect(isFiniteFinding({ ...f("ok"), values: [] })).toBe(true);
    expect(isFiniteFinding(f("ok", Number.NaN))).toBe(false);
    expect(isFiniteFinding(f("ok", Number.NEGATIVE_INFINITY))).toBe(false);
  });

  it("has the finding keys the checklist's `computed` names refer to, and the example produces them", () => {
    // Every catalogue item that cites a computation cites a key the loop check knows …
    const cited = new Set(CATALOGUE.flatMap((i) => (i.computed ? [i.computed] : [])));
    for (const key of cited) expect(FINDING_KEYS).toContain(key);
    // … and the example system's loop check gives a finding under each cited key (first-fill
    // comes from the first-fill record, lib/calc/first-fill.ts, not from the design).
    const produced = new Set(runLoopCheck(demoSystem).findings.map((f) => f.key));
    for (const key of cited) if (key !== "first-fill") expect(produced, key).toContain(key);
    expect(cited).toContain("first-fill");
    expect(new Set(FINDING_KEYS).size).toBe(FINDING_KEYS.length);
    expect(FINDING_KEYS).toContain("input");
  });
});

describe("collector (EN ISO 9806 efficiency curve)", () => {
  const fp = DEFAULT_COEFFICIENTS.flat_plate;
  const et = DEFAULT_COEFFICIENTS.evacuated_tube;

  it("keeps the default coefficients (common practice, computation.md §7)", () => {
    expect(fp).toEqual({ eta0: 0.78, a1: 3.5, a2: 0.015 });
    expect(et).toEqual({ eta0: 0.65, a1: 1.2, a2: 0.008 });
    expect(CONSERVATIVE_STAGNATION_C).toEqual({ flat_plate: 220, evacuated_tube: 300 });
  });

  it("efficiency and output, worked by hand", () => {
    // η = 0.78 − 3.5·50/800 − 0.015·50²/800 = 0.78 − 0.21875 − 0.046875 = 0.514375
    expect(collectorEfficiency(fp, 80, 30, 800)).toBeCloseTo(0.514375, 12);
    // Q = η G A = 0.514375 × 800 × 2 = 823.0 W
    expect(collectorOutputW(fp, 2, 80, 30, 800)).toBeCloseTo(823, 9);
    // Below ambient the linear term turns to a gain: ΔT = −10 at G = 1000,
    // η = 0.78 + 3.5·10/1000 − 0.015·100/1000 = 0.78 + 0.035 − 0.0015 = 0.8135.
    expect(collectorEfficiency(fp, 20, 30, 1000)).toBeCloseTo(0.8135, 12);
    // No sun, no output; past stagnation the efficiency stays at zero.
    expect(collectorEfficiency(fp, 60, 20, 0)).toBe(0);
    expect(collectorEfficiency(fp, 60, 20, -5)).toBe(0);
    expect(collectorEfficiency(fp, 250, 30, 1000)).toBe(0);
  });

  it("stagnation from the curve, worked by hand at 1000 W/m² and 30 °C", () => {
    // Flat plate: ΔT = (−3.5 + √(3.5² + 4·0.015·0.78·1000)) / (2·0.015) = (−3.5 + √59.05)/0.03
    //           = (−3.5 + 7.68440)/0.03 = 139.48 K → 169.5 °C (within 150–210 °C, common practice).
    expect(stagnationTemperatureC(fp)).toBeCloseTo(169.48, 1);
    // Evacuated tube: (−1.2 + √(1.44 + 20.8))/0.016 = (−1.2 + 4.71593)/0.016 = 219.75 K → 249.7 °C
    // (above 200 °C, common practice).
    expect(stagnationTemperatureC(et)).toBeCloseTo(249.75, 1);
    // Linear curve (a₂ = 0): ΔT = η₀ G / a₁ = 0.8·1000/4 = 200 K → 230 °C; at G = 500, 25 °C: 125 °C.
    expect(stagnationTemperatureC({ eta0: 0.8, a1: 4, a2: 0 })).toBeCloseTo(230, 12);
    expect(stagnationTemperatureC({ eta0: 0.8, a1: 4, a2: 0 }, 500, 25)).toBeCloseTo(125, 12);
    // No losses at all: no finite stagnation.
    expect(stagnationTemperatureC({ eta0: 0.8, a1: 0, a2: 0 })).toBe(Number.POSITIVE_INFINITY);
  });

  it("the estimate takes the test report, else the higher of the curve and the conservative default", () => {
    expect(stagnationEstimate("flat_plate", fp, 190)).toEqual({
      tempC: 190,
      basis: "test report",
    });
    expect(stagnationEstimate("flat_plate", fp)).toEqual({
      tempC: 220,
      basis: "conservative default",
    });
    expect(stagnationEstimate("evacuated_tube", et)).toEqual({
      tempC: 300,
      basis: "conservative default",
    });
    // η₀ 0.8, a₁ 1, a₂ 0: ΔT = 800 K → 830 °C, above the 220 °C default.
    expect(stagnationEstimate("flat_plate", { eta0: 0.8, a1: 1, a2: 0 })).toEqual({
      tempC: 830,
      basis: "efficiency curve",
    });
    // Exactly at the default: the default is kept (same figure, plainer basis).
    // η₀ 0.76, a₁ 4, a₂ 0: ΔT = 190 K → 220 °C.
    expect(stagnationEstimate("flat_plate", { eta0: 0.76, a1: 4, a2: 0 }).basis).toBe(
      "conservative default",
    );
    expect(stagnationEstimate("flat_plate", { eta0: 0.8, a1: 0, a2: 0 })).toEqual({
      tempC: 220,
      basis: "conservative default",
    });
  });
});

describe("hydraulics edges", () => {
  it("no flow, no friction", () => {
    expect(frictionFactor(0, 1e-4)).toBe(0);
    expect(frictionFactor(-10, 1e-4)).toBe(0);
  });

  it("from Re 2300 on the flow is not laminar; in the transition the larger factor is taken", () => {
    // Laminar just below: f = 64/2299 = 0.027838 (Hagen–Poiseuille).
    expect(frictionFactor(2299, 1e-4)).toBeCloseTo(64 / 2299, 12);
    // At 2300 and 3000 the turbulent value applies; Blasius for smooth pipe, f = 0.316 Re^−0.25
    // (White, Fluid Mechanics, eq. 6.39), by hand: 3000^0.25 = 7.4008 → f = 0.0427; it is well
    // above 64/3000 = 0.0213, so taking the smaller would halve the friction.
    expect(frictionFactor(2300, 1e-5)).toBeGreaterThan(0.04);
    expect(rel(frictionFactor(3000, 1e-5), 0.0427)).toBeLessThan(0.06);
    // Fully turbulent at Re = 1e5, smooth: Blasius 0.316/17.783 = 0.01777; Colebrook within 3 %.
    expect(rel(frictionFactor(1e5, 1e-6), 0.01777)).toBeLessThan(0.03);
  });

  it("the laminar flag follows Re, and head is pressure over ρ g", () => {
    const base = {
      innerDiameterM: 0.0136,
      lengthM: 10,
      roughnessM: 1.5e-6,
      densityKgM3: 1000,
      dynamicViscosityPas: 1e-3,
    };
    // Re = V D / ν; V = Q / (π D²/4). Q = 1e-4 m³/s → V = 0.6884 m/s, Re = 0.6884·0.0136/1e-6 = 9362.
    const fast = pipePressureDrop({ ...base, flowM3s: 1e-4 });
    expect(fast.laminar).toBe(false);
    expect(fast.reynolds).toBeCloseTo(9362, -1);
    // Q = 1e-5 → Re = 936: laminar.
    expect(pipePressureDrop({ ...base, flowM3s: 1e-5 }).laminar).toBe(true);
    // 1 bar of water (1000 kg/m³) is 1e5 / (1000 × 9.80665) = 10.197 m of head (by hand).
    expect(pressureToHeadM(1e5, 1000)).toBeCloseTo(10.197, 3);
  });
});
