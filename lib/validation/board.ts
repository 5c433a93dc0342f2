import { z } from "@/lib/zod";
import { REGION_IDS } from "@/lib/regions";
import { BOARD_FILTER_KEYS } from "@/lib/types/board";

const optionalNumber = (schema: z.ZodNumber) =>
  z.preprocess(
    (v) => (v === "" || v === undefined || v === null ? undefined : v),
    z.coerce.number().pipe(schema).optional(),
  );

/** Board filters as they appear in the URL and the JSON route's query string. */
export const boardQuerySchema = z
  .object({
    kind: z.enum(["remote_check", "site_visit"]).optional(),
    collectorType: z.enum(["flat_plate", "evacuated_tube"]).optional(),
    region: z.enum(REGION_IDS).optional(),
    budgetMin: optionalNumber(z.number().min(0).max(100_000)),
    budgetMax: optionalNumber(z.number().min(0).max(100_000)),
    postedWithinDays: optionalNumber(z.number().int().min(1).max(365)),
    withinKm: optionalNumber(z.number().min(1).max(1000)),
    sort: z.enum(["newest", "budget", "distance", "soonest"]).default("newest"),
    cursor: z
      .string()
      .regex(/^([\w.: -]+\|\d+|o:\d{1,6})$/, "Not a valid page cursor")
      .optional(),
    limit: optionalNumber(z.number().int().min(1).max(50)),
  })
  .refine(
    (q) => q.budgetMin === undefined || q.budgetMax === undefined || q.budgetMax >= q.budgetMin,
    {
      path: ["budgetMax"],
      message: "The top of the budget range must be at least the bottom",
    },
  );
export type BoardQuery = z.output<typeof boardQuerySchema>;

/** The filters a person sets on the board page: every field of the query but the paging ones. */
export const BOARD_FILTERS = BOARD_FILTER_KEYS;
type FilterKey = Exclude<keyof BoardQuery, "cursor" | "limit">;
type Listed = (typeof BOARD_FILTER_KEYS)[number];
// A field added to the schema (or a filter dropped from it) without the list is a type error.
const filtersMatchSchema: [FilterKey] extends [Listed]
  ? [Listed] extends [FilterKey]
    ? true
    : never
  : never = true;
void filtersMatchSchema;
