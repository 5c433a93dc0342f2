import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { runLoopCheck } from "@/lib/calc/loop-check";
import { demoSystem } from "@/lib/calc/demo-system";
import { fillPressureBar, recommendedPrechargeBar } from "@/lib/calc/expansion";
import {
  DEFAULT_COEFFICIENTS,
  stagnationTemperatureC,
  collectorOutputW,
} from "@/lib/calc/collector";
import { systemSchema, type SystemInput } from "@/lib/validation/system";
import type { Finding } from "@/lib/calc/findings";
import { arbitrarySystem } from "../support/arbitrary-system";

const clone = (): SystemInput => structuredClone(demoSystem);
const find = (findings: Finding[], key: string) => findings.filter((f) => f.key === key);
const value = (f: Finding | undefined, label: string) =>
  f?.values.find((v) => v.label === label)?.value;

describe("trade rules of thumb (common practice, used as sanity ranges)", () => {
  it("stagnation: evacuated tubes with default coefficients exceed 200 °C; flat plates land in 150–210 °C", () => {
    expect(stagnationTemperatureC(DEFAULT_COEFFICIENTS.evacuated_tube)).toBeGreaterThan(200);
    const fp = stagnationTemperatureC(DEFAULT_COEFFICIENTS.flat_plate);
    expect(fp).toBeGreaterThan(150);
    expect(fp).toBeLessThan(210);
  });

  it("full sun gives about 1 kW per m² of aperture before losses (η₀ = 1, no losses → exactly G·A)", () => {
    expect(collectorOutputW({ eta0: 1, a1: 0, a2: 0 }, 2, 50, 50, 1000)).toBe(2000);
  });

  it("cold fill pressure for a two-storey house (static height 6–10 m) lands between 1.5 and 2.5 bar", () => {
    for (const h of [6, 7, 8, 9, 10]) {
      const pa = fillPressureBar(recommendedPrechargeBar(h));
      expect(pa).toBeGreaterThanOrEqual(1.5);
      expect(pa).toBeLessThanOrEqual(2.5);
    }
  });

  it("an ordinary heating vessel (70 °C diaphragm) off a cooling leg is a `fix`", () => {
    const s = clone();
    s.expansionVessel = { ...s.expansionVessel, diaphragmMaxTempC: 70, onCoolingLeg: false };
    expect(find(runLoopCheck(s).findings, "vessel-rating")[0]?.level).toBe("fix");
  });

  it("soft-soldered joints at the collector are a `fix`", () => {
    const s = clone();
    s.safety = { ...s.safety, jointsAtCollector: "soft_soldered" };
    expect(find(runLoopCheck(s).findings, "stagnation")[0]?.level).toBe("fix");
  });

  it("an isolatable automatic vent rated 150 °C at the high point is a `note`", () => {
    const s = clone();
    s.collectors = { ...s.collectors, highPointVent: "automatic_isolatable", ventMaxTempC: 150 };
    expect(find(runLoopCheck(s).findings, "stagnation")[0]?.level).toBe("note");
  });

  it("a component rated below the relief setting is a `stop`", () => {
    const s = clone();
    s.pumpStation = { ...s.pumpStation, lowestComponentMaxBar: 4 };
    expect(find(runLoopCheck(s).findings, "relief-margin")[0]?.level).toBe("stop");
  });
});

