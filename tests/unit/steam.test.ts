import { describe, expect, it } from "vitest";
import fc from "fast-check";
import {
  PIPE_LOSS,
  pipeContentWithinL,
  pipeHeatLossWPerM,
  STEAM_POWER_W_PER_M2,
  steamReach,
} from "@/lib/calc/steam";

describe("heat loss of a steam-filled pipe", () => {
  it("a bare pipe loses h·π·d·ΔT per metre (Newton's law of cooling on the outer surface)", () => {
    // 15 mm copper, 100 K above its surroundings, h = 10 W/(m²·K): 10 × π × 0.015 × 100 = 47.12 W/m.
    expect(pipeHeatLossWPerM(15, 0, 130, 30)).toBeCloseTo(47.12, 2);
  });

  it("with insulation thinner than the critical radius k/h the loss rises, beyond it the loss falls (Incropera & DeWitt §3.3, critical insulation radius)", () => {
    const k = PIPE_LOSS.insulationConductivityWmK;
    const h = PIPE_LOSS.surfaceCoefficientInsulated;
    const rCritMm = (k / h) * 1000; // 5 mm
    // A 4 mm wire-size tube (r = 2 mm) is below the critical radius: a little insulation adds loss.
    const bareLike = pipeHeatLossWPerM(4, 0.5, 130, 30);
    const atCritical = pipeHeatLossWPerM(4, rCritMm - 2, 130, 30);
    const thick = pipeHeatLossWPerM(4, 40, 130, 30);
    expect(atCritical).toBeGreaterThan(bareLike);
    expect(atCritical).toBeGreaterThan(thick);
    // On a 15 mm tube (r = 7.5 mm > r_crit) every millimetre of insulation lowers the loss.
    fc.assert(
      fc.property(
        fc.double({ min: 5, max: 60, noNaN: true }),
        fc.double({ min: 5, max: 60, noNaN: true }),
        (a, b) => {
          const [thin, thicker] = a < b ? [a, b] : [b, a];
          return pipeHeatLossWPerM(15, thicker, 150) <= pipeHeatLossWPerM(15, thin, 150) + 1e-9;
        },
      ),
    );
  });

  it("an insulated 15–22 mm copper pipe full of steam (about 150 °C) loses roughly 15–30 W/m (common practice range; VDI 6002-1's tabulated losses are of this order, from memory)", () => {
    for (const od of [15, 18, 22]) {
      const q = pipeHeatLossWPerM(od, PIPE_LOSS.defaultInsulationMm, 150);
      expect(q).toBeGreaterThan(15);
      expect(q).toBeLessThan(30);
    }
    // Bare copper loses two to three times as much (common practice).
    expect(pipeHeatLossWPerM(15, 0, 150) / pipeHeatLossWPerM(15, 20, 150)).toBeGreaterThan(2);
  });
});

describe("steam-producing power (VDI 6002-1, values from memory)", () => {
  it("is about 60 W/m² for flat plates that empty well, 120 for those that do not, 200 for evacuated tubes; unknown counts as poor", () => {
    expect(STEAM_POWER_W_PER_M2.flat_plate.good).toBe(60);
    expect(STEAM_POWER_W_PER_M2.flat_plate.poor).toBe(120);
    expect(STEAM_POWER_W_PER_M2.flat_plate.unknown).toBe(STEAM_POWER_W_PER_M2.flat_plate.poor);
    expect(STEAM_POWER_W_PER_M2.evacuated_tube.good).toBeGreaterThanOrEqual(
      STEAM_POWER_W_PER_M2.flat_plate.poor,
    );
  });
});

describe("steamReach walks the pipes from the collector", () => {
  const pipes = [
    { lengthM: 4, lossWPerM: 20, contentLPerM: 0.1453 },
    { lengthM: 22, lossWPerM: 25, contentLPerM: 0.1453 },
  ];

  it("spends the power pipe by pipe: 300 W covers 4 m × 20 W/m and then 8.8 m × 25 W/m", () => {
    const r = steamReach(300, pipes);
    expect(r.reachM).toBeCloseTo(4 + 220 / 25, 10);
    expect(r.pipeSteamL).toBeCloseTo((4 + 8.8) * 0.1453, 10);
    expect(r.passesEnd).toBe(false);
  });

  it("past the last pipe the reach goes on at the last pipe's loss, and says so", () => {
    const r = steamReach(1000, pipes);
    expect(r.passesEnd).toBe(true);
    expect(r.reachM).toBeCloseTo(26 + (1000 - 80 - 550) / 25, 10);
    expect(r.pipeSteamL).toBeCloseTo(26 * 0.1453, 10);
  });

  it("more power never shortens the reach, and the content by hand matches the walk (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 3000, noNaN: true }),
        fc.double({ min: 0, max: 3000, noNaN: true }),
        (a, b) => {
          const [lo, hi] = a < b ? [a, b] : [b, a];
          const rl = steamReach(lo, pipes);
          const rh = steamReach(hi, pipes);
          expect(rh.reachM).toBeGreaterThanOrEqual(rl.reachM - 1e-9);
          expect(pipeContentWithinL(pipes, rl.reachM)).toBeCloseTo(rl.pipeSteamL, 9);
        },
      ),
    );
  });
});
