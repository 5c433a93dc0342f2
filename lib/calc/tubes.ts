/**
 * Copper tube (EN 1057, half-hard R250 in the usual domestic sizes): outer diameter × wall.
 * Inner diameter d_i = d_o − 2t; content per metre = π d_i² / 4.
 * Source: EN 1057:2006+A1:2010, Table 3 (dimensions); 10 × 0.6 is recalled from memory.
 */
export const COPPER_TUBES = [
  { id: "10x0.6", outerMm: 10, wallMm: 0.6 },
  { id: "12x0.6", outerMm: 12, wallMm: 0.6 },
  { id: "15x0.7", outerMm: 15, wallMm: 0.7 },
  { id: "15x1.0", outerMm: 15, wallMm: 1.0 },
  { id: "22x0.9", outerMm: 22, wallMm: 0.9 },
  { id: "22x1.0", outerMm: 22, wallMm: 1.0 },
  { id: "28x0.9", outerMm: 28, wallMm: 0.9 },
  { id: "28x1.5", outerMm: 28, wallMm: 1.5 },
] as const;

export type CopperTubeId = (typeof COPPER_TUBES)[number]["id"];
export const COPPER_TUBE_IDS = COPPER_TUBES.map((t) => t.id) as [CopperTubeId, ...CopperTubeId[]];

/** Typical content of flexible corrugated stainless solar pipe, L/m (common practice). */
export const FLEX_DEFAULTS = {
  DN16: { boreMm: 16, contentLPerM: 0.21 },
  DN20: { boreMm: 20, contentLPerM: 0.33 },
} as const;

/** Roughness, m: drawn copper 0.0015 mm (common practice, Moody chart tables); corrugated pipe treated as rougher. */
export const ROUGHNESS_M = { copper: 1.5e-6, stainless_flex: 1.5e-4 } as const;

/** Inner diameter in mm of an EN 1057 tube. */
export function copperInnerDiameterMm(id: CopperTubeId): number {
  const tube = COPPER_TUBES.find((t) => t.id === id);
  if (!tube) throw new RangeError(`unknown tube ${id}`);
  return tube.outerMm - 2 * tube.wallMm;
}

/** Content of a round bore in litres per metre: π d² / 4 with d in metres, × 1000 L/m³. */
export function litresPerMetre(innerDiameterMm: number): number {
  const d = innerDiameterMm / 1000;
  return (Math.PI * d * d * 1000) / 4;
}

/** Outer diameter in mm of an EN 1057 tube. */
export function copperOuterDiameterMm(id: CopperTubeId): number {
  const tube = COPPER_TUBES.find((t) => t.id === id);
  if (!tube) throw new RangeError(`unknown tube ${id}`);
  return tube.outerMm;
}

/** Corrugated flexible pipe: outer diameter taken as the bore + 5 mm (common practice estimate). */
export const FLEX_OUTER_EXTRA_MM = 5;
