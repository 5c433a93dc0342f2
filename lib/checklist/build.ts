import type { Finding } from "@/lib/calc/findings";
import type { System } from "@/lib/validation/system";
import { CATALOGUE, CATALOGUE_VERSION, type CatalogueItem } from "./catalogue";

export interface ChecklistItem extends Omit<CatalogueItem, "applies"> {
  /** The loop-check findings shown beside the item as evidence (none when nothing is computed). */
  evidence: Finding[];
}

export interface Checklist {
  version: string;
  items: ChecklistItem[];
}

/**
 * The reviewer's checklist for one system: the catalogue items whose `applies` rule holds,
 * in catalogue order, each with the findings whose key matches its `computed` name.
 */
export function buildChecklist(system: System, findings: readonly Finding[]): Checklist {
  const items = CATALOGUE.filter((item) => item.applies === "always" || item.applies(system)).map(
    ({ applies: _applies, ...item }): ChecklistItem => ({
      ...item,
      evidence: item.computed ? findings.filter((f) => f.key === item.computed) : [],
    }),
  );
  return { version: CATALOGUE_VERSION, items };
}
