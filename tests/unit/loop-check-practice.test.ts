/**
 * The loop check as a solar-thermal installer would review it: steam reach, the one fill
 * pressure, relief margins, stagnation, freeze, flow and head, and the inputs that used to be
 * ignored. Each check value names its source; rules of thumb are marked common practice.
 */
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { runLoopCheck, FREEZE_MARGIN_K, SPECIFIC_FLOW } from "@/lib/calc/loop-check";
import { demoSystem } from "@/lib/calc/demo-system";
import { CONSERVATIVE_STAGNATION_C } from "@/lib/calc/collector";
import { LEVEL_RANK, type Finding, type FindingKey, type Level } from "@/lib/calc/findings";
import type { SystemInput } from "@/lib/validation/system";
import { arbitrarySystem } from "../support/arbitrary-system";

const clone = (): SystemInput => structuredClone(demoSystem);
const all = (s: SystemInput, key: FindingKey) =>
  runLoopCheck(s).findings.filter((f) => f.key === key);
const one = (s: SystemInput, key: FindingKey): Finding => {
  const f = all(s, key)[0];
  if (!f) throw new Error(`no ${key} finding`);
  return f;
};
const value = (f: Finding, label: string) => f.values.find((v) => v.label === label)?.value;
const num = (f: Finding, label: string) => Number(value(f, label));
const withVessel = (s: SystemInput, nominalVolumeL: number): SystemInput => ({
  ...s,
  expansionVessel: { ...s.expansionVessel, nominalVolumeL },
});

describe("1. steam reach is computed (VDI 6002-1)", () => {
  it("the example system, whose hand-ticked reach covered only its 4 m roof run, now fills about 26 m of pipe with steam, so its 12 L vessel is too small and the relief valve lifts", () => {
    const s = clone();
    const reach = one(s, "steam-reach");
    // Common practice range: a two-collector flat-plate array on insulated 15 mm copper sends
    // steam some 10–30 m down the pipes (flow and return together).
    expect(num(reach, "Steam reach")).toBeGreaterThan(10);
    expect(num(reach, "Steam reach")).toBeLessThan(30);
    expect(one(s, "vessel-size").level).toBe("fix");
    expect(one(s, "relief-margin").level).toBe("fix");
    expect(one(s, "relief-margin").title).toMatch(/relief valve lifts/);
  });

  it("the same system with an 18 L vessel passes the size and relief checks", () => {
    const s = withVessel(clone(), 18);
    expect(one(s, "vessel-size").level).toBe("ok");
    expect(one(s, "relief-margin").level).toBe("ok");
  });

  it("evacuated tubes send steam past the pump station: a `stop` naming a stagnation cooler or an intermediate vessel", () => {
    const s = withVessel(clone(), 25);
    s.collectors = { ...s.collectors, type: "evacuated_tube", fluidContentLEach: 1.1 };
    const f = one(s, "steam-reach");
    expect(f.level).toBe("stop");
    expect(f.action).toMatch(/stagnation cooler/);
    expect(f.action).toMatch(/intermediate vessel of at least \d+ L/);
    // With an intermediate vessel sized for the displaced volume the vessel is safe; the pump
    // station still gets steam, which stays a `fix`.
    s.expansionVessel = { ...s.expansionVessel, intermediateVesselL: 8 };
    expect(one(s, "steam-reach").level).toBe("fix");
    expect(one(s, "component-ratings").level).toBe("fix");
  });

  it("a flat plate that empties well halves the steam-producing power (60 against 120 W/m², VDI 6002-1, from memory) and so the reach", () => {
    const poor = clone();
    const good = clone();
    good.collectors = { ...good.collectors, emptying: "good" };
    const rp = num(one(poor, "steam-reach"), "Steam reach");
    const rg = num(one(good, "steam-reach"), "Steam reach");
    expect(rg / rp).toBeCloseTo(0.5, 1);
  });

  it("a bare run shortens the reach; thicker insulation lengthens it", () => {
    const bare = clone();
    bare.pipeRuns = bare.pipeRuns.map((r) => ({ ...r, insulated: false }));
    const thick = clone();
    thick.pipeRuns = thick.pipeRuns.map((r) => ({ ...r, insulationMm: 40 }));
    const base = num(one(clone(), "steam-reach"), "Steam reach");
    expect(num(one(bare, "steam-reach"), "Steam reach")).toBeLessThan(base);
    expect(num(one(thick, "steam-reach"), "Steam reach")).toBeGreaterThan(base);
  });

  it("a reach given by hand needs a reason, and is then used and said", () => {
    const noReason = clone();
    noReason.design = { fillTempC: 15, maxLiquidTempC: 120, steamReachM: 5 };
    expect(runLoopCheck(noReason).findings.some((f) => f.key === "input")).toBe(true);
    const s = clone();
    s.design = {
      fillTempC: 15,
      maxLiquidTempC: 120,
      steamReachM: 5,
      steamReachReason: "measured on a stagnation test last summer",
    };
    const f = one(s, "steam-reach");
    expect(num(f, "Steam reach (given by hand)")).toBe(5);
    expect(f.source).toMatch(/stagnation test/);
  });
});

