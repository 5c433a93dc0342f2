/**
 * Steam reach at stagnation, by the method of VDI 6002 Part 1 (2014): the collector field keeps
 * producing steam with a "steam-producing power" per m² of collector, which depends on how well
 * the collector empties of liquid when it boils; the steam then flows down the pipes until their
 * heat loss has condensed all of it. The reach is the pipe length whose heat loss equals the
 * steam-producing power, and the steam volume is the collector content plus the pipe content
 * within that reach. The coefficients below were recalled from memory of VDI 6002-1 and the
 * stagnation studies behind it, not read from the standard: a reviewer should confirm them.
 */

export type CollectorKind = "flat_plate" | "evacuated_tube";
export type Emptying = "good" | "poor" | "unknown";

/**
 * Steam-producing power, W per m² of gross collector area (VDI 6002-1, from memory): flat plates
 * that empty well about 60, flat plates that empty poorly about 120, evacuated tubes up to about
 * 200. "Not known" is taken as poorly emptying, the safe side.
 */
export const STEAM_POWER_W_PER_M2: Record<CollectorKind, Record<Emptying, number>> = {
  flat_plate: { good: 60, poor: 120, unknown: 120 },
  evacuated_tube: { good: 200, poor: 200, unknown: 200 },
};

/**
 * Constants for the heat loss of a steam-filled pipe (common practice; values that make the loss
 * low, so the computed reach errs long):
 * - insulation conductivity 0.040 W/(m·K) (elastomeric or mineral-wool pipe insulation);
 * - outer surface coefficient, convection plus radiation, 8 W/(m²·K) on insulation and
 *   10 W/(m²·K) on bare copper;
 * - surroundings at 30 °C (a summer roof space; the EN ISO 9806 stagnation ambient);
 * - insulation 20 mm thick when the run is insulated and no thickness is given.
 */
export const PIPE_LOSS = {
  insulationConductivityWmK: 0.04,
  surfaceCoefficientInsulated: 8,
  surfaceCoefficientBare: 10,
  ambientC: 30,
  defaultInsulationMm: 20,
} as const;

/**
 * Heat loss per metre of a pipe at `pipeC` in surroundings at `ambientC`, W/m: conduction through
 * a cylindrical insulation layer in series with the outer surface coefficient,
 *   q' = 2π ΔT / ( ln(r₂/r₁)/λ + 1/(r₂ h) ),
 * and for a bare pipe q' = 2π r₁ h ΔT (Incropera & DeWitt, Fundamentals of Heat and Mass
 * Transfer, ch. 3, the radial system; the pipe wall's own resistance is negligible).
 */
export function pipeHeatLossWPerM(
  outerDiameterMm: number,
  insulationMm: number,
  pipeC: number,
  ambientC: number = PIPE_LOSS.ambientC,
): number {
  const dT = Math.max(pipeC - ambientC, 0);
  const r1 = outerDiameterMm / 2000;
  if (insulationMm <= 0) return 2 * Math.PI * r1 * PIPE_LOSS.surfaceCoefficientBare * dT;
  const r2 = r1 + insulationMm / 1000;
  const resistance =
    Math.log(r2 / r1) / PIPE_LOSS.insulationConductivityWmK +
    1 / (r2 * PIPE_LOSS.surfaceCoefficientInsulated);
  return (2 * Math.PI * dT) / resistance;
}

export interface SteamPipe {
  lengthM: number;
  /** Heat loss while full of steam, W/m. */
  lossWPerM: number;
  /** Content, L/m. */
  contentLPerM: number;
}

export interface SteamReach {
  /** Pipe length filled with steam, m (flow and return together). */
  reachM: number;
  /** Content of the pipe within the reach, L (only the pipes described). */
  pipeSteamL: number;
  /** True when the steam would go on past the last pipe described. */
  passesEnd: boolean;
}

/**
 * Walk the pipes in order from the collector, spending the steam-producing power `powerW` on
 * each pipe's heat loss until none is left. Past the last pipe the reach is extended at the last
 * pipe's loss per metre (so it can be compared with a pump station further on).
 */
export function steamReach(powerW: number, pipes: readonly SteamPipe[]): SteamReach {
  let left = Math.max(powerW, 0);
  let reachM = 0;
  let pipeSteamL = 0;
  for (const p of pipes) {
    if (left <= 0) break;
    const whole = p.lossWPerM * p.lengthM;
    if (p.lossWPerM <= 0 || whole <= left) {
      reachM += p.lengthM;
      pipeSteamL += p.lengthM * p.contentLPerM;
      left -= whole;
    } else {
      const part = left / p.lossWPerM;
      reachM += part;
      pipeSteamL += part * p.contentLPerM;
      left = 0;
    }
  }
  const last = pipes.at(-1);
  const passesEnd = left > 0;
  if (passesEnd && last && last.lossWPerM > 0) reachM += left / last.lossWPerM;
  return { reachM, pipeSteamL, passesEnd };
}

/** Content, L, of the first `lengthM` metres of the pipes (for a steam reach given by hand). */
export function pipeContentWithinL(pipes: readonly SteamPipe[], lengthM: number): number {
  let left = Math.max(lengthM, 0);
  let litres = 0;
  for (const p of pipes) {
    const take = Math.min(left, p.lengthM);
    litres += take * p.contentLPerM;
    left -= take;
    if (left <= 0) break;
  }
  return litres;
}
