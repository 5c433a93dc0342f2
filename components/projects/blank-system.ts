import type { SystemDraft } from "@/lib/validation/system";
import { blankSystem, type SystemFormValues } from "@/lib/validation/system-fields";

/**
 * What a new project's form starts from: choices pre-set to the common case, every measured
 * number left empty for the homeowner to fill in (the loop check never guesses a measurement).
 * Derived from the schema and its words in `lib/validation/system-fields.ts`.
 */
export const BLANK_SYSTEM: SystemFormValues = blankSystem();

/** The saved draft's sections over the blank ones. */
export function formDefaults(saved: SystemDraft): SystemFormValues {
  const out: Record<string, unknown> = { ...BLANK_SYSTEM };
  for (const [k, v] of Object.entries(saved)) if (v !== undefined && v !== null) out[k] = v;
  return out as SystemFormValues;
}