describe("runLoopCheck on the example system", () => {
  const result = runLoopCheck(demoSystem);

  it("has a finding for every computed key and no input problems", () => {
    const keys = new Set(result.findings.map((f) => f.key));
    for (const k of [
      "fluid-volume",
      "vessel-size",
      "vessel-precharge",
      "vessel-rating",
      "fill-pressure",
      "relief-margin",
      "freeze",
      "flow-rate",
      "hydraulics",
      "collector-output",
      "stagnation",
      "component-ratings",
      "steam-reach",
      "fluid",
      "pipe-insulation",
      "scald",
      "store-size",
      "coil-position",
      "unvented",
    ]) {
      expect(keys.has(k as Finding["key"]), k).toBe(true);
    }
    expect(keys.has("input")).toBe(false);
  });

  it("sizes the vessel by EN 12828 Annex D with the steam volume included (worked by hand)", () => {
    const f = find(result.findings, "vessel-size")[0];
    // The published formula (EN 12828:2012 Annex D; VDI 6002-1 adds the steam volume V_d):
    //   V_n ≥ (V_e + V_v + V_d) × (p_e + 1) / (p_e − p_0), pressures in bar gauge.
    // The example system, by hand:
    //   p_0 = 8 m × 0.1 bar/m + 0.4 = 1.2 bar (VDI 6002-1, from memory);
    //   p_e = 0.9 × 6 bar = 5.4 bar (relief above 5 bar; EN 12828, from memory);
    //   V_v = max(0.5 % × 15.5 L, 3 L) = 3 L; V_e = 0.96 L (7.7 % of the loop's 12.5 L of fluid);
    //   V_d = 2 × 1.6 L collectors + 25.8 m × 0.1453 L/m (15 × 0.7 tube, EN 1057) = 6.95 L;
    //   V_n = (0.96 + 3 + 6.95) × 6.4 / 4.2 = 10.91 × 1.5238 = 16.62 L → 16.6 L, next size 18 L.
    expect(value(f, "Pre-charge used for sizing")).toBe(1.2);
    expect(value(f, "Water seal")).toBe(3);
    expect(value(f, "Expansion to 120 °C")).toBeCloseTo(0.96, 2);
    expect(value(f, "Steam volume at stagnation")).toBeCloseTo(6.95, 2);
    expect(value(f, "Required nominal volume")).toBe(16.6);
    expect(value(f, "Next standard size")).toBe(18);
    expect(f?.level).toBe("fix");
    expect(f?.title).toBe("The 12 L expansion vessel is too small: 16.6 L needed, steam included");
    expect(value(find(result.findings, "relief-margin")[0], "Final design pressure")).toBe(5.4);
    expect(value(find(result.findings, "steam-reach")[0], "Steam reach")).toBe(25.8);
  });

  it("turns the vessel finding to `fix` when the vessel is too small and back to `ok` when enlarged", () => {
    const small = clone();
    small.expansionVessel = { ...small.expansionVessel, nominalVolumeL: 8 };
    expect(find(runLoopCheck(small).findings, "vessel-size")[0]?.level).toBe("fix");
    const big = clone();
    big.expansionVessel = { ...big.expansionVessel, nominalVolumeL: 18 };
    expect(find(runLoopCheck(big).findings, "vessel-size")[0]?.level).toBe("ok");
  });

  it("gives chart data: pressure rising from the fill pressure, and the freeze curve", () => {
    const p = result.charts.pressure!;
    expect(p.points[0]?.pressureBar).toBeCloseTo(p.fillBar, 2);
    expect(p.points.at(-1)!.pressureBar!).toBeGreaterThan(p.fillBar);
    expect(result.charts.freeze?.points.length).toBe(13);
  });

  it("flags a glycol mix that freezes above the site minimum", () => {
    const s = clone();
    s.fluid = { ...s.fluid, glycolPercentMass: 20 }; // freezes ≈ −7 °C; site −12 °C
    expect(find(runLoopCheck(s).findings, "freeze")[0]?.level).toBe("fix");
  });
});

const SECTIONS = [
  "Site",
  "Collector array",
  "Pipe runs",
  "Pump station",
  "Expansion vessel",
  "Heat-transfer fluid",
  "Cylinder and coils",
  "Fittings and safety devices",
];

