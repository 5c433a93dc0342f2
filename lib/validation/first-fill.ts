import { z } from "@/lib/zod";

/**
 * The first-fill record as typed by the homeowner. Bounds are what a domestic solar loop can
 * physically show (they catch a slip such as a 40 bar fill or a 120 % glycol reading), not a
 * judgement of the design: lib/calc/first-fill.ts compares the values with the design.
 */
const blankToUndefined = (v: unknown) =>
  v === "" || v === undefined || v === null ? undefined : typeof v === "string" ? v.trim() : v;

const measured = (min: number, max: number, unit: string, what: string, why: string) =>
  z.coerce
    .number({ error: `Enter the ${what} as a number (${unit})` })
    .min(min, `At least ${min} ${unit}`)
    .max(max, `At most ${max} ${unit}: ${why}`);

const optional = <S extends z.ZodType>(s: S) => z.preprocess(blankToUndefined, s.optional());
const required = <S extends z.ZodType>(s: S, message: string) =>
  z.preprocess(
    blankToUndefined,
    z
      .any()
      .refine((v) => v !== undefined, message)
      .pipe(s),
  );

export const PRESSURE_MAX_BAR = 10;

export const firstFillSchema = z
  .object({
    coldFillBar: required(
      measured(
        0.1,
        PRESSURE_MAX_BAR,
        "bar",
        "cold fill pressure",
        "a domestic solar loop's relief valve opens well below that",
      ),
      "Enter the cold fill pressure read on the pump station's gauge",
    ),
    prechargeBar: required(
      measured(
        0.1,
        PRESSURE_MAX_BAR,
        "bar",
        "pre-charge",
        "no domestic solar vessel is pre-charged that high",
      ),
      "Enter the pre-charge measured at the vessel's gas valve before filling",
    ),
    hotBar: optional(
      measured(
        0.1,
        PRESSURE_MAX_BAR,
        "bar",
        "hot pressure",
        "a domestic solar loop's relief valve opens well below that",
      ),
    ),
    hotTempC: optional(
      measured(0, 150, "°C", "temperature", "check the reading on the controller"),
    ),
    glycolPercentMass: optional(
      measured(0, 100, "% by mass", "glycol concentration", "a mix cannot be more than all glycol"),
    ),
    freezePointC: optional(
      z.coerce
        .number({ error: "Enter the freeze point as a number (°C)" })
        .min(-60, "At least −60 °C: no solar fluid is mixed that strong")
        .max(0, "At most 0 °C: plain water freezes at 0 °C"),
    ),
    flowLph: optional(
      measured(0, 2000, "L/h", "flow rate", "far more than a domestic solar loop carries"),
    ),
    notes: z.preprocess(
      (v) => (typeof v === "string" ? v.trim() : v === undefined || v === null ? "" : v),
      z.string().max(4000, "Notes are at most 4,000 characters"),
    ),
  })
  .superRefine((v, ctx) => {
    if (v.glycolPercentMass === undefined && v.freezePointC === undefined)
      ctx.addIssue({
        code: "custom",
        path: ["glycolPercentMass"],
        message: "Enter the glycol concentration or the freeze point the refractometer shows",
      });
    if (v.hotBar !== undefined && v.hotTempC === undefined)
      ctx.addIssue({
        code: "custom",
        path: ["hotTempC"],
        message: "Say at what temperature the hot pressure was read",
      });
    if (v.hotTempC !== undefined && v.hotBar === undefined)
      ctx.addIssue({
        code: "custom",
        path: ["hotBar"],
        message: "Enter the hot pressure read at that temperature",
      });
  });
export type FirstFillInput = z.output<typeof firstFillSchema>;

export const countersignSchema = z.object({
  comment: z.preprocess(
    (v) => (typeof v === "string" ? v.trim() : v === undefined || v === null ? "" : v),
    z.string().max(2000, "A comment is at most 2,000 characters"),
  ),
});
