import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  glycolDensity,
  glycolFreezingPoint,
  glycolViscosity,
  clampGlycolState,
} from "@/lib/calc/glycol";

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
