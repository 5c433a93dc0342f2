import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { runLoopCheck } from "@/lib/calc/loop-check";
import { demoSystem } from "@/lib/calc/demo-system";
import {
  fillPressureBar,
  finalPressureBar,
  recommendedPrechargeBar,
  requiredVesselVolumeL,
} from "@/lib/calc/expansion";
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

  it("sizes the vessel by EN 12828 Annex D with the steam volume included", () => {
    const f = find(result.findings, "vessel-size")[0];
    const expansion = Number(value(f, "Expansion to 120 °C"));
    const seal = Number(value(f, "Water seal"));
    const steam = Number(value(f, "Steam volume at stagnation"));
    const p0 = recommendedPrechargeBar(8);
    const pe = finalPressureBar(6);
    const expected = requiredVesselVolumeL({
      expansionL: expansion,
      waterSealL: seal,
      steamVolumeL: steam,
      prechargeBar: p0,
      finalPressureBar: pe,
    });
    expect(Number(value(f, "Required nominal volume"))).toBeCloseTo(expected, 0);
    // The steam volume is the two collectors (2 × 1.6 L) plus the pipe within the computed steam
    // reach, 15 × 0.7 tube at 0.1453 L/m (EN 1057).
    const reach = Number(value(find(result.findings, "steam-reach")[0], "Steam reach"));
    expect(steam).toBeCloseTo(3.2 + reach * 0.1453, 1);
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
  });

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
  });

  it("any input at all gives findings or a schema error, never an exception", () => {
    fc.assert(
      fc.property(fc.anything(), fc.anything(), fc.anything(), (a, b, c) => {
        const draft = { site: a, collectors: b, pipeRuns: c, pumpStation: a, fluid: b } as never;
        const r = runLoopCheck(draft);
        expect(r.findings.some((f) => f.key === "input")).toBe(true);
        expect(systemSchema.safeParse(draft).success).toBe(false);
      }),
      { numRuns: 300 },
    );
    expect(runLoopCheck(null).findings.length).toBeGreaterThan(0);
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
