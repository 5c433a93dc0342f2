/**
 * Edges of the steam-reach walk and the pipe heat loss (VDI 6002-1 method; Incropera & DeWitt,
 * radial conduction), worked by hand.
 */
import { describe, expect, it } from "vitest";
import { PIPE_LOSS, pipeContentWithinL, pipeHeatLossWPerM, steamReach } from "@/lib/calc/steam";

describe("pipe heat loss", () => {
  it("insulated 15 mm pipe, 20 mm insulation, 130 °C in a 30 °C roof space: about 17 W/m", () => {
    // r₁ = 7.5 mm, r₂ = 27.5 mm; R' = ln(27.5/7.5)/0.040 + 1/(0.0275 × 8) = 32.482 + 4.545
    // = 37.028 m·K/W; q' = 2π × 100 / 37.028 = 16.97 W/m (Incropera & DeWitt eq. 3.27, by hand).
    expect(pipeHeatLossWPerM(15, 20, 130)).toBeCloseTo(16.97, 2);
    expect(PIPE_LOSS.ambientC).toBe(30);
  });

  it("a pipe no warmer than its surroundings loses nothing", () => {
    expect(pipeHeatLossWPerM(15, 0, 20, 30)).toBe(0);
    expect(pipeHeatLossWPerM(15, 20, 30, 30)).toBe(0);
    // Bare, default ambient: h π d ΔT = 10 × π × 0.015 × 100 = 47.12 W/m (by hand).
    expect(pipeHeatLossWPerM(15, 0, 130)).toBeCloseTo(47.12, 2);
  });
});

describe("the steam-reach walk", () => {
  const pipe = (lengthM: number, lossWPerM: number, contentLPerM = 0.1) => ({
    lengthM,
    lossWPerM,
    contentLPerM,
  });

  it("no power, no steam in the pipes", () => {
    expect(steamReach(0, [pipe(4, 20)])).toEqual({ reachM: 0, pipeSteamL: 0, passesEnd: false });
    expect(steamReach(-50, [pipe(4, 20)])).toEqual({ reachM: 0, pipeSteamL: 0, passesEnd: false });
  });

  it("a pipe that loses nothing is filled end to end, and the walk goes on", () => {
    // 100 W: 5 m at 0 W/m (all of it, 0.5 L), then 100/25 = 4 m of the next (0.4 L).
    const r = steamReach(100, [pipe(5, 0), pipe(10, 25)]);
    expect(r.reachM).toBeCloseTo(9, 12);
    expect(r.pipeSteamL).toBeCloseTo(0.9, 12);
    expect(r.passesEnd).toBe(false);
  });

  it("power exactly spent at a pipe's end stops there", () => {
    // 80 W on 4 m × 20 W/m: the whole first pipe, none of the second.
    const r = steamReach(80, [pipe(4, 20), pipe(10, 25)]);
    expect(r).toEqual({ reachM: 4, pipeSteamL: 0.4, passesEnd: false });
  });

  it("past a last pipe that loses nothing the reach cannot be extended, but passing the end is said", () => {
    const r = steamReach(100, [pipe(3, 0)]);
    expect(r.passesEnd).toBe(true);
    expect(r.reachM).toBe(3);
    expect(steamReach(100, [])).toEqual({ reachM: 0, pipeSteamL: 0, passesEnd: true });
  });

  it("the content within a length given by hand", () => {
    const pipes = [pipe(4, 20, 0.1453), pipe(22, 20, 0.3205)];
    // 10 m: 4 × 0.1453 + 6 × 0.3205 = 0.5812 + 1.923 = 2.5042 L (by hand, EN 1057 contents).
    expect(pipeContentWithinL(pipes, 10)).toBeCloseTo(2.5042, 10);
    expect(pipeContentWithinL(pipes, 0)).toBe(0);
    expect(pipeContentWithinL(pipes, -3)).toBe(0);
    // Beyond the pipes described: only what they hold, 0.5812 + 7.051 = 7.6322 L.
    expect(pipeContentWithinL(pipes, 100)).toBeCloseTo(7.6322, 10);
  });
});
