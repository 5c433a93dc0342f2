/**
 * Pin numbers: one sequence over the whole report, in checklist order and then in the order the
 * reviewer dropped them, so the workspace, the report and the print show the same numbers.
 */
import type { Pin } from "@/lib/types/review";

export interface NumberedPin extends Pin {
  n: number;
  itemKey: string;
}

export function numberPins(
  itemKeys: readonly string[],
  pinsOf: (key: string) => readonly Pin[] | undefined,
): NumberedPin[] {
  const out: NumberedPin[] = [];
  for (const key of itemKeys)
    for (const p of pinsOf(key) ?? []) out.push({ ...p, n: out.length + 1, itemKey: key });
  return out;
}

/** Whether a point lies on the image (fractions of its width and height, edges included). */
export function onImage(x: number, y: number): boolean {
  return Number.isFinite(x) && Number.isFinite(y) && x >= 0 && x <= 1 && y >= 0 && y <= 1;
}
