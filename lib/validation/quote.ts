import { z } from "@/lib/zod";

export const quoteSchema = z.object({
  pricePounds: z.coerce
    .number({ error: "Enter a price" })
    .min(10, "At least 10")
    .max(5000, "At most 5,000: split larger work into a site visit and a follow-up"),
  turnaroundDays: z.coerce
    .number({ error: "Enter a number of days" })
    .int("Whole days")
    .min(1, "At least 1 day")
    .max(60, "At most 60 days"),
  scopeMd: z
    .string()
    .trim()
    .min(20, "Say what the review covers (at least 20 characters)")
    .max(8000),
  proposedVisitDate: z.iso.date().optional().or(z.literal("")),
});
export type QuoteInput = z.input<typeof quoteSchema>;

export const declineSchema = z.object({ reason: z.string().trim().max(1000).optional() });
