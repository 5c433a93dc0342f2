import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  fillPressureBar,
  fillPressureForSealBar,
  recommendedPrechargeBar,
  vesselPressureBar,
  vesselState,
  waterSealL,
} from "@/lib/calc/expansion";

describe("the one fill pressure (VDI 6002-1: the water seal is in the vessel at filling)", () => {
  it("obeys Boyle's law on the gas side: (p₀ + 1) V_n = (p_a + 1)(V_n − V_v)", () => {
    // 12 L vessel pre-charged to 1.2 bar with a 3 L seal: 2.2 × 12 / 9 − 1 = 1.933 bar.
    const pa = fillPressureForSealBar(12, 1.2, 3);
    expect((1.2 + 1) * 12).toBeCloseTo((pa + 1) * (12 - 3), 10);
    expect(pa).toBeCloseTo(1.9333, 4);
  });

  it("is never below EN 12828's pre-charge + 0.3 bar (from memory), even in a very large vessel", () => {
    expect(fillPressureForSealBar(300, 1.2, 3)).toBeCloseTo(fillPressureBar(1.2), 10);
    expect(fillPressureBar(1.2)).toBeCloseTo(1.5, 10);
  });

  it("cannot be met when the vessel is no bigger than the seal", () => {
    expect(fillPressureForSealBar(3, 1.2, 3)).toBe(Number.POSITIVE_INFINITY);
  });

  it("for a two-storey house (6–10 m) with a 12–25 L vessel lands between 1.5 and 2.5 bar (common practice)", () => {
    for (const h of [6, 8, 10])
      for (const v of [12, 18, 25]) {
        const pa = fillPressureForSealBar(v, recommendedPrechargeBar(h), waterSealL(15));
        expect(pa).toBeGreaterThanOrEqual(1.5);
        expect(pa).toBeLessThanOrEqual(2.5);
      }
  });

  it("rises with the pre-charge and falls with the vessel size (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.3, max: 6, noNaN: true }),
        fc.double({ min: 0.3, max: 6, noNaN: true }),
        fc.double({ min: 4, max: 300, noNaN: true }),
        (a, b, v) => {
          const [lo, hi] = a < b ? [a, b] : [b, a];
          return fillPressureForSealBar(v, hi, 3) >= fillPressureForSealBar(v, lo, 3) - 1e-12;
        },
      ),
    );
    fc.assert(
      fc.property(
        fc.double({ min: 4, max: 300, noNaN: true }),
        fc.double({ min: 4, max: 300, noNaN: true }),
        (a, b) => {
          const [small, big] = a < b ? [a, b] : [b, a];
          return (
            fillPressureForSealBar(big, 1.5, 3) <= fillPressureForSealBar(small, 1.5, 3) + 1e-12
          );
        },
      ),
    );
  });
});

describe("the vessel as the loop cools and warms", () => {
  it("gives back fluid on a cold night and stays at or above the pre-charge while it holds any", () => {
    const pa = fillPressureForSealBar(12, 1.2, 3);
    const night = vesselState(12, 1.2, pa, -0.2);
    expect(night.empty).toBe(false);
    expect(night.pressureBar).toBeLessThan(pa);
    expect(night.pressureBar).toBeGreaterThan(1.2);
    // A contraction larger than the seal empties it: the loop falls to the pre-charge and below.
    expect(vesselState(12, 1.2, pa, -3.5)).toEqual({ pressureBar: 1.2, empty: true });
  });

  it("the pressure never falls as more fluid enters (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 20, noNaN: true }),
        fc.double({ min: 0, max: 20, noNaN: true }),
        (a, b) => {
          const [lo, hi] = a < b ? [a, b] : [b, a];
          return vesselPressureBar(25, 1.5, 2, hi) >= vesselPressureBar(25, 1.5, 2, lo);
        },
      ),
    );
  });
});