describe("properties", () => {
  const requiredFor = (s: SystemInput) => {
    const f = find(runLoopCheck(s).findings, "vessel-size")[0];
    const v = value(f, "Required nominal volume");
    return typeof v === "number" ? v : Number.POSITIVE_INFINITY;
  };

  it("a larger static height never lowers the pre-charge", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 40, noNaN: true }),
        fc.double({ min: 0, max: 40, noNaN: true }),
        (a, b) => {
          const [lo, hi] = a < b ? [a, b] : [b, a];
          return recommendedPrechargeBar(hi) >= recommendedPrechargeBar(lo);
        },
      ),
    );
  });

  it("a higher relief setting never increases the required vessel volume", () => {
    fc.assert(
      fc.property(
        arbitrarySystem,
        fc.double({ min: 1.5, max: 10, noNaN: true }),
        fc.double({ min: 1.5, max: 10, noNaN: true }),
        (sys, a, b) => {
          const [lo, hi] = a < b ? [a, b] : [b, a];
          const low = { ...sys, pumpStation: { ...sys.pumpStation, reliefValveBar: lo } };
          const high = { ...sys, pumpStation: { ...sys.pumpStation, reliefValveBar: hi } };
          return requiredFor(high) <= requiredFor(low) + 1e-9;
        },
      ),
      { numRuns: 200 },
    );
  }, 60_000);

  it("no valid input yields NaN or Infinity in any finding", () => {
    fc.assert(
      fc.property(arbitrarySystem, (sys) => {
        expect(systemSchema.safeParse(sys).success).toBe(true);
        const r = runLoopCheck(sys);
        for (const f of r.findings) {
          for (const v of f.values) {
            if (typeof v.value === "number") expect(Number.isFinite(v.value)).toBe(true);
            else expect(v.value).not.toMatch(/NaN|Infinity/);
          }
          expect(f.title).not.toMatch(/NaN|Infinity|undefined/);
        }
        for (const p of r.charts.pressure?.points ?? [])
          expect(p.pressureBar === null || Number.isFinite(p.pressureBar)).toBe(true);
      }),
      { numRuns: 300 },
    );
  }, 60_000);

  it("any input at all gives findings or a schema error, never an exception", () => {
    fc.assert(
      fc.property(fc.anything(), fc.anything(), fc.anything(), (a, b, c) => {
        const draft = { site: a, collectors: b, pipeRuns: c, pumpStation: a, fluid: b } as never;
        const r = runLoopCheck(draft);
        expect(systemSchema.safeParse(draft).success).toBe(false);
        // Each section says, once, that it is missing or what is wrong with it …
        const inputs = r.findings.filter((f) => f.key === "input");
        expect([...new Set(inputs.map((f) => f.title.split(":")[0]))]).toEqual(SECTIONS);
        for (const f of inputs) {
          expect(f.level).toBe("note");
          expect(f.title).not.toMatch(/NaN|\[object/);
        }
        // … and nothing is computed from garbage: every check waits for its sections.
        for (const f of r.findings.filter((x) => x.key !== "input")) {
          expect(f.level, f.title).toBe("note");
          expect(f.title).toMatch(/not checked yet$/);
        }
        expect(r.charts.pressure).toBeUndefined();
      }),
      { numRuns: 300 },
    );
    for (const hostile of [null, undefined, 42, "x", [], {}, { site: "x", pipeRuns: 7 }]) {
      const r = runLoopCheck(hostile as never);
      expect(r.findings.filter((f) => f.key === "input").map((f) => f.title)).toEqual([
        typeof hostile === "object" && hostile && "site" in hostile
          ? "Site: expected a group of details here"
          : "Site: not filled in yet",
        "Collector array: not filled in yet",
        "Pipe runs: add at least one pipe run",
        "Pump station: not filled in yet",
        "Expansion vessel: not filled in yet",
        "Heat-transfer fluid: not filled in yet",
        "Cylinder and coils: not filled in yet",
        "Fittings and safety devices: not filled in yet",
      ]);
      expect(r.findings.find((f) => f.key === "vessel-size")?.title).toBe(
        "Expansion vessel size and pressures not checked yet",
      );
    }
  });

  it("says what is missing in a half-filled draft and still computes what it can", () => {
    const r = runLoopCheck({ site: demoSystem.site, fluid: demoSystem.fluid });
    expect(find(r.findings, "freeze")[0]?.level).toBe("ok");
    expect(r.findings.some((f) => f.key === "input" && f.title.startsWith("Collector array"))).toBe(
      true,
    );
    expect(
      r.findings.some((f) => f.key === "vessel-size" && f.title.includes("not checked yet")),
    ).toBe(true);
  });
});
