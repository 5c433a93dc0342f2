/**
 * Glycol–water properties from Melinder's polynomials:
 *   f(x, T) = Σ c_ij (x − x_m)^i (T − T_m)^j,  x in % by mass, T in °C.
 * Source: Å. Melinder, Properties of Secondary Working Fluids for Indirect Systems
 * (IIR, 2010), the propylene glycol and ethylene glycol chapters; coefficients as published
 * there (the same tables are carried by the NREL SecondaryCoolantProps and IBPSA Modelica
 * libraries, which we compared them against).
 * Viscosity is fitted as ln(μ / mPa·s). Valid for 0–60 % by mass, from the freezing point up to
 * about 100 °C (above that we clamp to 100 °C and say so).
 */

export const GLYCOL_KINDS = ["propylene", "ethylene"] as const;
export type GlycolKind = (typeof GLYCOL_KINDS)[number];

type Coeffs = ReadonlyArray<ReadonlyArray<number>>;

interface MelinderFluid {
  /** Reference concentration x_m, % by mass, and reference temperature T_m, °C. */
  xm: number;
  tm: number;
  freeze: Coeffs;
  density: Coeffs;
  lnViscosity: Coeffs;
  specificHeat: Coeffs;
}

const FLUIDS: Record<GlycolKind, MelinderFluid> = {
  propylene: {
    xm: 30.7031,
    tm: 32.7083,
    freeze: [[-1.325e1], [-6.631e-1], [-1.094e-2], [-2.283e-4], [-3.409e-6], [1.465e-8]],
    density: [
      [1.018e3, -5.406e-1, -2.666e-3, 1.347e-5],
      [7.604e-1, -9.45e-3, 5.541e-5, -1.343e-7],
      [-2.498e-3, 2.7e-5, -4.018e-7, 3.376e-9],
      [-1.55e-4, 2.829e-6, -7.175e-9],
      [-1.131e-6, -2.221e-8],
      [2.342e-8],
    ],
    lnViscosity: [
      [6.837e-1, -3.045e-2, 2.525e-4, -1.399e-6],
      [3.328e-2, -3.984e-4, 4.332e-6, -1.86e-8],
      [5.453e-5, -8.6e-8, -1.593e-8, -4.465e-11],
      [-3.9e-6, 1.054e-7, -1.589e-9],
      [-1.587e-8, 4.475e-10],
      [3.564e-9],
    ],
    specificHeat: [
      [3.882e3, 2.699, -1.659e-3, -1.032e-5],
      [-1.304e1, 5.07e-2, -4.752e-5, 1.522e-6],
      [-1.598e-1, 9.534e-5, 1.167e-5, -4.87e-8],
      [3.539e-4, 3.102e-5, -2.95e-7],
      [5.0e-5, -7.135e-7],
      [-4.959e-7],
    ],
  },
  ethylene: {
    xm: 30.8462,
    tm: 31.728,
    // Melinder's freezing-point fit for ethylene glycol depends on x only (its T terms are ~1e-6).
    freeze: [[-1.525e1], [-8.08e-1], [-1.334e-2], [-7.293e-5], [1.006e-6], [1.14e-9]],
    density: [
      [1.034e3, -4.781e-1, -2.692e-3, 4.725e-6],
      [1.311, -6.876e-3, 4.805e-5, 1.69e-8],
      [7.49e-5, 7.855e-5, -3.995e-7, 4.982e-9],
      [-1.062e-4, 1.229e-6, -1.153e-8],
      [-9.623e-7, -7.211e-8],
      [4.891e-8],
    ],
    lnViscosity: [
      [4.705e-1, -2.55e-2, 1.782e-4, -7.669e-7],
      [2.471e-2, -1.171e-4, 1.052e-6, -1.634e-8],
      [3.328e-6, 1.086e-6, 1.051e-8, -6.475e-10],
      [1.659e-6, 3.157e-9, 4.063e-10],
      [3.089e-8, 1.831e-10],
      [-1.865e-9],
    ],
    specificHeat: [
      [3.737e3, 2.93, -4.675e-3, -1.389e-5],
      [-1.799e1, 1.046e-1, -4.147e-4, 1.847e-7],
      [-9.933e-2, 3.516e-4, 5.109e-6, -7.138e-8],
      [2.61e-3, -1.189e-6, -1.643e-7],
      [1.537e-5, -4.272e-7],
      [-1.618e-6],
    ],
  },
};

