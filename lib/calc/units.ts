/** Unit conversions at the edges; everything inside lib/calc is SI. */
export const ATM_BAR = 1.01325;
export const G = 9.80665; // standard gravity, m/s²

export const barToPa = (bar: number) => bar * 1e5;
export const paToBar = (pa: number) => pa / 1e5;
export const cToK = (c: number) => c + 273.15;
export const kToC = (k: number) => k - 273.15;
/** Gauge bar to absolute MPa. */
export const barGaugeToMPaAbs = (barG: number) => (barG + ATM_BAR) / 10;
export const lphToM3s = (lph: number) => lph / 1000 / 3600;
export const m3sToLph = (m3s: number) => m3s * 1000 * 3600;

/** Round for display without losing the sign or producing "-0". */
export function round(value: number, digits = 2): number {
  const f = 10 ** digits;
  const r = Math.round(value * f) / f;
  return Object.is(r, -0) ? 0 : r;
}

export const isFiniteNumber = (v: unknown): v is number =>
  typeof v === "number" && Number.isFinite(v);