describe("2. one fill pressure, and the collector top cold and hot", () => {
  it("a 15 m static height with the pre-charge left at 1.2 bar is a `fix` naming the pre-charge", () => {
    const s = withVessel(clone(), 25);
    s.pumpStation = { ...s.pumpStation, staticHeightM: 15 };
    const pre = one(s, "vessel-precharge");
    expect(pre.level).toBe("fix");
    expect(pre.title).toMatch(/pre-charge/);
    // VDI 6002-1 (from memory): 0.1 bar/m × 15 m + 0.4 bar = 1.9 bar.
    expect(pre.title).toMatch(/1\.9 bar/);
    const fill = one(s, "fill-pressure");
    expect(fill.level).toBe("fix");
    expect(fill.title).toMatch(/pre-charge/);
    expect(fill.action).toMatch(/pre-charge to 1\.9 bar/);
  });

  it("every pressure finding uses the fill pressure from the pre-charge actually set (Boyle with the water seal)", () => {
    const s = clone();
    const fill = num(one(s, "fill-pressure"), "Fill pressure at the pump station, cold");
    // 12 L vessel, 1.2 bar pre-charge, 3 L seal: (1.2 + 1) × 12 / 9 − 1 = 1.93 bar.
    expect(fill).toBeCloseTo(1.93, 2);
    expect(runLoopCheck(s).charts.pressure?.fillBar).toBeCloseTo(fill, 2);
    expect(runLoopCheck(s).charts.pressure?.points[0]?.pressureBar).toBeCloseTo(fill, 2);
  });

  it("the collector top is the gauge less the fluid column; the example keeps well above 0.3 bar on a cold night", () => {
    const f = one(clone(), "fill-pressure");
    expect(f.level).toBe("ok");
    const atFill = num(f, "Collector top, at filling");
    // 8 m of 40 % propylene glycol (≈1042 kg/m³ at 15 °C, Melinder): ρ g h ≈ 0.82 bar.
    expect(num(f, "Fill pressure at the pump station, cold") - atFill).toBeCloseTo(0.82, 1);
    expect(num(f, "Collector top on a cold night (-12 °C)")).toBeGreaterThan(0.3);
  });
});

describe("3. relief margins and pressure ratings", () => {
  it("a stagnation pressure above the final design pressure but below the relief setting is a `fix`, and the title says the margin is used up", () => {
    // Find a vessel size that lands between p_e = 5.4 bar and the 6 bar setting.
    let found: Finding | undefined;
    for (let v = 12; v <= 30 && !found; v += 0.5) {
      const f = one(withVessel(clone(), v), "relief-margin");
      const p = value(f, "Pressure at stagnation (chosen vessel)");
      if (typeof p === "number" && p > 5.4 && p < 6) found = f;
    }
    expect(found).toBeDefined();
    expect(found!.level).toBe("fix");
    expect(found!.title).not.toMatch(/under the/);
    expect(found!.title).toMatch(/above the 5\.4 bar design limit/);
  });

  it("a collector or coil rated below the relief setting is a `stop`; a missing rating is said", () => {
    const s = withVessel(clone(), 18);
    s.collectors = { ...s.collectors, maxPressureBar: 4 };
    expect(one(s, "relief-margin").level).toBe("stop");
    const c = withVessel(clone(), 18);
    c.cylinder = { ...c.cylinder, solarCoilMaxBar: 5 };
    expect(one(c, "relief-margin").title).toMatch(/solar coil/);
    const unknown = withVessel(clone(), 18);
    unknown.collectors = { ...unknown.collectors, maxPressureBar: undefined };
    const f = one(unknown, "relief-margin");
    expect(f.level).toBe("note");
    expect(f.action).toMatch(/maximum operating pressure of the collector/);
  });
});

