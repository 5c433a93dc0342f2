/**
 * The first-fill comparison's rules, one by one, on a design written out here (not read from the
 * loop check): the tolerance edges (common practice, lib/calc/first-fill.ts), EN 12828's fill at
 * least p₀ + 0.3 bar (from memory), the relief margin (EN 12828, from memory: 0.9 × the setting
 * above 5 bar), the straight-line design curve, and the words each outcome shows the homeowner.
 */
import { describe, expect, it } from "vitest";
import {
  compareFirstFill,
  designPressureAt,
  type FirstFillComparison,
  type FirstFillDesign,
  type FirstFillReading,
} from "@/lib/calc/first-fill";
import { fluidModel } from "@/lib/calc/fluid";

const design: FirstFillDesign = {
  fillBar: 2.0,
  fillTempC: 20,
  prechargeSetBar: 1.5,
  prechargeRecommendedBar: 1.5,
  reliefBar: 6,
  pressureCurve: [
    { tempC: 20, pressureBar: 2.0 },
    { tempC: 60, pressureBar: 3.0 },
    { tempC: 100, pressureBar: 4.5 },
  ],
  glycolType: "propylene",
  glycolPercentMass: 40,
  freezeC: -21,
  coldNightC: -16,
  flowLph: 100,
};

const ok: FirstFillReading = { coldFillBar: 2.0, prechargeBar: 1.5 };

function item(reading: Partial<FirstFillReading>, d: Partial<FirstFillDesign> = {}, key: string) {
  const result = compareFirstFill({ ...ok, ...reading }, { ...design, ...d });
  const found = result.items.find((i) => i.key === key);
  if (!found) throw new Error(`no ${key} item`);
  return found;
}
const status = (
  reading: Partial<FirstFillReading>,
  key: string,
  d: Partial<FirstFillDesign> = {},
) => item(reading, d, key).status;

describe("designPressureAt: straight lines between the curve's points", () => {
  const curve = design.pressureCurve;
  it("gives the points themselves and the values halfway between them", () => {
    expect(designPressureAt(curve, 20)).toBe(2.0);
    expect(designPressureAt(curve, 40)).toBeCloseTo(2.5, 12);
    expect(designPressureAt(curve, 60)).toBeCloseTo(3.0, 12);
    expect(designPressureAt(curve, 80)).toBeCloseTo(3.75, 12);
    expect(designPressureAt(curve, 100)).toBeCloseTo(4.5, 12);
  });
  it("is null off the curve, on an empty or one-point curve, and where a point has no pressure", () => {
    expect(designPressureAt(curve, 19.9)).toBeNull();
    expect(designPressureAt(curve, 100.1)).toBeNull();
    expect(designPressureAt([], 50)).toBeNull();
    expect(designPressureAt([{ tempC: 20, pressureBar: 2 }], 20)).toBeNull();
    expect(
      designPressureAt(
        [
          { tempC: 20, pressureBar: 2 },
          { tempC: 60, pressureBar: null },
        ],
        40,
      ),
    ).toBeNull();
    expect(
      designPressureAt(
        [
          { tempC: 20, pressureBar: null },
          { tempC: 60, pressureBar: 3 },
        ],
        40,
      ),
    ).toBeNull();
  });
  it("takes the first pressure of two points at the same temperature", () => {
    expect(
      designPressureAt(
        [
          { tempC: 50, pressureBar: 2 },
          { tempC: 50, pressureBar: 3 },
        ],
        50,
      ),
    ).toBe(2);
  });
});

