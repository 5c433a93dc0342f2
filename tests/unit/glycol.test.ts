import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  glycolDensity,
  glycolFreezingPoint,
  glycolViscosity,
  clampGlycolState,
  iceFraction,
} from "@/lib/calc/glycol";
import { saturationTemperature } from "@/lib/calc/water-if97";

describe("propylene glycol freezing point", () => {
  // ASHRAE Handbook—Fundamentals, secondary coolants chapter, by mass %: values recalled from
  // memory, not read from the handbook. Tolerance ±1.5 K as computation.md sets it: the
  // handbook table and Melinder's fit differ by up to ~1.3 K at 50 %.
  it.each([
    [20, -7.1],
    [30, -12.7],
    [40, -21.1],
    [50, -33.5],
  ])("%s %% by mass freezes at about %s °C (ASHRAE, from memory; ±1.5 K)", (percent, expected) => {
    expect(Math.abs(glycolFreezingPoint(percent) - expected)).toBeLessThanOrEqual(1.5);
  });

  // Melinder (2010) tabulates −7.2 / −12.8 / −20.6 / −32.2 °C for the same mixes; our polynomial
  // evaluation must reproduce the book's own figures to its rounding (±0.1 K).
  it.each([
    [20, -7.2],
    [30, -12.8],
    [40, -20.6],
    [50, -32.2],
  ])("%s %% matches Melinder's table value %s °C (±0.1 K)", (percent, expected) => {
    expect(Math.abs(glycolFreezingPoint(percent) - expected)).toBeLessThanOrEqual(0.1);
  });

  it("is 0 °C for plain water", () => {
    expect(glycolFreezingPoint(0)).toBe(0);
  });

  it("never rises as glycol is added (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 60, noNaN: true }),
        fc.double({ min: 0, max: 60, noNaN: true }),
        (a, b) => {
          const [lo, hi] = a < b ? [a, b] : [b, a];
          return glycolFreezingPoint(hi) <= glycolFreezingPoint(lo) + 1e-12;
        },
      ),
    );
  });
});

describe("propylene glycol density, MacBeth & Thompson, Anal. Chem. 23:618 (1951)", () => {
  // Tolerance ±0.2 %: Melinder's fit against the measured densities.
  it.each([
    [40, 1022.95],
    [50, 1028.18],
  ])("%s %% at 35 °C is %s kg/m³ (±0.2 %%)", (percent, rho) => {
    expect(Math.abs(glycolDensity(percent, 35) - rho) / rho).toBeLessThan(0.002);
  });

  it("0 % at 20 °C comes back to water's 998.2 kg/m³ (CRC) within 0.1 %", () => {
    expect(Math.abs(glycolDensity(0, 20) - 998.21) / 998.21).toBeLessThan(0.001);
  });
});

describe("range of validity", () => {
  it("clamps above 100 °C and says so", () => {
    const s = clampGlycolState(40, 130);
    expect(s).toEqual({ percent: 40, tempC: 100, clamped: true });
    expect(glycolDensity(40, 130)).toBe(glycolDensity(40, 100));
  });

  it("clamps below the freezing point", () => {
    expect(clampGlycolState(20, -30).tempC).toBeCloseTo(glycolFreezingPoint(20), 10);
  });

  it("viscosity falls with temperature and rises with concentration", () => {
    expect(glycolViscosity(40, 20)).toBeGreaterThan(glycolViscosity(40, 60));
    expect(glycolViscosity(50, 20)).toBeGreaterThan(glycolViscosity(30, 20));
    // 0 % at 20 °C should be close to water, 1.002 mPa·s (CRC): within 2 % of the fit.
    expect(Math.abs(glycolViscosity(0, 20) - 1.002e-3) / 1.002e-3).toBeLessThan(0.02);
  });
});

