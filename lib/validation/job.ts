import { z } from "zod";

/** A homeowner's dispute of a delivered report. */
export const disputeSchema = z.object({
  reason: z
    .string()
    .trim()
    .min(20, "Say what is wrong with the report (at least 20 characters)")
    .max(4000, "At most 4,000 characters"),
});

/** An admin's settlement of a dispute; a part refund names its amount in minor units. */
export const settlementSchema = z.discriminatedUnion("resolution", [
  z.object({ resolution: z.literal("release"), note: z.string().trim().max(4000).optional() }),
  z.object({
    resolution: z.literal("partial_refund"),
    refundMinor: z.coerce
      .number({ error: "Enter the amount to refund" })
      .int("Whole minor units (pence), please")
      .positive("More than nothing"),
    note: z.string().trim().max(4000).optional(),
  }),
  z.object({ resolution: z.literal("full_refund"), note: z.string().trim().max(4000).optional() }),
]);