describe("the tolerance edges (common practice) count as matching", () => {
  it("cold fill ±0.2 bar", () => {
    expect(status({ coldFillBar: 1.8, prechargeBar: 1.0 }, "cold-fill")).toBe("matches");
    expect(status({ coldFillBar: 1.79, prechargeBar: 1.0 }, "cold-fill")).toBe("differs");
    expect(status({ coldFillBar: 2.2 }, "cold-fill")).toBe("matches");
    expect(status({ coldFillBar: 2.21 }, "cold-fill")).toBe("differs");
  });
  it("pre-charge −0.2 / +0.5 bar", () => {
    expect(status({ prechargeBar: 1.3 }, "precharge")).toBe("matches");
    expect(status({ prechargeBar: 1.29 }, "precharge")).toBe("differs");
    expect(status({ prechargeBar: 2.0, coldFillBar: 2.3 }, "precharge")).toBe("matches");
    expect(status({ prechargeBar: 2.01, coldFillBar: 2.4 }, "precharge")).toBe("differs");
  });
  it("fill at least 0.3 bar above the pre-charge (EN 12828, from memory)", () => {
    expect(status({ coldFillBar: 1.8, prechargeBar: 1.5 }, "fill-margin")).toBe("matches");
    expect(status({ coldFillBar: 1.79, prechargeBar: 1.5 }, "fill-margin")).toBe("differs");
    expect(item({ coldFillBar: 1.7, prechargeBar: 1.5 }, {}, "fill-margin").measured).toBe(
      "0.2 bar above",
    );
  });
  it("hot pressure ±0.3 bar on the curve", () => {
    expect(status({ hotBar: 2.8, hotTempC: 40 }, "hot-pressure")).toBe("matches");
    expect(status({ hotBar: 2.19, hotTempC: 40 }, "hot-pressure")).toBe("differs");
    expect(status({ hotBar: 2.2, hotTempC: 40 }, "hot-pressure")).toBe("matches");
    expect(status({ hotBar: 2.81, hotTempC: 40 }, "hot-pressure")).toBe("differs");
  });
  it("glycol ±3 points, freeze point ±2 K, flow ±20 %", () => {
    expect(status({ glycolPercentMass: 43 }, "glycol")).toBe("matches");
    expect(status({ glycolPercentMass: 43.1 }, "glycol")).toBe("differs");
    expect(status({ glycolPercentMass: 37 }, "glycol")).toBe("matches");
    expect(status({ glycolPercentMass: 36.9 }, "glycol")).toBe("differs");
    expect(status({ freezePointC: -19 }, "freeze-point")).toBe("matches");
    expect(status({ freezePointC: -18.9 }, "freeze-point")).toBe("differs");
    expect(status({ freezePointC: -23 }, "freeze-point")).toBe("matches");
    expect(status({ freezePointC: -23.1 }, "freeze-point")).toBe("differs");
    expect(status({ flowLph: 80 }, "flow")).toBe("matches");
    expect(status({ flowLph: 79 }, "flow")).toBe("differs");
    expect(status({ flowLph: 120 }, "flow")).toBe("matches");
    expect(status({ flowLph: 121 }, "flow")).toBe("differs");
  });
});

