import { describe, expect, it } from "vitest";
import {
  saturationPressure,
  saturationTemperature,
  specificVolumeRegion1,
  waterCp,
  waterDensity,
  waterViscosity,
} from "@/lib/calc/water-if97";
import { thermalExpansion } from "@/lib/calc/expansion";

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe("IAPWS-IF97 Region 1, verification values of IAPWS R7-97(2012) Table 5", () => {
  // The release gives nine significant digits; a correct implementation matches to ~1e-9.
  it.each([
    [300, 3, 0.100215168e-2],
    [300, 80, 0.971180894e-3],
    [500, 3, 0.1202418e-2],
  ])("v(%s K, %s MPa) = %s m³/kg", (t, p, v) => {
    expect(rel(specificVolumeRegion1(t, p), v)).toBeLessThan(1e-8);
  });

  it("cp(300 K, 3 MPa) = 4.17301218 kJ/(kg·K) (Table 5)", () => {
    expect(rel(waterCp(300, 3), 4173.01218)).toBeLessThan(1e-8);
  });
});

describe("IAPWS-IF97 saturation line, Table 35", () => {
  it.each([
    [300, 0.353658941e-2],
    [500, 0.263889776e1],
    [600, 0.123443146e2],
  ])("p_sat(%s K) = %s MPa", (t, p) => {
    expect(rel(saturationPressure(t), p)).toBeLessThan(1e-8);
  });

  it("T_sat(0.1 MPa) = 372.755919 K (Table 36; value recalled from memory)", () => {
    expect(saturationTemperature(0.1)).toBeCloseTo(372.755919, 5);
  });

  it("T_sat is the inverse of p_sat, so the Table 35 values above also check it (not memory alone)", () => {
    for (const [t, p] of [
      [300, 0.353658941e-2],
      [500, 0.263889776e1],
      [600, 0.123443146e2],
    ] as const)
      expect(saturationTemperature(p)).toBeCloseTo(t, 5);
  });
});

describe("derived water properties", () => {
  it("ρ(20 °C, 1 atm) = 998.21 kg/m³ (CRC Handbook), within 0.01 %", () => {
    expect(rel(waterDensity(293.15, 0.101325), 998.21)).toBeLessThan(1e-4);
  });

  it("μ(20 °C) = 1.002 mPa·s (CRC Handbook), within 1 % (the Vogel fit is good to ~2.5 % over 0–370 °C)", () => {
    expect(rel(waterViscosity(293.15), 1.002e-3)).toBeLessThan(0.01);
  });

  it("expansion 10 → 90 °C ≈ 3.56 % and 10 → 130 °C at 3 bar abs ≈ 6.95 % (computation.md, derived from IF97)", () => {
    expect(thermalExpansion(100, 0, 10, 90, 0.3).coefficient * 100).toBeCloseTo(3.56, 1);
    expect(thermalExpansion(100, 0, 10, 130, 0.3).coefficient * 100).toBeCloseTo(6.95, 1);
  });
});
