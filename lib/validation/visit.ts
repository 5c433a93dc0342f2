import { z } from "zod";

/** A reviewer's proposed site-visit time, as a datetime-local input sends it. */
export const proposeVisitSchema = z.object({
  at: z
    .string({ error: "Pick a date and time" })
    .trim()
    .regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}$/, "Pick a date and time"),
  note: z.string().trim().max(1000, "At most 1,000 characters").optional(),
});

/** The homeowner's answer names the proposal they saw, so a moved visit is never confirmed blind. */
export const confirmVisitSchema = z.object({
  sequence: z.coerce.number().int().min(1),
});

export const askAnotherVisitSchema = confirmVisitSchema.extend({
  note: z
    .string({ error: "Say which days or times suit you" })
    .trim()
    .min(3, "Say which days or times suit you")
    .max(1000, "At most 1,000 characters"),
});
