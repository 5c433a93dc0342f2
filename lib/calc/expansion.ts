/**
 * Loop fluid volume, thermal expansion and expansion-vessel sizing.
 * Sources: EN 12828:2012 Annex D (vessel sizing principle), VDI 6002 Part 1 (solar
 * specifics: steam volume at stagnation, pre-charge from static height). The constants
 * marked "from memory" below were recalled, not read from the standards.
 */
import { glycolDensity, GLYCOL_MAX_TEMP_C, type GlycolKind } from "./glycol";
import { waterDensity } from "./water-if97";
import { cToK } from "./units";

/** Standard vessel sizes offered by the trade, L (common practice). */
export const STANDARD_VESSEL_SIZES_L = [8, 12, 18, 25, 35, 50, 80] as const;

/** Water seal: 0.5 % of the loop volume, at least 3 L (VDI 6002-1, from memory). */
export function waterSealL(loopVolumeL: number): number {
  return Math.max(0.005 * loopVolumeL, 3);
}

/** Recommended pre-charge, bar g: static height × 0.1 bar/m + 0.4 bar, at least 1.2 bar (VDI 6002-1, from memory). */
export function recommendedPrechargeBar(staticHeightM: number): number {
  return Math.max(staticHeightM * 0.1 + 0.4, 1.2);
}

/** The least cold fill pressure, bar g: pre-charge + 0.3 bar (EN 12828, from memory). */
export function fillPressureBar(prechargeBar: number): number {
  return prechargeBar + 0.3;
}

/**
 * The cold fill pressure, bar g, that puts the water seal `sealL` into a vessel of `nominalL`
 * pre-charged to `prechargeBar` (the pre-charge actually set): Boyle's law on the gas side,
 * (p₀ + 1) V_n = (p_a + 1)(V_n − V_v), and never below EN 12828's p₀ + 0.3 bar. Infinity when
 * the vessel is no larger than the seal. Source: VDI 6002-1 (the seal is in the vessel at the
 * fill temperature), EN 12828 Annex D; from memory.
 */
export function fillPressureForSealBar(
  nominalL: number,
  prechargeBar: number,
  sealL: number,
): number {
  if (nominalL <= sealL) return Number.POSITIVE_INFINITY;
  const boyle = ((prechargeBar + 1) * nominalL) / (nominalL - sealL) - 1;
  return Math.max(boyle, fillPressureBar(prechargeBar));
}

/** Final (maximum working) pressure, bar g, from the relief setting (EN 12828, from memory). */
export function finalPressureBar(reliefBar: number): number {
  return reliefBar <= 5 ? reliefBar - 0.5 : 0.9 * reliefBar;
}

export interface ExpansionResult {
  /** Relative expansion, ρ(T_fill)/ρ(T_max) − 1. */
  coefficient: number;
  expansionL: number;
  /** Which property data covered which part of the temperature range. */
  basis: string;
}

/**
 * Expansion of the loop's fluid from fill to the highest liquid temperature.
 * Glycol mixes use Melinder's density up to 100 °C; beyond that we chain on the relative
 * expansion of water from IAPWS-IF97 Region 1 (at `pressureMPa` absolute), and say so.
 */
export function thermalExpansion(
  volumeL: number,
  glycolPercent: number,
  fillC: number,
  maxC: number,
  pressureMPa = 0.4,
  kind: GlycolKind = "propylene",
): ExpansionResult {
  // IF97 Region 1 starts at 0 °C: a colder plain-water loop is frozen anyway.
  const water = (c: number) => waterDensity(cToK(Math.max(c, 0)), pressureMPa);
  if (glycolPercent <= 0) {
    const coefficient = water(fillC) / water(maxC) - 1;
    return { coefficient, expansionL: volumeL * coefficient, basis: "water, IAPWS-IF97 Region 1" };
  }
  const top = Math.min(maxC, GLYCOL_MAX_TEMP_C);
  let ratio = glycolDensity(glycolPercent, fillC, kind) / glycolDensity(glycolPercent, top, kind);
  let basis = `${kind} glycol ${glycolPercent} %, Melinder (2010)`;
  if (maxC > GLYCOL_MAX_TEMP_C) {
    ratio *= water(GLYCOL_MAX_TEMP_C) / water(maxC);
    basis += `, to ${GLYCOL_MAX_TEMP_C} °C; water's expansion (IAPWS-IF97) from ${GLYCOL_MAX_TEMP_C} to ${maxC} °C`;
  }
  const coefficient = ratio - 1;
  return { coefficient, expansionL: volumeL * coefficient, basis };
}

export interface VesselSizingInput {
  expansionL: number;
  waterSealL: number;
  steamVolumeL: number;
  prechargeBar: number;
  finalPressureBar: number;
}

/**
 * Required nominal vessel volume, L: V_n ≥ (V_e + V_v + V_d)(p_e + 1)/(p_e − p_0), pressures in
 * bar gauge (EN 12828 Annex D; VDI 6002-1 adds the steam volume V_d). Infinity when p_e ≤ p_0:
 * no vessel can work because the relief valve would open before the vessel takes any fluid.
 */
export function requiredVesselVolumeL(i: VesselSizingInput): number {
  if (i.finalPressureBar <= i.prechargeBar) return Number.POSITIVE_INFINITY;
  return (
    ((i.expansionL + i.waterSealL + i.steamVolumeL) * (i.finalPressureBar + 1)) /
    (i.finalPressureBar - i.prechargeBar)
  );
}

/** The smallest standard size at or above the requirement, or null above 80 L. */
export function nextStandardVesselL(requiredL: number): number | null {
  return STANDARD_VESSEL_SIZES_L.find((s) => s >= requiredL) ?? null;
}

/**
 * Loop pressure, bar g, once `displacedL` (expansion plus any steam) has entered a vessel of
 * `nominalL` pre-charged to `prechargeBar` and filled at `fillBar` (Boyle's law on the gas side).
 * Returns Infinity when the gas side would be used up: the relief valve opens before that.
 */
export function vesselPressureBar(
  nominalL: number,
  prechargeBar: number,
  fillBar: number,
  displacedL: number,
): number {
  // Filled below its pre-charge the vessel holds no fluid yet: the gas fills all of it.
  const gasAtFill = Math.min(nominalL, (nominalL * (prechargeBar + 1)) / (fillBar + 1));
  const gas = gasAtFill - displacedL;
  if (gas <= 0) return Number.POSITIVE_INFINITY;
  return (nominalL * (prechargeBar + 1)) / gas - 1;
}

export interface VesselState {
  /** Pressure at the vessel, bar g (Infinity once the gas side is used up). */
  pressureBar: number;
  /** The vessel has given back all its fluid: the loop is at (or falling below) the pre-charge. */
  empty: boolean;
}

/**
 * The vessel once `changeL` has entered it since filling (negative when the loop contracts, e.g.
 * on a cold night). When contraction exceeds the fluid the vessel holds, the vessel is empty and
 * the loop pressure is at most the pre-charge: the rest of the contraction pulls a vacuum at the
 * high point, where air is drawn in. Boyle's law on the gas side.
 */
export function vesselState(
  nominalL: number,
  prechargeBar: number,
  fillBar: number,
  changeL: number,
): VesselState {
  const gasAtFill = Math.min(nominalL, (nominalL * (prechargeBar + 1)) / (fillBar + 1));
  const gas = gasAtFill - changeL;
  if (gas >= nominalL) return { pressureBar: prechargeBar, empty: true };
  return { pressureBar: vesselPressureBar(nominalL, prechargeBar, fillBar, changeL), empty: false };
}
