/**
 * Thermal expansion of the loop's fluid (computation.md §4), against handbook densities.
 */
import { describe, expect, it } from "vitest";
import { thermalExpansion } from "@/lib/calc/expansion";

describe("thermal expansion from fill to the highest liquid temperature", () => {
  it("plain water 10 → 90 °C expands about 3.56 % (CRC Handbook densities)", () => {
    // CRC Handbook: ρ(10 °C) = 999.70, ρ(90 °C) = 965.31 kg/m³ → 999.70 / 965.31 − 1 = 3.563 %.
    const r = thermalExpansion(100, 0, 10, 90);
    expect(r.coefficient).toBeCloseTo(0.03563, 3);
    expect(r.expansionL).toBeCloseTo(3.563, 1);
    expect(r.basis).toBe("water, IAPWS-IF97 Region 1");
    // A negative percentage is plain water too.
    expect(thermalExpansion(100, -5, 10, 90).basis).toBe("water, IAPWS-IF97 Region 1");
  });

  it("plain water filled below 0 °C is taken from 0 °C (IF97 Region 1 starts there)", () => {
    // CRC Handbook: ρ(0 °C) = 999.84 kg/m³ → 999.84 / 965.31 − 1 = 3.577 %.
    expect(thermalExpansion(10, 0, -5, 90).coefficient).toBeCloseTo(0.03577, 3);
  });

  it("a glycol mix uses Melinder's densities up to 100 °C and says so", () => {
    const r = thermalExpansion(20, 40, 15, 90);
    expect(r.basis).toBe("propylene glycol 40 %, Melinder (2010)");
    expect(r.expansionL).toBeCloseTo(20 * r.coefficient, 12);
    // A glycol mix expands more than water over the same range (ASHRAE Fundamentals,
    // secondary coolants: propylene glycol density falls faster with temperature; from memory).
    expect(r.coefficient).toBeGreaterThan(thermalExpansion(20, 0, 15, 90).coefficient);
    expect(r.coefficient).toBeLessThan(0.06);
    expect(thermalExpansion(20, 30, 15, 90, 0.4, "ethylene").basis).toBe(
      "ethylene glycol 30 %, Melinder (2010)",
    );
  });

  it("above 100 °C a glycol mix chains on water's expansion, and says from where to where", () => {
    const to100 = thermalExpansion(20, 40, 15, 100);
    const to120 = thermalExpansion(20, 40, 15, 120);
    expect(to100.basis).toBe("propylene glycol 40 %, Melinder (2010)");
    expect(to120.basis).toBe(
      "propylene glycol 40 %, Melinder (2010), to 100 °C; water's expansion (IAPWS-IF97) from 100 to 120 °C",
    );
    // Saturated-liquid water (steam tables, Çengel & Boles Table A-4): ρ(100 °C) = 958.35,
    // ρ(120 °C) = 943.11 kg/m³ → factor 1.01616; the pressure (0.4 MPa) changes this by < 0.01 %.
    const factor = (1 + to120.coefficient) / (1 + to100.coefficient);
    expect(factor).toBeCloseTo(1.01616, 3);
  });
});
