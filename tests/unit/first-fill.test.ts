import { describe, expect, it } from "vitest";
import { demoSystem } from "@/lib/calc/demo-system";
import {
  compareFirstFill,
  designPressureAt,
  firstFillDesign,
  FIRST_FILL_TOLERANCE,
  type FirstFillDesign,
} from "@/lib/calc/first-fill";
import { systemSchema } from "@/lib/validation/system";
import { firstFillSchema } from "@/lib/validation/first-fill";

const system = systemSchema.parse(structuredClone(demoSystem));

describe("the first fill's design values, read from the loop check of the example system", () => {
  const d = firstFillDesign(system);

  it("takes the cold fill pressure that puts the water seal in the vessel", () => {
    // Worked by hand: the loop holds about 12.5 L (26 m of 15 × 0.7 copper at 0.1453 L/m by
    // EN 1057, 2 × 1.6 L collectors, a 4.5 L coil, 1 L station), so the seal is the 3 L minimum
    // (0.5 % of the volume, at least 3 L: VDI 6002-1, from memory). Boyle's law on the 12 L vessel
    // pre-charged to 1.2 bar: p_a = 2.2 × 12 / (12 − 3) − 1 = 1.933 bar, above EN 12828's
    // p₀ + 0.3 = 1.5 bar (from memory).
    expect(d.fillBar).toBeCloseTo(1.933, 2);
    expect(d.fillTempC).toBe(15);
  });

  it("takes the pre-charge set and the recommended one", () => {
    // 8 m static height × 0.1 bar/m + 0.4 bar = 1.2 bar, at least 1.2 (VDI 6002-1, from memory).
    expect(d.prechargeRecommendedBar).toBeCloseTo(1.2, 6);
    expect(d.prechargeSetBar).toBe(1.2);
    expect(d.reliefBar).toBe(6);
  });

  it("takes the design flow and the mix", () => {
    // High-flow 40 L/(m²·h) (middle of 30–50, common practice) × 2 × 2.1 m² = 168 L/h.
    expect(d.flowLph).toBe(168);
    expect(d.glycolType).toBe("propylene");
    expect(d.glycolPercentMass).toBe(40);
    // 40 % propylene glycol by mass: −21.1 °C (ASHRAE Fundamentals, from memory), −20.6 °C
    // (Melinder 2010); tolerance ±1.5 K.
    expect(d.freezeC!).toBeGreaterThan(-21.1 - 1.5);
    expect(d.freezeC!).toBeLessThan(-21.1 + 1.5);
    // A clear night at the collector: the −12 °C design minimum less 5 K (common practice).
    expect(d.coldNightC).toBe(-17);
  });

  it("draws the pressure curve from the fill temperature up, rising with temperature", () => {
    expect(d.pressureCurve[0]).toEqual({ tempC: 15, pressureBar: d.fillBar });
    const at60 = designPressureAt(d.pressureCurve, 60)!;
    expect(at60).toBeGreaterThan(d.fillBar!);
    expect(designPressureAt(d.pressureCurve, 5)).toBeNull();
    expect(designPressureAt(d.pressureCurve, 150)).toBeNull();
  });
});

/** A design with round numbers, so each comparison below can be worked by hand. */
const design: FirstFillDesign = {
  fillBar: 1.9,
  fillTempC: 15,
  prechargeSetBar: 1.2,
  prechargeRecommendedBar: 1.2,
  reliefBar: 6,
  pressureCurve: [
    { tempC: 15, pressureBar: 1.9 },
    { tempC: 65, pressureBar: 2.1 },
    { tempC: 120, pressureBar: 2.4 },
  ],
  glycolType: "propylene",
  glycolPercentMass: 40,
  freezeC: -20.6,
  coldNightC: -17,
  flowLph: 168,
};

const statusOf = (r: ReturnType<typeof compareFirstFill>, key: string) =>
  r.items.find((i) => i.key === key)?.status;