describe("ethylene glycol (Melinder 2010, ethylene glycol chapter)", () => {
  // CRC Handbook of Chemistry and Physics, "Concentrative properties of aqueous solutions",
  // ethylene glycol: freezing-point depression 3.37 K at 10 % and 7.93 K at 20 % by mass
  // (recalled from memory). Melinder's fit matches them to about 0.1 K.
  it.each([
    [10, -3.37],
    [20, -7.93],
  ])("%s %% by mass freezes at %s °C (CRC Handbook, from memory; ±0.2 K)", (percent, expected) => {
    expect(Math.abs(glycolFreezingPoint(percent, "ethylene") - expected)).toBeLessThanOrEqual(0.2);
  });

  // ASHRAE Handbook—Fundamentals (2009) ch. 31 Table 4, by mass: 30 / 40 / 50 % →
  // −14.1 / −22.3 / −33.8 °C (recalled from memory; the NREL SecondaryCoolantProps library's fit
  // of that table gives −14.0 / −22.4 / −33.8). Melinder's data freeze colder at high
  // concentration (by about 0.5 / 1.5 / 2.2 K): tolerances 1 / 2 / 2.5 K.
  for (const [percent, expected, tol] of [
    [30, -14.1, 1],
    [40, -22.3, 2],
    [50, -33.8, 2.5],
  ] as const) {
    it(`${percent} % by mass freezes at about ${expected} °C (ASHRAE, from memory; ±${tol} K)`, () => {
      expect(Math.abs(glycolFreezingPoint(percent, "ethylene") - expected)).toBeLessThanOrEqual(
        tol,
      );
    });
  }

  it("30 % at 20 °C has a density of about 1038 kg/m³ (ASHRAE Fundamentals ethylene glycol table, from memory; ±0.3 %)", () => {
    expect(Math.abs(glycolDensity(30, 20, "ethylene") - 1038) / 1038).toBeLessThan(0.003);
  });

  it("0 % comes back to water: 998.2 kg/m³ and 1.002 mPa·s at 20 °C (CRC), within 0.2 % and 2 %", () => {
    expect(Math.abs(glycolDensity(0, 20, "ethylene") - 998.21) / 998.21).toBeLessThan(0.002);
    expect(Math.abs(glycolViscosity(0, 20, "ethylene") - 1.002e-3) / 1.002e-3).toBeLessThan(0.02);
  });

  it("is thinner than propylene glycol at the same strength (Melinder: ethylene glycol is the less viscous)", () => {
    for (const p of [20, 40, 50])
      expect(glycolViscosity(p, 20, "ethylene")).toBeLessThan(glycolViscosity(p, 20, "propylene"));
  });

  it("freezing point never rises as glycol is added (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 60, noNaN: true }),
        fc.double({ min: 0, max: 60, noNaN: true }),
        (a, b) => {
          const [lo, hi] = a < b ? [a, b] : [b, a];
          return glycolFreezingPoint(hi, "ethylene") <= glycolFreezingPoint(lo, "ethylene") + 1e-12;
        },
      ),
    );
  });
});

describe("ice fraction below the freezing point (lever rule on the freezing curve)", () => {
  it("is none above the freezing point and all ice for plain water below 0 °C", () => {
    expect(iceFraction(40, -10)).toBe(0);
    expect(iceFraction(0, -0.1)).toBe(1);
    expect(iceFraction(0, 1)).toBe(0);
  });

  it("conserves the glycol: the liquid left is the mix whose freezing point is the temperature", () => {
    for (const [x0, t] of [
      [20, -17],
      [30, -20],
      [10, -5],
    ] as const) {
      const ice = iceFraction(x0, t);
      const liquidPercent = x0 / (1 - ice);
      expect(glycolFreezingPoint(liquidPercent)).toBeCloseTo(t, 3);
    }
  });

  it("grows as it gets colder and shrinks as glycol is added (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 60, noNaN: true }),
        fc.double({ min: -45, max: 5, noNaN: true }),
        fc.double({ min: -45, max: 5, noNaN: true }),
        (x, a, b) => {
          const [cold, warm] = a < b ? [a, b] : [b, a];
          return iceFraction(x, cold) >= iceFraction(x, warm) - 1e-9;
        },
      ),
    );
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 60, noNaN: true }),
        fc.double({ min: 0, max: 60, noNaN: true }),
        fc.double({ min: -45, max: 5, noNaN: true }),
        (a, b, t) => {
          const [weak, strong] = a < b ? [a, b] : [b, a];
          return iceFraction(strong, t) <= iceFraction(weak, t) + 1e-9;
        },
      ),
    );
  });
});

describe("boiling point at the stagnation pressure (IAPWS-IF97 Region 4)", () => {
  it("is 164.95 °C at 0.7 MPa absolute (a 6 bar relief setting) and 120.21 °C at 0.2 MPa (IAPWS-IF97 saturation table, from memory; ±0.05 K)", () => {
    expect(saturationTemperature(0.7) - 273.15).toBeCloseTo(164.95, 1);
    expect(saturationTemperature(0.2) - 273.15).toBeCloseTo(120.21, 1);
  });
});