export const GLYCOL_MAX_PERCENT = 60;
export const GLYCOL_MAX_TEMP_C = 100;

function poly(fluid: MelinderFluid, c: Coeffs, percent: number, tempC: number): number {
  const dx = percent - fluid.xm;
  const dy = tempC - fluid.tm;
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
export function clampGlycolState(
  percent: number,
  tempC: number,
  kind: GlycolKind = "propylene",
): GlycolState {
  const p = Math.min(Math.max(percent, 0), GLYCOL_MAX_PERCENT);
  const tMin = glycolFreezingPoint(p, kind);
  const t = Math.min(Math.max(tempC, tMin), GLYCOL_MAX_TEMP_C);
  return { percent: p, tempC: t, clamped: p !== percent || t !== tempC };
}

/**
 * Freezing point (first ice crystals), °C, of a glycol–water mix at `percent` by mass.
 * Not the burst point: a mix below its freezing point turns to slush before it can burst pipes
 * (see `iceFraction`). At 0 % this returns 0 °C exactly (pure water); the polynomial is fitted
 * from 0 % upward, and is held at or below 0 °C.
 */
export function glycolFreezingPoint(percent: number, kind: GlycolKind = "propylene"): number {
  const fluid = FLUIDS[kind];
  const p = Math.min(Math.max(percent, 0), GLYCOL_MAX_PERCENT);
  if (p === 0) return 0;
  return Math.min(0, poly(fluid, fluid.freeze, p, fluid.tm));
}

/** Density, kg/m³ (Melinder 2010). */
export function glycolDensity(
  percent: number,
  tempC: number,
  kind: GlycolKind = "propylene",
): number {
  const s = clampGlycolState(percent, tempC, kind);
  return poly(FLUIDS[kind], FLUIDS[kind].density, s.percent, s.tempC);
}

/** Dynamic viscosity, Pa·s (Melinder 2010, fitted as ln of mPa·s). */
export function glycolViscosity(
  percent: number,
  tempC: number,
  kind: GlycolKind = "propylene",
): number {
  const s = clampGlycolState(percent, tempC, kind);
  return Math.exp(poly(FLUIDS[kind], FLUIDS[kind].lnViscosity, s.percent, s.tempC)) / 1000;
}

/** Specific heat capacity, J/(kg·K) (Melinder 2010). */
export function glycolSpecificHeat(
  percent: number,
  tempC: number,
  kind: GlycolKind = "propylene",
): number {
  const s = clampGlycolState(percent, tempC, kind);
  return poly(FLUIDS[kind], FLUIDS[kind].specificHeat, s.percent, s.tempC);
}

/**
 * Mass fraction of ice once a mix of `percent` by mass has cooled to `tempC`, by the lever rule
 * on the freezing curve: the ice that forms is pure water, so the liquid left behind is the
 * richer mix whose freezing point is `tempC`; ice = 1 − x₀ / x_liquid. Plain water (0 %) below
 * 0 °C is all ice. Where the liquid would have to be richer than 60 % (beyond the fit) we take
 * 60 %, which understates the ice a little, and the caller should say the mix is far too weak.
 * Source: phase equilibrium (lever rule) on Melinder's (2010) freezing curve.
 */
export function iceFraction(
  percent: number,
  tempC: number,
  kind: GlycolKind = "propylene",
): number {
  const x0 = Math.min(Math.max(percent, 0), GLYCOL_MAX_PERCENT);
  if (tempC >= glycolFreezingPoint(x0, kind)) return 0;
  if (x0 === 0) return 1;
  let lo = x0;
  let hi = GLYCOL_MAX_PERCENT;
  if (glycolFreezingPoint(hi, kind) > tempC) return 1 - x0 / hi;
  // The freezing point falls monotonically with concentration: bisect for fp(x) = tempC.
  for (let k = 0; k < 40; k++) {
    const mid = (lo + hi) / 2;
    if (glycolFreezingPoint(mid, kind) > tempC) lo = mid;
    else hi = mid;
  }
  return 1 - x0 / ((lo + hi) / 2);
}