describe("compareFirstFill", () => {
  it("says everything matches when every reading is inside its tolerance", () => {
    const r = compareFirstFill(
      {
        coldFillBar: 2.0, // design 1.9 ± 0.2 bar (common practice)
        prechargeBar: 1.1, // design 1.2, −0.2/+0.5 bar (common practice)
        hotBar: 2.2, // curve at 65 °C is 2.1 ± 0.3 bar (common practice)
        hotTempC: 65,
        glycolPercentMass: 38, // 40 ± 3 points (common practice)
        freezePointC: -19.5, // −20.6 ± 2 K (common practice)
        flowLph: 190, // 168 ± 20 % = 134.4–201.6 L/h (common practice)
      },
      design,
    );
    expect(r.items.map((i) => [i.key, i.status])).toEqual([
      ["cold-fill", "matches"],
      ["precharge", "matches"],
      ["fill-margin", "matches"],
      ["hot-pressure", "matches"],
      ["glycol", "matches"],
      ["freeze-point", "matches"],
      ["flow", "matches"],
    ]);
    expect(r.differs).toBe(0);
  });

  it("flags a low fill, a pre-charge too close to it (EN 12828: at least p₀ + 0.3 bar) and says what that means", () => {
    // 1.5 bar cold is 0.4 bar under the design 1.9 (outside ±0.2); with 1.3 bar measured pre-charge
    // the fill is only 0.2 bar above it, under EN 12828's 0.3 bar (from memory).
    const r = compareFirstFill({ coldFillBar: 1.5, prechargeBar: 1.3 }, design);
    expect(statusOf(r, "cold-fill")).toBe("differs");
    expect(r.items[0]!.meaning).toMatch(/air to be drawn in/);
    expect(statusOf(r, "precharge")).toBe("matches");
    expect(statusOf(r, "fill-margin")).toBe("differs");
    expect(r.differs).toBe(2);
  });

  it("flags a pre-charge that has fallen and one pumped too high, at the loop check's band", () => {
    // Design 1.2 bar: 0.95 is 0.25 low (outside −0.2); 1.75 is 0.55 high (outside +0.5); 1.65 is inside.
    expect(
      statusOf(compareFirstFill({ coldFillBar: 1.9, prechargeBar: 0.95 }, design), "precharge"),
    ).toBe("differs");
    expect(
      statusOf(compareFirstFill({ coldFillBar: 2.1, prechargeBar: 1.75 }, design), "precharge"),
    ).toBe("differs");
    expect(
      statusOf(compareFirstFill({ coldFillBar: 2.0, prechargeBar: 1.65 }, design), "precharge"),
    ).toBe("matches");
    expect(FIRST_FILL_TOLERANCE.prechargeLowBar).toBe(0.2);
  });

  it("compares the hot pressure with the curve at the stated temperature, and warns near the relief setting", () => {
    // At 40 °C the curve gives 1.9 + (40 − 15)/(65 − 15) × 0.2 = 2.0 bar (worked by hand).
    expect(designPressureAt(design.pressureCurve, 40)).toBeCloseTo(2.0, 9);
    const high = compareFirstFill(
      { coldFillBar: 1.9, prechargeBar: 1.2, hotBar: 2.5, hotTempC: 40 },
      design,
    );
    const hot = high.items.find((i) => i.key === "hot-pressure")!;
    expect(hot.status).toBe("differs");
    expect(hot.design).toBe("2 bar");
    expect(hot.meaning).toMatch(/vessel is taking less/);
    const low = compareFirstFill(
      { coldFillBar: 1.9, prechargeBar: 1.2, hotBar: 1.6, hotTempC: 40 },
      design,
    );
    expect(low.items.find((i) => i.key === "hot-pressure")!.meaning).toMatch(
      /air still in the loop/,
    );
    // Final design pressure for a 6 bar relief valve: 0.9 × 6 = 5.4 bar (EN 12828, from memory).
    const relief = compareFirstFill(
      { coldFillBar: 1.9, prechargeBar: 1.2, hotBar: 5.5, hotTempC: 110 },
      design,
    );
    expect(relief.items.find((i) => i.key === "hot-pressure")!.meaning).toMatch(/5\.4 bar/);
    // Off the curve: nothing is compared, and the page says where the curve runs.
    const off = compareFirstFill(
      { coldFillBar: 1.9, prechargeBar: 1.2, hotBar: 2, hotTempC: 10 },
      design,
    );
    expect(off.items.find((i) => i.key === "hot-pressure")!.status).toBe("not_compared");
  });

  it("flags a mix diluted below the frost protection the site needs", () => {
    // 30 % propylene glycol freezes at about −12.7 °C (ASHRAE Fundamentals, from memory; Melinder
    // −12.8), above the −17 °C clear night at the collector: a difference whatever the tolerance.
    const r = compareFirstFill(
      { coldFillBar: 1.9, prechargeBar: 1.2, glycolPercentMass: 30 },
      design,
    );
    const g = r.items.find((i) => i.key === "glycol")!;
    expect(g.status).toBe("differs");
    expect(g.measured).toMatch(/freezes at -1[23]\.\d °C/);
    expect(g.meaning).toMatch(/diluted/);
    // A refractometer's freeze point of −14 °C is above −17 °C: differs too.
    const f = compareFirstFill({ coldFillBar: 1.9, prechargeBar: 1.2, freezePointC: -14 }, design);
    expect(f.items.find((i) => i.key === "freeze-point")!.status).toBe("differs");
    // −25 °C is colder than the design's −20.6 by more than 2 K: stronger than planned.
    const strong = compareFirstFill(
      { coldFillBar: 1.9, prechargeBar: 1.2, freezePointC: -25 },
      design,
    );
    expect(strong.items.find((i) => i.key === "freeze-point")!.meaning).toMatch(/stronger/);
  });

  it("flags a flow outside ±20 % of the design (common practice)", () => {
    // 168 L/h × 0.8 = 134.4; 120 L/h is below, 210 L/h above 201.6.
    const low = compareFirstFill({ coldFillBar: 1.9, prechargeBar: 1.2, flowLph: 120 }, design);
    expect(low.items.find((i) => i.key === "flow")!.meaning).toMatch(/air in the loop/);
    const high = compareFirstFill({ coldFillBar: 1.9, prechargeBar: 1.2, flowLph: 210 }, design);
    expect(high.items.find((i) => i.key === "flow")!.status).toBe("differs");
  });

  it("leaves out what was not measured and compares nothing against a missing design", () => {
    const r = compareFirstFill({ coldFillBar: 1.9, prechargeBar: 1.2 }, design);
    expect(r.items.map((i) => i.key)).toEqual(["cold-fill", "precharge", "fill-margin"]);
    const blank = compareFirstFill(
      { coldFillBar: 1.9, prechargeBar: 1.2, flowLph: 100 },
      firstFillDesign({}),
    );
    expect(blank.items.find((i) => i.key === "cold-fill")!.status).toBe("not_compared");
    expect(blank.items.find((i) => i.key === "flow")!.status).toBe("not_compared");
  });
});

describe("the first-fill form's bounds", () => {
  const ok = { coldFillBar: "1.9", prechargeBar: "1.2", glycolPercentMass: "40" };
  it("takes a plausible reading and refuses a 40 bar fill and a 120 % glycol reading", () => {
    expect(firstFillSchema.safeParse(ok).success).toBe(true);
    const bad = firstFillSchema.safeParse({ ...ok, coldFillBar: "40", glycolPercentMass: "120" });
    expect(bad.success).toBe(false);
    const paths = bad.error!.issues.map((i) => i.path.join("."));
    expect(paths).toContain("coldFillBar");
    expect(paths).toContain("glycolPercentMass");
  });
  it("asks for the concentration or the freeze point, and a temperature with a hot pressure", () => {
    const none = firstFillSchema.safeParse({ coldFillBar: "1.9", prechargeBar: "1.2" });
    expect(none.error!.issues[0]!.path).toEqual(["glycolPercentMass"]);
    const hot = firstFillSchema.safeParse({ ...ok, hotBar: "2.3" });
    expect(hot.error!.issues[0]!.path).toEqual(["hotTempC"]);
    expect(firstFillSchema.safeParse({ ...ok, freezePointC: "5" }).success).toBe(false);
  });
});
