/**
 * Propylene glycol–water properties from Melinder's polynomials:
 *   f(x, T) = Σ c_ij (x − x_m)^i (T − T_m)^j,  x in % by mass, T in °C,
 * x_m = 30.7031 %, T_m = 32.7083 °C.
 * Source: Å. Melinder, Properties of Secondary Working Fluids for Indirect Systems
 * (IIR, 2010), propylene glycol chapter; coefficients as published there.
 * Viscosity is fitted as ln(μ / mPa·s). Valid for 0–60 % by mass, from the freezing
 * point up to about 100 °C (above that we clamp to 100 °C and say so).
 */

const XM = 30.7031;
const TM = 32.7083;

type Coeffs = ReadonlyArray<ReadonlyArray<number>>;

const FREEZE: Coeffs = [[-1.325e1], [-6.631e-1], [-1.094e-2], [-2.283e-4], [-3.409e-6], [1.465e-8]];

const DENSITY: Coeffs = [
  [1.018e3, -5.406e-1, -2.666e-3, 1.347e-5],
  [7.604e-1, -9.45e-3, 5.541e-5, -1.343e-7],
  [-2.498e-3, 2.7e-5, -4.018e-7, 3.376e-9],
  [-1.55e-4, 2.829e-6, -7.175e-9],
  [-1.131e-6, -2.221e-8],
  [2.342e-8],
];

const LN_VISCOSITY: Coeffs = [
  [6.837e-1, -3.045e-2, 2.525e-4, -1.399e-6],
  [3.328e-2, -3.984e-4, 4.332e-6, -1.86e-8],
  [5.453e-5, -8.6e-8, -1.593e-8, -4.465e-11],
  [-3.9e-6, 1.054e-7, -1.589e-9],
  [-1.587e-8, 4.475e-10],
  [3.564e-9],
];

const SPECIFIC_HEAT: Coeffs = [
  [3.882e3, 2.699, -1.659e-3, -1.032e-5],
  [-1.304e1, 5.07e-2, -4.752e-5, 1.522e-6],
  [-1.598e-1, 9.534e-5, 1.167e-5, -4.87e-8],
  [3.539e-4, 3.102e-5, -2.95e-7],
  [5.0e-5, -7.135e-7],
  [-4.959e-7],
];

export const GLYCOL_MAX_PERCENT = 60;
export const GLYCOL_MAX_TEMP_C = 100;

function poly(c: Coeffs, percent: number, tempC: number): number {
  const dx = percent - XM;
  const dy = tempC - TM;
  let sum = 0;
  for (let i = 0; i < c.length; i++) {
    const row = c[i] ?? [];
    for (let j = 0; j < row.length; j++) sum += (row[j] ?? 0) * dx ** i * dy ** j;
  }
  return sum;
}

export interface GlycolState {
  percent: number;
  tempC: number;
  /** True when the temperature or concentration was outside the fit and has been clamped. */
  clamped: boolean;
}

/** Clamp to the polynomials' range: 0–60 % and freezing point to 100 °C. */
export function clampGlycolState(percent: number, tempC: number): GlycolState {
  const p = Math.min(Math.max(percent, 0), GLYCOL_MAX_PERCENT);
  const tMin = glycolFreezingPoint(p);
  const t = Math.min(Math.max(tempC, tMin), GLYCOL_MAX_TEMP_C);
  return { percent: p, tempC: t, clamped: p !== percent || t !== tempC };
}

/**
 * Freezing point (first ice crystals), °C, of propylene glycol–water at `percent` by mass.
 * Not the burst point: a mix below its freezing point turns to slush before it can burst pipes.
 * At 0 % this returns 0 °C exactly (pure water); the polynomial is fitted from 0 % upward.
 */
export function glycolFreezingPoint(percent: number): number {
  const p = Math.min(Math.max(percent, 0), GLYCOL_MAX_PERCENT);
  if (p === 0) return 0;
  return Math.min(0, poly(FREEZE, p, TM));
}

/** Density, kg/m³ (Melinder 2010). */
export function glycolDensity(percent: number, tempC: number): number {
  const s = clampGlycolState(percent, tempC);
  return poly(DENSITY, s.percent, s.tempC);
}

/** Dynamic viscosity, Pa·s (Melinder 2010, fitted as ln of mPa·s). */
export function glycolViscosity(percent: number, tempC: number): number {
  const s = clampGlycolState(percent, tempC);
  return Math.exp(poly(LN_VISCOSITY, s.percent, s.tempC)) / 1000;
}

/** Specific heat capacity, J/(kg·K) (Melinder 2010). */
export function glycolSpecificHeat(percent: number, tempC: number): number {
  const s = clampGlycolState(percent, tempC);
  return poly(SPECIFIC_HEAT, s.percent, s.tempC);
}