describe("4. stagnation temperature and the highest liquid temperature", () => {
  it("takes the test report's figure when given", () => {
    const s = clone();
    s.collectors = { ...s.collectors, stagnationTempC: 185 };
    expect(num(one(s, "stagnation"), "Stagnation temperature")).toBe(185);
  });

  it("without it uses a cautious default, not the lower curve extrapolation (typical test reports, from memory: flat plates up to about 220 °C, evacuated tubes about 300 °C)", () => {
    expect(num(one(clone(), "stagnation"), "Stagnation temperature")).toBe(
      CONSERVATIVE_STAGNATION_C.flat_plate,
    );
    const e = clone();
    e.collectors = { ...e.collectors, type: "evacuated_tube" };
    expect(num(one(e, "stagnation"), "Stagnation temperature")).toBeGreaterThanOrEqual(300);
  });

  it("the highest liquid temperature is the boiling point at the stagnation pressure when that is above 120 °C: 165 °C once the 6 bar relief valve lifts (steam tables: 164.95 °C at 0.7 MPa)", () => {
    const f = one(clone(), "vessel-rating");
    const t = num(
      f,
      "Highest liquid temperature (boiling point at the stagnation pressure, at least 120 °C)",
    );
    expect(Math.abs(t - 165)).toBeLessThanOrEqual(1);
  });

  it("an unknown insulation rating is flagged with the computed reach, not 'a metre or two'", () => {
    const s = clone();
    s.safety = { ...s.safety, insulationMaxTempC: undefined };
    const f = one(s, "stagnation");
    expect(f.level).toBe("note");
    expect(f.action).toMatch(/first about [\d.]+ m of pipe/);
    expect(f.action).not.toMatch(/metre or two/);
  });

  it("insulation rated below the steam's boiling point is a `fix`", () => {
    const s = clone();
    s.safety = { ...s.safety, insulationMaxTempC: 120 };
    expect(one(s, "stagnation").level).toBe("fix");
  });
});

describe("5. freeze: one physics for every fluid", () => {
  it("plain water and a 0 % propylene mix get the same finding at any site minimum (property)", () => {
    fc.assert(
      fc.property(fc.double({ min: -45, max: 15, noNaN: true }), (min) => {
        const water = clone();
        water.site = { ...water.site, designMinTempC: min };
        water.fluid = { glycolType: "none", glycolPercentMass: 0, solarRated: true };
        const zero = structuredClone(water);
        zero.fluid = { glycolType: "propylene", glycolPercentMass: 0, solarRated: true };
        const a = one(water, "freeze");
        const b = one(zero, "freeze");
        expect(a.level).toBe(b.level);
        expect(a.title).toBe(b.title);
      }),
      { numRuns: 60 },
    );
  });

  it("plain water where the collector can see frost is a `stop`; above frost it is `ok`", () => {
    const s = clone();
    s.fluid = { glycolType: "none", glycolPercentMass: 0, solarRated: true };
    expect(one(s, "freeze").level).toBe("stop");
    s.site = { ...s.site, designMinTempC: 8 };
    expect(one(s, "freeze").level).toBe("ok");
  });

  it(`keeps a ${FREEZE_MARGIN_K} K clear-sky margin (common practice): 30 % propylene (freezes at −12.8 °C, Melinder) is a \`fix\` at a −10 °C site and \`ok\` at −7 °C`, () => {
    const s = clone();
    s.fluid = { ...s.fluid, glycolPercentMass: 30 };
    s.site = { ...s.site, designMinTempC: -10 };
    expect(one(s, "freeze").level).toBe("fix");
    s.site = { ...s.site, designMinTempC: -7 };
    expect(one(s, "freeze").level).toBe("ok");
  });

  it("ethylene glycol is computed from its own data, not skipped: 40 % (freezes near −24 °C, Melinder) protects a −12 °C site", () => {
    const s = clone();
    s.fluid = { glycolType: "ethylene", glycolPercentMass: 40, solarRated: true };
    const f = one(s, "freeze");
    expect(f.level).toBe("ok");
    expect(num(f, "Freezing point (first crystals)")).toBeLessThan(-22);
    expect(one(s, "fluid").level).toBe("fix"); // toxic beside drinking water
  });

  it("below 25 % glycol the inhibitors do not protect (common practice): a `fix` even where frost is no issue", () => {
    const s = clone();
    s.site = { ...s.site, designMinTempC: 10 };
    s.fluid = { ...s.fluid, glycolPercentMass: 15 };
    expect(one(s, "freeze").level).toBe("ok");
    const f = one(s, "fluid");
    expect(f.level).toBe("fix");
    expect(f.action).toMatch(/at least 25 %/);
  });

  it("a colder site never gives a better freeze level (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 60, noNaN: true }),
        fc.double({ min: -45, max: 15, noNaN: true }),
        fc.double({ min: -45, max: 15, noNaN: true }),
        fc.constantFrom("propylene" as const, "ethylene" as const),
        (percent, a, b, glycolType) => {
          const [cold, warm] = a < b ? [a, b] : [b, a];
          const at = (min: number) => {
            const s = clone();
            s.site = { ...s.site, designMinTempC: min };
            s.fluid = { glycolType, glycolPercentMass: percent, solarRated: true };
            return LEVEL_RANK[one(s, "freeze").level];
          };
          return at(cold) >= at(warm);
        },
      ),
      { numRuns: 80 },
    );
  });
});

