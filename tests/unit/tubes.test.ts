import { describe, expect, it } from "vitest";
import { copperInnerDiameterMm, litresPerMetre, type CopperTubeId } from "@/lib/calc/tubes";

// EN 1057 (R250 half-hard) bores and contents, as tabulated in computation.md.
// Tolerance 0.0005 L/m: the published contents are rounded to four decimals.
const CASES: [CopperTubeId, number, number, string][] = [
  ["10x0.6", 8.8, 0.0608, "size recalled from memory"],
  ["12x0.6", 10.8, 0.0916, "EN 1057 R250"],
  ["15x0.7", 13.6, 0.1453, "EN 1057 R250"],
  ["22x0.9", 20.2, 0.3205, "EN 1057 R250"],
  ["28x0.9", 26.2, 0.5391, "EN 1057 R250"],
  ["15x1.0", 13.0, 0.133, "EN 1057"],
  ["22x1.0", 20.0, 0.314, "EN 1057"],
  ["28x1.5", 25.0, 0.491, "EN 1057"],
];

describe("copper tube sizes (EN 1057)", () => {
  it.each(CASES)("%s mm: bore %s mm, %s L/m (%s)", (id, bore, lPerM) => {
    expect(copperInnerDiameterMm(id)).toBeCloseTo(bore, 6);
    expect(Math.abs(litresPerMetre(copperInnerDiameterMm(id)) - lPerM)).toBeLessThan(0.0005);
  });
});
