/**
 * Collector efficiency, output and stagnation temperature.
 * Source: EN ISO 9806:2017, quasi-static/steady-state efficiency curve on aperture area:
 *   η = η₀ − a₁ (T_m − T_a)/G − a₂ (T_m − T_a)²/G,   Q = η G A.
 * Stagnation: the mean fluid temperature at which η = 0, at G = 1000 W/m² and T_a = 30 °C
 * (the standard stagnation conditions of EN ISO 9806, recalled from memory).
 */

export interface EfficiencyCoefficients {
  eta0: number;
  a1: number;
  a2: number;
}

/** Defaults when the collector's test report is not to hand (common practice, not published values). */
export const DEFAULT_COEFFICIENTS: Record<"flat_plate" | "evacuated_tube", EfficiencyCoefficients> =
  {
    flat_plate: { eta0: 0.78, a1: 3.5, a2: 0.015 },
    evacuated_tube: { eta0: 0.65, a1: 1.2, a2: 0.008 },
  };

/** Reference irradiance, W/m²: full sun, about 1 kW per m² (common practice). */
export const REFERENCE_IRRADIANCE = 1000;
export const STAGNATION_AMBIENT_C = 30;

/** Efficiency at mean fluid temperature tmC, ambient taC and irradiance g (W/m²); never below zero. */
export function collectorEfficiency(
  c: EfficiencyCoefficients,
  tmC: number,
  taC: number,
  g: number,
): number {
  if (g <= 0) return 0;
  const dT = tmC - taC;
  return Math.max(0, c.eta0 - (c.a1 * dT) / g - (c.a2 * dT * dT) / g);
}

/** Useful output in W for an aperture area in m². */
export function collectorOutputW(
  c: EfficiencyCoefficients,
  apertureM2: number,
  tmC: number,
  taC: number,
  g: number,
): number {
  return collectorEfficiency(c, tmC, taC, g) * g * apertureM2;
}

/**
 * Stagnation temperature, °C: the positive root of η₀ G − a₁ ΔT − a₂ ΔT² = 0, plus T_a.
 * With a₂ = 0 the curve is linear and ΔT = η₀ G / a₁.
 */
export function stagnationTemperatureC(
  c: EfficiencyCoefficients,
  g = REFERENCE_IRRADIANCE,
  taC = STAGNATION_AMBIENT_C,
): number {
  if (c.a2 > 0) {
    const dT = (-c.a1 + Math.sqrt(c.a1 * c.a1 + 4 * c.a2 * c.eta0 * g)) / (2 * c.a2);
    return taC + dT;
  }
  if (c.a1 > 0) return taC + (c.eta0 * g) / c.a1;
  return Number.POSITIVE_INFINITY;
}

/**
 * Conservative stagnation temperatures, °C, for when the collector's test report is not to hand
 * (typical EN ISO 9806 test reports give about 180–220 °C for selective flat plates and about
 * 250–300 °C for evacuated tubes; recalled from memory, not published values). Extrapolating the
 * efficiency curve to η = 0 reads low against such reports, so the estimate takes the higher.
 */
export const CONSERVATIVE_STAGNATION_C: Record<"flat_plate" | "evacuated_tube", number> = {
  flat_plate: 220,
  evacuated_tube: 300,
};

export interface StagnationEstimate {
  tempC: number;
  /** Where the figure came from, in plain words. */
  basis: "test report" | "conservative default" | "efficiency curve";
}

/**
 * The stagnation temperature the hot zone must take: the test report's figure when given;
 * otherwise the higher of the efficiency-curve extrapolation and the conservative default.
 */
export function stagnationEstimate(
  type: "flat_plate" | "evacuated_tube",
  coefficients: EfficiencyCoefficients,
  reportedC?: number,
): StagnationEstimate {
  if (reportedC !== undefined) return { tempC: reportedC, basis: "test report" };
  const curve = stagnationTemperatureC(coefficients);
  const fallback = CONSERVATIVE_STAGNATION_C[type];
  return Number.isFinite(curve) && curve > fallback
    ? { tempC: curve, basis: "efficiency curve" }
    : { tempC: fallback, basis: "conservative default" };
}