describe("6. flow and head", () => {
  it("the design flow follows the chosen operation: high-flow 40, low-flow 18 L/(m²·h) (the middle of 30–50, common practice, and of 12–24, Kalogirou 2009), or the maker's figure", () => {
    const high = one(clone(), "flow-rate");
    expect(num(high, "Design flow")).toBeCloseTo(SPECIFIC_FLOW.highDesign * 4.2, 0);
    const low = clone();
    low.collectors = { ...low.collectors, flowMode: "low_flow" };
    expect(num(one(low, "flow-rate"), "Design flow")).toBeCloseTo(SPECIFIC_FLOW.lowDesign * 4.2, 0);
    const maker = clone();
    maker.collectors = { ...maker.collectors, makerFlowLphM2: 25 };
    expect(num(one(maker, "flow-rate"), "Design flow")).toBeCloseTo(105, 0);
  });

  it("15 mm copper at ordinary domestic flows (low-flow or high-flow) is not flagged for velocity (common practice)", () => {
    for (const flowMode of ["low_flow", "high_flow"] as const) {
      const s = clone();
      s.collectors = { ...s.collectors, flowMode };
      s.pumpStation = { ...s.pumpStation, pumpMaxHeadM: 12 };
      const f = one(s, "hydraulics");
      expect(f.title).not.toMatch(/slow|fast/);
      expect(f.level).toBe("ok");
    }
  });

  it("the head counts collectors, coil and pump station as well as the pipes, and a cold start needs more than running", () => {
    const f = one(clone(), "hydraulics");
    const pipes = num(f, "Pipe runs and fittings, running");
    const parts = num(f, "Collectors (typical), coil (typical) and pump station (typical)");
    const running = num(f, "Head needed, running at 40 °C");
    expect(parts).toBeGreaterThan(0);
    // Head = Δp / (ρ g) with ρ ≈ 1030 kg/m³ for 40 % propylene glycol at 40 °C (Melinder).
    expect(running).toBeCloseTo(((pipes + parts) * 1000) / (1030 * 9.80665), 1);
    expect(num(f, "Head needed, cold start at 0 °C")).toBeGreaterThan(running);
  });

  it("a pump that cannot give the running head is a `fix`", () => {
    const s = clone();
    s.pumpStation = { ...s.pumpStation, pumpMaxHeadM: 1 };
    expect(one(s, "hydraulics").level).toBe("fix");
  });
});

