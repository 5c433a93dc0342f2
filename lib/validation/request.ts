import { z } from "@/lib/zod";

const pounds = z.coerce
  .number({ error: "Enter an amount" })
  .min(1, "At least 1")
  .max(5000, "At most 5,000 for a review");

export const requestSchema = z
  .object({
    kind: z.enum(["remote_check", "site_visit"], { error: "Choose the service" }),
    questions: z
      .string()
      .trim()
      .min(10, "Say what you want answered (at least 10 characters)")
      .max(4000),
    budgetMinPounds: pounds,
    budgetMaxPounds: pounds,
    windowStart: z.iso.date().optional().or(z.literal("")),
    windowEnd: z.iso.date().optional().or(z.literal("")),
    accessNotes: z.string().trim().max(2000).optional(),
    /**
     * The safety gate: set when the homeowner has read the loop check's stop findings and
     * acknowledged the loop must not be filled or run until they are resolved.
     */
    acknowledgeStop: z.preprocess(
      (v) => v === "on" || v === "true" || v === true,
      z.boolean().default(false),
    ),
    /** Optional site centre for distances on the board; no outside geocoder is used. */
    siteLat: z.preprocess(
      (v) => (v === "" || v === undefined ? undefined : v),
      z.coerce.number().min(-90).max(90).optional(),
    ),
    /** The nearest town's gazetteer id (lib/towns.ts); the point is derived from it. */
    siteTownId: z.preprocess(
      (v) => (v === "" || v === undefined ? undefined : v),
      z.coerce.number({ error: "Choose a town from the list" }).int().positive().optional(),
    ),
    siteLng: z.preprocess(
      (v) => (v === "" || v === undefined ? undefined : v),
      z.coerce.number().min(-180).max(180).optional(),
    ),
  })
  .refine((r) => (r.siteLat === undefined) === (r.siteLng === undefined), {
    path: ["siteLng"],
    message: "Give both latitude and longitude, or neither",
  })
  .refine((r) => r.budgetMaxPounds >= r.budgetMinPounds, {
    path: ["budgetMaxPounds"],
    message: "The top of the range must be at least the bottom",
  })
  .superRefine((r, ctx) => {
    if (r.kind !== "site_visit") return;
    if (!r.windowStart)
      ctx.addIssue({
        code: "custom",
        path: ["windowStart"],
        message: "Give the first date a visit could happen",
      });
    if (!r.windowEnd)
      ctx.addIssue({
        code: "custom",
        path: ["windowEnd"],
        message: "Give the last date a visit could happen",
      });
    if (r.windowStart && r.windowEnd && r.windowEnd < r.windowStart)
      ctx.addIssue({
        code: "custom",
        path: ["windowEnd"],
        message: "The window must end after it starts",
      });
    const today = new Date().toISOString().slice(0, 10);
    if (r.windowStart && r.windowStart < today)
      ctx.addIssue({
        code: "custom",
        path: ["windowStart"],
        message: "The window cannot start in the past",
      });
  });
export type RequestInput = z.input<typeof requestSchema>;

export const projectTitleSchema = z.object({
  title: z.string().trim().min(3, "Give the project a name (at least 3 characters)").max(120),
});

export const PHOTO_TAGS = [
  "collector",
  "roof",
  "pump_station",
  "vessel",
  "cylinder",
  "pipework",
  "other",
] as const;
export const photoDetailsSchema = z.object({
  caption: z.string().trim().max(200).optional(),
  tag: z.enum(PHOTO_TAGS).default("other"),
});
