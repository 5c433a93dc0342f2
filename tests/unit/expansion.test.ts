import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  fillPressureBar,
  fillPressureForSealBar,
  finalPressureBar,
  nextStandardVesselL,
  requiredVesselVolumeL,
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

describe("vessel sizing, EN 12828:2012 Annex D (V_n ≥ (V_e + V_v + V_d)(p_e + 1)/(p_e − p_0)), worked by hand", () => {
  it("2 L expansion, 3 L seal, 5 L steam, p_0 = 1.5 bar, p_e = 5.4 bar: 10 × 6.4 / 3.9 = 16.41 L", () => {
    const v = requiredVesselVolumeL({
      expansionL: 2,
      waterSealL: 3,
      steamVolumeL: 5,
      prechargeBar: 1.5,
      finalPressureBar: 5.4,
    });
    expect(v).toBeCloseTo(16.4103, 4);
  });

  it("each volume counts once: 1 + 0 + 0 L at p_0 = 1 bar, p_e = 3 bar is 1 × 4 / 2 = 2 L", () => {
    const base = {
      expansionL: 0,
      waterSealL: 0,
      steamVolumeL: 0,
      prechargeBar: 1,
      finalPressureBar: 3,
    };
    expect(requiredVesselVolumeL({ ...base, expansionL: 1 })).toBeCloseTo(2, 10);
    expect(requiredVesselVolumeL({ ...base, waterSealL: 1 })).toBeCloseTo(2, 10);
    expect(requiredVesselVolumeL({ ...base, steamVolumeL: 1 })).toBeCloseTo(2, 10);
  });

  it("no vessel works when the final pressure is at or below the pre-charge", () => {
    const i = { expansionL: 1, waterSealL: 3, steamVolumeL: 0, prechargeBar: 2 };
    expect(requiredVesselVolumeL({ ...i, finalPressureBar: 2 })).toBe(Number.POSITIVE_INFINITY);
    expect(requiredVesselVolumeL({ ...i, finalPressureBar: 1.9 })).toBe(Number.POSITIVE_INFINITY);
    expect(requiredVesselVolumeL({ ...i, finalPressureBar: 2.1 })).toBeCloseTo((4 * 3.1) / 0.1, 6);
  });

  it("final pressure: p_SV − 0.5 bar up to a 5 bar relief setting, 0.9 × p_SV above (EN 12828, from memory)", () => {
    expect(finalPressureBar(3)).toBeCloseTo(2.5, 10);
    expect(finalPressureBar(5)).toBeCloseTo(4.5, 10);
    expect(finalPressureBar(6)).toBeCloseTo(5.4, 10);
    expect(finalPressureBar(10)).toBeCloseTo(9, 10);
  });

  it("final pressure always stays below the relief setting, so the valve never lifts in normal work (physics, not memory)", () => {
    fc.assert(
      fc.property(fc.double({ min: 1, max: 10, noNaN: true }), (psv) => {
        const pe = finalPressureBar(psv);
        return pe < psv && pe >= psv - 1;
      }),
    );
  });

  it("water seal: 0.5 % of the loop, at least 3 L (VDI 6002-1, from memory)", () => {
    expect(waterSealL(100)).toBe(3);
    expect(waterSealL(600)).toBeCloseTo(3, 10);
    expect(waterSealL(1000)).toBeCloseTo(5, 10);
  });

  it("pre-charge: 0.1 bar per metre of static height + 0.4 bar, at least 1.2 bar (VDI 6002-1, from memory)", () => {
    expect(recommendedPrechargeBar(2)).toBe(1.2);
    expect(recommendedPrechargeBar(8)).toBeCloseTo(1.2, 10);
    expect(recommendedPrechargeBar(12)).toBeCloseTo(1.6, 10);
  });

  it("picks the next standard size at or above the requirement, none above 80 L (common practice)", () => {
    expect(nextStandardVesselL(12)).toBe(12);
    expect(nextStandardVesselL(12.01)).toBe(18);
    expect(nextStandardVesselL(0)).toBe(8);
    expect(nextStandardVesselL(80)).toBe(80);
    expect(nextStandardVesselL(80.1)).toBeNull();
  });
});

describe("the loop pressure as fluid enters the vessel (Boyle's law on the gas side), by hand", () => {
  it("12 L at 1.2 bar pre-charge filled at 2.2 bar: gas 12 × 2.2 / 3.2 = 8.25 L; 2.25 L in → 26.4 / 6 − 1 = 3.4 bar", () => {
    expect(vesselPressureBar(12, 1.2, 2.2, 0)).toBeCloseTo(2.2, 10);
    expect(vesselPressureBar(12, 1.2, 2.2, 2.25)).toBeCloseTo(3.4, 10);
  });

  it("filled below the pre-charge the vessel holds no fluid: 1 L into 12 L at 1.2 bar → 26.4 / 11 − 1 = 1.4 bar", () => {
    expect(vesselPressureBar(12, 1.2, 0.5, 1)).toBeCloseTo(1.4, 10);
  });

  it("the gas side used up is Infinity (the relief valve opens first)", () => {
    expect(vesselPressureBar(12, 1.2, 2.2, 8.25)).toBe(Number.POSITIVE_INFINITY);
    expect(vesselPressureBar(12, 1.2, 2.2, 9)).toBe(Number.POSITIVE_INFINITY);
  });

  it("a vessel that gives back exactly all it holds is empty, at the pre-charge", () => {
    // Filled at 2.2 bar, the 12 L vessel holds 12 − 8.25 = 3.75 L of fluid.
    expect(vesselState(12, 1.2, 2.2, -3.75)).toEqual({ pressureBar: 1.2, empty: true });
    const nearly = vesselState(12, 1.2, 2.2, -3.7);
    expect(nearly.empty).toBe(false);
    expect(nearly.pressureBar).toBeCloseTo(26.4 / 11.95 - 1, 10);
  });
});
