/** The shape of a loop-check finding, shared by the calculations, the checklist and the UI. */

export const LEVELS = ["ok", "note", "fix", "stop"] as const;
export type Level = (typeof LEVELS)[number];

/** The checklist's `computed` names (checklist.md), plus `input` for what is missing. */
export const FINDING_KEYS = [
  "fluid-volume",
  "vessel-size",
  "vessel-precharge",
  "vessel-rating",
  "fill-pressure",
  "relief-margin",
  "freeze",
  "flow-rate",
  "hydraulics",
  "collector-output",
  "stagnation",
  "steam-reach",
  "fluid",
  "pipe-insulation",
  "component-ratings",
  "scald",
  "store-size",
  "coil-position",
  "unvented",
  "first-fill",
  "input",
] as const;
export type FindingKey = (typeof FINDING_KEYS)[number];

export interface FindingValue {
  label: string;
  value: number | string;
  unit?: string;
}

export interface Finding {
  key: FindingKey;
  level: Level;
  title: string;
  values: FindingValue[];
  /** Where the formula or the limit comes from: the standard's name, briefly. */
  source: string;
  /** How this is worked out, for the curious: formula, assumptions and marks of provenance. */
  method?: string;
  /** What to do about it, in plain words. */
  action: string;
}

export const LEVEL_RANK: Record<Level, number> = { ok: 0, note: 1, fix: 2, stop: 3 };

export function worstLevel(findings: readonly Pick<Finding, "level">[]): Level {
  let worst: Level = "ok";
  for (const f of findings) if (LEVEL_RANK[f.level] > LEVEL_RANK[worst]) worst = f.level;
  return worst;
}

export const LEVEL_LABELS: Record<Level, string> = {
  ok: "OK",
  note: "Note",
  fix: "Fix",
  stop: "Stop",
};

export const ADVISORY_LINE =
  "Advisory only: local building codes, the manufacturer's instructions and licensed practice take precedence over this check.";

/** True when every number in the finding is finite. */
export function isFiniteFinding(f: Finding): boolean {
  return f.values.every((v) => typeof v.value !== "number" || Number.isFinite(v.value));
}