describe("the safety overrides", () => {
  it("a hot pressure at the relief margin (0.9 × 6 bar = 5.4 bar) differs even on the curve", () => {
    const curve = [
      { tempC: 20, pressureBar: 2 },
      { tempC: 120, pressureBar: 5.4 },
    ];
    expect(status({ hotBar: 5.39, hotTempC: 120 }, "hot-pressure", { pressureCurve: curve })).toBe(
      "matches",
    );
    const at = item({ hotBar: 5.4, hotTempC: 120 }, { pressureCurve: curve }, "hot-pressure");
    expect(at.status).toBe("differs");
    expect(at.meaning).toMatch(
      /^At or above the 5\.4 bar the loop should stay below \(the 6 bar relief setting/,
    );
    // No relief setting, no override.
    expect(
      status({ hotBar: 5.4, hotTempC: 120 }, "hot-pressure", {
        pressureCurve: curve,
        reliefBar: null,
      }),
    ).toBe("matches");
  });
  it("a mix inside the band that still freezes above the cold night differs", () => {
    const freeze = fluidModel("propylene", 40).freezeC;
    // The design's own mix, with a cold night just above, at and just below its freezing point.
    expect(status({ glycolPercentMass: 40 }, "glycol", { coldNightC: freeze + 0.1 })).toBe(
      "matches",
    );
    expect(status({ glycolPercentMass: 40 }, "glycol", { coldNightC: freeze })).toBe("matches");
    const thin = item({ glycolPercentMass: 40 }, { coldNightC: freeze - 0.1 }, "glycol");
    expect(thin.status).toBe("differs");
    expect(thin.meaning).toMatch(/^This mix starts to freeze above the /);
    expect(status({ glycolPercentMass: 40 }, "glycol", { coldNightC: null })).toBe("matches");
    // Plain water has no glycol freezing point to compare with the night.
    expect(
      item({ glycolPercentMass: 0 }, { glycolType: "none", glycolPercentMass: 0 }, "glycol")
        .measured,
    ).toBe("0 % by mass");
  });
  it("a freeze point inside the band but above the cold night differs", () => {
    expect(status({ freezePointC: -20 }, "freeze-point", { coldNightC: -20 })).toBe("matches");
    const slush = item({ freezePointC: -20 }, { coldNightC: -20.5 }, "freeze-point");
    expect(slush.status).toBe("differs");
    expect(slush.meaning).toMatch(/^Above the -20\.5 °C a clear night can bring/);
    expect(status({ freezePointC: -20 }, "freeze-point", { coldNightC: null })).toBe("matches");
  });
});

describe("the words each outcome shows", () => {
  const line = (i: FirstFillComparison) =>
    `${i.key} | ${i.label} | ${i.measured} | ${i.design} | ${i.tolerance} | ${i.status} | ${i.meaning} | ${i.source}`;
  const words = (reading: Partial<FirstFillReading>, d: Partial<FirstFillDesign> = {}) =>
    compareFirstFill({ ...ok, ...reading }, { ...design, ...d }).items.map(line);

  it("when everything matches", () => {
    const r = compareFirstFill(
      { ...ok, hotBar: 3, hotTempC: 60, glycolPercentMass: 40, freezePointC: -21, flowLph: 100 },
      { ...design, prechargeRecommendedBar: 1.8 },
    );
    expect(r.differs).toBe(0);
    expect(r.items.map(line)).toMatchInlineSnapshot(`
      [
        "cold-fill | Cold fill pressure | 2 bar | 2 bar at 20 °C | ±0.2 bar (common practice) | matches | Matches the design. | Design value from the loop check (VDI 6002-1 water seal; EN 12828)",
        "precharge | Vessel pre-charge (before filling) | 1.5 bar | 1.5 bar (recommended 1.8 bar) | −0.2 / +0.5 bar (common practice) | matches | Matches the design. | Recommended pre-charge: VDI 6002-1 (from memory), as in the loop check",
        "fill-margin | Fill pressure above the pre-charge | 0.5 bar above | at least 0.3 bar above | none | matches | The vessel holds fluid when cold (its water seal). | EN 12828, fill at least pre-charge + 0.3 bar (from memory)",
        "hot-pressure | Hot pressure at 60 °C | 3 bar | 3 bar | ±0.3 bar (common practice) | matches | Matches the design. | Design curve from the loop check (Boyle's law on the vessel's gas side)",
        "glycol | Glycol concentration | 40 % by mass (freezes at -20.6 °C) | 40 % by mass | ±3 points (common practice) | matches | Matches the design. | Freezing point: Melinder (2010), as in the loop check",
        "freeze-point | Freeze point | -21 °C | -21 °C | ±2 K (common practice) | matches | Matches the design. | Freezing point: Melinder (2010), as in the loop check",
        "flow | Flow rate | 100 L/h | 100 L/h | ±20 % (common practice) | matches | Matches the design. | Design flow from the loop check (Kalogirou 2009 low-flow band; high-flow common practice)",
      ]
    `);
  });

  it("when every reading is low", () => {
    const r = compareFirstFill(
      {
        coldFillBar: 1.2,
        prechargeBar: 1.1,
        hotBar: 2.0,
        hotTempC: 60,
        glycolPercentMass: 30,
        freezePointC: -24,
        flowLph: 50,
      },
      design,
    );
    expect(r.differs).toBe(r.items.length);
    expect(r.items.map(line)).toMatchInlineSnapshot(`
      [
        "cold-fill | Cold fill pressure | 1.2 bar | 2 bar at 20 °C | ±0.2 bar (common practice) | differs | Less fluid is held in the vessel: on a cold night the pressure at the collector top can fall far enough for air to be drawn in and the fluid to boil early. Usually topped up with the filling pump, cold. | Design value from the loop check (VDI 6002-1 water seal; EN 12828)",
        "precharge | Vessel pre-charge (before filling) | 1.1 bar | 1.5 bar | −0.2 / +0.5 bar (common practice) | differs | The vessel gives back its fluid too soon as the loop cools, so the collector top loses pressure on cold nights; a pre-charge that has dropped since delivery can also mean a leaking gas valve or diaphragm. Usually set with a tyre pump at the gas valve, vessel empty of fluid. | Recommended pre-charge: VDI 6002-1 (from memory), as in the loop check",
        "fill-margin | Fill pressure above the pre-charge | 0.1 bar above | at least 0.3 bar above | none | differs | Hardly any fluid is in the vessel when cold: as the loop cools the pressure drops quickly and air can get in. Usually the fill pressure is raised (or the pre-charge lowered, vessel empty) so the fill is at least 0.3 bar above the pre-charge. | EN 12828, fill at least pre-charge + 0.3 bar (from memory)",
        "hot-pressure | Hot pressure at 60 °C | 2 bar | 3 bar | ±0.3 bar (common practice) | differs | The pressure rises less than the design expects: usually air still in the loop (purge again at the air separator), a slow leak, or the loop filled below the design pressure. | Design curve from the loop check (Boyle's law on the vessel's gas side)",
        "glycol | Glycol concentration | 30 % by mass (freezes at -12.8 °C) | 40 % by mass | ±3 points (common practice) | differs | This mix starts to freeze above the -16 °C a clear night can bring at the collector: usually the loop was diluted by water left from the pressure test. Drain some and top up with concentrate until the reading is right. | Freezing point: Melinder (2010), as in the loop check",
        "freeze-point | Freeze point | -24 °C | -21 °C | ±2 K (common practice) | differs | The mix freezes lower than designed: it is stronger than planned, thicker, and carries heat less well. | Freezing point: Melinder (2010), as in the loop check",
        "flow | Flow rate | 50 L/h | 100 L/h | ±20 % (common practice) | differs | The collector runs hotter than designed and loses more heat; a flow well below the setting usually means air in the loop, a pump speed set too low or a partly closed valve. | Design flow from the loop check (Kalogirou 2009 low-flow band; high-flow common practice)",
      ]
    `);
  });

  it("when every reading is high", () => {
    expect(
      words(
        {
          coldFillBar: 2.6,
          prechargeBar: 2.1,
          hotBar: 3.5,
          hotTempC: 60,
          glycolPercentMass: 50,
          freezePointC: -18,
          flowLph: 150,
        },
        { coldNightC: -30 },
      ),
    ).toMatchInlineSnapshot(`
      [
        "cold-fill | Cold fill pressure | 2.6 bar | 2 bar at 20 °C | ±0.2 bar (common practice) | differs | Part of the vessel's room for expansion is used before the loop heats up: the hot and stagnation pressures rise and the relief valve may lift. Usually let down at the drain valve, cold. | Design value from the loop check (VDI 6002-1 water seal; EN 12828)",
        "precharge | Vessel pre-charge (before filling) | 2.1 bar | 1.5 bar | −0.2 / +0.5 bar (common practice) | differs | The vessel takes less of the expansion than planned, so the loop runs at higher pressure when hot. Usually let down at the gas valve, vessel empty of fluid. | Recommended pre-charge: VDI 6002-1 (from memory), as in the loop check",
        "fill-margin | Fill pressure above the pre-charge | 0.5 bar above | at least 0.3 bar above | none | matches | The vessel holds fluid when cold (its water seal). | EN 12828, fill at least pre-charge + 0.3 bar (from memory)",
        "hot-pressure | Hot pressure at 60 °C | 3.5 bar | 3 bar | ±0.3 bar (common practice) | differs | The pressure rises more than the design expects: usually the vessel is taking less than planned (pre-charge too high, a closed service valve, a failed diaphragm) or the loop was filled above the design pressure. | Design curve from the loop check (Boyle's law on the vessel's gas side)",
        "glycol | Glycol concentration | 50 % by mass (freezes at -32.2 °C) | 40 % by mass | ±3 points (common practice) | differs | Stronger than the design: thicker fluid that carries heat less well and works the pump harder; usually concentrate added without the premix water. | Freezing point: Melinder (2010), as in the loop check",
        "freeze-point | Freeze point | -18 °C | -21 °C | ±2 K (common practice) | differs | Above the -30 °C a clear night can bring at the collector: the fluid can turn to slush there. Usually the loop was diluted by water left from the pressure test; drain some and top up with concentrate. | Freezing point: Melinder (2010), as in the loop check",
        "flow | Flow rate | 150 L/h | 100 L/h | ±20 % (common practice) | differs | A small temperature difference across the collector, more pump power and noise; usually the pump speed is set higher than needed — turn it down until the meter shows the design flow. | Design flow from the loop check (Kalogirou 2009 low-flow band; high-flow common practice)",
      ]
    `);
  });

  it("when the design has nothing to compare with", () => {
    const empty: Partial<FirstFillDesign> = {
      fillBar: null,
      fillTempC: null,
      prechargeSetBar: null,
      prechargeRecommendedBar: null,
      reliefBar: null,
      pressureCurve: [],
      glycolType: null,
      glycolPercentMass: null,
      freezeC: null,
      coldNightC: null,
      flowLph: null,
    };
    expect(
      words(
        { hotBar: 3, hotTempC: 60, glycolPercentMass: 40, freezePointC: -21, flowLph: 100 },
        empty,
      ),
    ).toMatchInlineSnapshot(`
      [
        "cold-fill | Cold fill pressure | 2 bar | — | ±0.2 bar (common practice) | not_compared | The loop check has no fill pressure for this description yet. | common practice",
        "precharge | Vessel pre-charge (before filling) | 1.5 bar | — | −0.2 / +0.5 bar (common practice) | not_compared | The description has no vessel pre-charge yet. | common practice",
        "fill-margin | Fill pressure above the pre-charge | 0.5 bar above | at least 0.3 bar above | none | matches | The vessel holds fluid when cold (its water seal). | EN 12828, fill at least pre-charge + 0.3 bar (from memory)",
        "hot-pressure | Hot pressure at 60 °C | 3 bar | — | ±0.3 bar (common practice) | not_compared | The loop check has no pressure curve for this description yet. | common practice",
        "glycol | Glycol concentration | 40 % | — | ±3 points (common practice) | not_compared | The description has no fluid yet. | common practice",
        "freeze-point | Freeze point | -21 °C | — | ±2 K (common practice) | not_compared | The description has no fluid yet. | common practice",
        "flow | Flow rate | 100 L/h | — | ±20 % (common practice) | not_compared | The loop check has no design flow for this description yet. | common practice",
      ]
    `);
    expect(words({ hotBar: 3, hotTempC: 130 })).toMatchInlineSnapshot(`
      [
        "cold-fill | Cold fill pressure | 2 bar | 2 bar at 20 °C | ±0.2 bar (common practice) | matches | Matches the design. | Design value from the loop check (VDI 6002-1 water seal; EN 12828)",
        "precharge | Vessel pre-charge (before filling) | 1.5 bar | 1.5 bar | −0.2 / +0.5 bar (common practice) | matches | Matches the design. | Recommended pre-charge: VDI 6002-1 (from memory), as in the loop check",
        "fill-margin | Fill pressure above the pre-charge | 0.5 bar above | at least 0.3 bar above | none | matches | The vessel holds fluid when cold (its water seal). | EN 12828, fill at least pre-charge + 0.3 bar (from memory)",
        "hot-pressure | Hot pressure at 130 °C | 3 bar | — | ±0.3 bar (common practice) | not_compared | The design curve runs from 20 °C to 100 °C; read the hot pressure with the collector between those temperatures. | common practice",
      ]
    `);
    expect(words({}, { fillTempC: null }).slice(0, 1)).toMatchInlineSnapshot(`
      [
        "cold-fill | Cold fill pressure | 2 bar | 2 bar | ±0.2 bar (common practice) | matches | Matches the design. | Design value from the loop check (VDI 6002-1 water seal; EN 12828)",
      ]
    `);
  });
});
