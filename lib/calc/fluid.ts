/**
 * The loop's fluid as one model, whatever it is: plain water and a 0 % mix are the same fluid
 * (IAPWS-IF97 density, the Vogel viscosity fit, freezing at 0 °C); glycol mixes use Melinder's
 * (2010) polynomials for their own glycol.
 */
import {
  glycolDensity,
  glycolFreezingPoint,
  glycolViscosity,
  iceFraction,
  type GlycolKind,
} from "./glycol";
import { waterDensity, waterViscosity } from "./water-if97";
import { cToK } from "./units";

export interface FluidModel {
  /** null for plain water (any fluid at 0 %). */
  kind: GlycolKind | null;
  percent: number;
  /** Freezing point (first crystals), °C. */
  freezeC: number;
  densityKgM3(tempC: number): number;
  viscosityPas(tempC: number): number;
  /** Mass fraction of ice at `tempC` (0 above the freezing point, 1 for frozen water). */
  iceFraction(tempC: number): number;
  /** Plain words for the finding, e.g. "40 % propylene glycol" or "plain water". */
  label: string;
}

/** Pressure at which liquid water properties are taken, MPa absolute (a typical loop). */
const WATER_PRESSURE_MPA = 0.3;

export function fluidModel(
  glycolType: "propylene" | "ethylene" | "none",
  percent: number,
): FluidModel {
  const p = glycolType === "none" ? 0 : Math.max(percent, 0);
  if (p === 0 || glycolType === "none") {
    return {
      kind: null,
      percent: 0,
      freezeC: 0,
      densityKgM3: (t) => waterDensity(cToK(Math.min(Math.max(t, 0), 100)), WATER_PRESSURE_MPA),
      viscosityPas: (t) => waterViscosity(cToK(Math.min(Math.max(t, 0), 100))),
      iceFraction: (t) => (t < 0 ? 1 : 0),
      label: "plain water",
    };
  }
  const kind = glycolType;
  return {
    kind,
    percent: p,
    freezeC: glycolFreezingPoint(p, kind),
    densityKgM3: (t) => glycolDensity(p, t, kind),
    viscosityPas: (t) => glycolViscosity(p, t, kind),
    iceFraction: (t) => iceFraction(p, t, kind),
    label: `${p} % ${kind} glycol`,
  };
}
