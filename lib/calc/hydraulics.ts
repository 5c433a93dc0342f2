/**
 * Pipe hydraulics: velocity, Reynolds number, friction factor, Darcy–Weisbach pressure drop.
 * Sources: Darcy–Weisbach Δp = f (L/D) ρ V²/2; laminar f = 64/Re (Hagen–Poiseuille);
 * turbulent f from the Colebrook equation, solved by fixed-point iteration started from
 * Swamee–Jain (1976). As in White, Fluid Mechanics, ch. 6, and Çengel & Cimbala, ch. 8.
 */

/** Below this Reynolds number the flow is taken as laminar (common textbook limit). */
export const RE_LAMINAR = 2300;

export function velocity(flowM3s: number, innerDiameterM: number): number {
  return flowM3s / ((Math.PI * innerDiameterM * innerDiameterM) / 4);
}

export function reynolds(
  velocityMs: number,
  innerDiameterM: number,
  kinematicViscosityM2s: number,
): number {
  return (velocityMs * innerDiameterM) / kinematicViscosityM2s;
}

/** Swamee–Jain explicit approximation of Colebrook (valid 5e3 < Re < 1e8, 1e-6 < ε/D < 1e-2). */
export function swameeJain(re: number, relativeRoughness: number): number {
  const t = Math.log10(relativeRoughness / 3.7 + 5.74 / re ** 0.9);
  return 0.25 / (t * t);
}

/** Colebrook: 1/√f = −2 log10(ε/(3.7 D) + 2.51/(Re √f)). */
export function colebrook(re: number, relativeRoughness: number): number {
  let f = swameeJain(re, relativeRoughness);
  for (let k = 0; k < 50; k++) {
    const inv = -2 * Math.log10(relativeRoughness / 3.7 + 2.51 / (re * Math.sqrt(f)));
    const next = 1 / (inv * inv);
    if (Math.abs(next - f) < 1e-12) return next;
    f = next;
  }
  return f;
}

/**
 * Darcy friction factor for any regime. In the transition (2300–4000) we take the larger of
 * the laminar and turbulent values, a conservative choice for sizing (common practice).
 */
export function frictionFactor(re: number, relativeRoughness: number): number {
  if (re <= 0) return 0;
  if (re < RE_LAMINAR) return 64 / re;
  const turbulent = colebrook(re, relativeRoughness);
  if (re < 4000) return Math.max(64 / re, turbulent);
  return turbulent;
}

export interface PipeFlowInput {
  flowM3s: number;
  innerDiameterM: number;
  lengthM: number;
  roughnessM: number;
  densityKgM3: number;
  dynamicViscosityPas: number;
}

export interface PipeFlowResult {
  velocityMs: number;
  reynolds: number;
  laminar: boolean;
  frictionFactor: number;
  pressureDropPa: number;
}

/** Darcy–Weisbach pressure drop in a straight pipe (fittings added as equivalent length). */
export function pipePressureDrop(p: PipeFlowInput): PipeFlowResult {
  const v = velocity(p.flowM3s, p.innerDiameterM);
  const nu = p.dynamicViscosityPas / p.densityKgM3;
  const re = reynolds(v, p.innerDiameterM, nu);
  const f = frictionFactor(re, p.roughnessM / p.innerDiameterM);
  const dp = (f * (p.lengthM / p.innerDiameterM) * p.densityKgM3 * v * v) / 2;
  return {
    velocityMs: v,
    reynolds: re,
    laminar: re < RE_LAMINAR,
    frictionFactor: f,
    pressureDropPa: dp,
  };
}

/** Equivalent length of one fitting (elbow, tee run, valve) in tube diameters: about 30 D (common practice). */
export const FITTING_EQUIVALENT_DIAMETERS = 30;

/** Head in metres of the fluid for a pressure drop. */
export function pressureToHeadM(pa: number, densityKgM3: number): number {
  return pa / (densityKgM3 * 9.80665);
}