describe("7. inputs that used to be ignored", () => {
  it("mixing valve: none is a `fix`, set above 48 °C is a `fix`, 48 °C or below is `ok`, setting unknown is a `note` (Approved Document G, from memory; local rules decide)", () => {
    const at = (mixingValve: boolean, mixingValveSetC?: number) => {
      const s = clone();
      s.safety = { ...s.safety, mixingValve, mixingValveSetC };
      return one(s, "scald");
    };
    expect(at(false).level).toBe("fix");
    expect(at(true, 55).level).toBe("fix");
    expect(at(true, 48).level).toBe("ok");
    expect(at(true).level).toBe("note");
    expect(at(false).action).toMatch(/local rules/);
  });

  it("cylinder volume against collector area: about 40 L/m² or more is `ok`, below 25 is a `fix` (common practice)", () => {
    const at = (volumeL: number) => {
      const s = clone();
      s.cylinder = { ...s.cylinder, volumeL };
      return one(s, "store-size").level;
    };
    expect(at(210)).toBe("ok"); // 50 L/m²
    expect(at(130)).toBe("note"); // 31 L/m²
    expect(at(90)).toBe("fix"); // 21 L/m²
  });

  it("a boiler coil below the solar coil is a `fix` (common practice)", () => {
    const s = clone();
    s.cylinder = {
      ...s.cylinder,
      coils: [
        { heatSource: "solar", position: "top", contentL: 4.5 },
        { heatSource: "boiler", position: "bottom", contentL: 3 },
      ],
    };
    expect(one(s, "coil-position").level).toBe("fix");
  });

  it("an unvented cylinder gets a note that its devices are its own and are licensed work; a vented one does not", () => {
    const f = one(clone(), "unvented");
    expect(f.level).toBe("note");
    expect(f.action).toMatch(/competent under local rules/);
    expect(f.action).toMatch(/high-temperature cut-out/);
    const v = clone();
    v.cylinder = { ...v.cylinder, type: "vented" };
    expect(all(v, "unvented")).toHaveLength(0);
  });

  it("uninsulated runs are a note, and a `fix` when they lose more than a quarter of the array's output (common practice)", () => {
    const s = clone();
    s.pipeRuns = [{ ...s.pipeRuns[0]!, insulated: false }, s.pipeRuns[1]!];
    expect(one(s, "pipe-insulation").level).toBe("note");
    s.pipeRuns = s.pipeRuns.map((r) => ({ ...r, insulated: false, lengthM: 30 }));
    expect(one(s, "pipe-insulation").level).toBe("fix");
  });
});

describe("every finding says what to change", () => {
  it("no finding that is not `ok` says only 'No action' (property over random systems)", () => {
    fc.assert(
      fc.property(arbitrarySystem, (sys) => {
        for (const f of runLoopCheck(sys).findings) {
          if (f.level !== "ok") expect(f.action).not.toMatch(/^No action\.?$/);
          expect(f.action.length).toBeGreaterThanOrEqual(10);
        }
      }),
      { numRuns: 150 },
    );
  });
});

describe("properties over the new inputs", () => {
  const rank = (l: Level) => LEVEL_RANK[l];

  it("more collector area never shortens the steam reach or shrinks the steam volume", () => {
    fc.assert(
      fc.property(arbitrarySystem, fc.integer({ min: 1, max: 10 }), (sys, extra) => {
        const bigger = structuredClone(sys);
        bigger.collectors = {
          ...bigger.collectors,
          count: Math.min(40, sys.collectors.count + extra),
        };
        if (sys.design?.steamReachM !== undefined) return true;
        const a = one(sys, "steam-reach");
        const b = one(bigger, "steam-reach");
        expect(num(b, "Steam reach")).toBeGreaterThanOrEqual(num(a, "Steam reach") - 1e-9);
        expect(num(b, "Steam volume (collectors and pipe)")).toBeGreaterThanOrEqual(
          num(a, "Steam volume (collectors and pipe)") - 1e-9,
        );
      }),
      { numRuns: 150 },
    );
  });

  it("a larger vessel never raises the stagnation pressure nor worsens the relief level", () => {
    fc.assert(
      fc.property(arbitrarySystem, fc.double({ min: 1, max: 100, noNaN: true }), (sys, extra) => {
        const bigger = withVessel(sys, Math.min(300, sys.expansionVessel.nominalVolumeL + extra));
        const a = one(sys, "relief-margin");
        const b = one(bigger, "relief-margin");
        expect(rank(b.level)).toBeLessThanOrEqual(rank(a.level));
        const pa = value(a, "Pressure at stagnation (chosen vessel)");
        const pb = value(b, "Pressure at stagnation (chosen vessel)");
        if (typeof pa === "number" && typeof pb === "number")
          expect(pb).toBeLessThanOrEqual(pa + 1e-9);
      }),
      { numRuns: 150 },
    );
  });

  it("a higher pre-charge never lowers the fill pressure", () => {
    fc.assert(
      fc.property(arbitrarySystem, fc.double({ min: 0, max: 2, noNaN: true }), (sys, extra) => {
        const higher = structuredClone(sys);
        higher.expansionVessel = {
          ...higher.expansionVessel,
          prechargeBar: Math.min(6, sys.expansionVessel.prechargeBar + extra),
        };
        const a = value(one(sys, "fill-pressure"), "Fill pressure at the pump station, cold");
        const b = value(one(higher, "fill-pressure"), "Fill pressure at the pump station, cold");
        if (typeof a === "number" && typeof b === "number")
          expect(b).toBeGreaterThanOrEqual(a - 1e-9);
      }),
      { numRuns: 150 },
    );
  });
});
