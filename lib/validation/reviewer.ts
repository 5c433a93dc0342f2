import { z } from "@/lib/zod";
import { idSchema } from "./id";
import { REGION_IDS } from "@/lib/regions";
import { CREDENTIAL_KINDS } from "@/lib/credentials";

export const SPECIALISMS = [
  { id: "flat_plate", label: "Flat-plate collectors" },
  { id: "evacuated_tube", label: "Evacuated-tube collectors" },
  { id: "unvented_cylinders", label: "Unvented cylinders" },
  { id: "solid_fuel", label: "Solid-fuel coupling" },
  { id: "heat_pumps", label: "Heat-pump integration" },
  { id: "drainback", label: "Drainback systems" },
] as const;

const optionalNumber = (schema: z.ZodNumber) =>
  z.preprocess(
    (v) =>
      v === "" || v === null || v === undefined || (typeof v === "number" && Number.isNaN(v))
        ? undefined
        : Number(v),
    schema.optional(),
  );

export const reviewerProfileSchema = z
  .object({
    tradingName: z.string().trim().min(2, "Enter your trading name").max(120),
    bio: z.string().trim().min(20, "Write at least a sentence or two (20 characters)").max(4000),
    yearsInTrade: z.coerce
      .number({ error: "Enter a number of years" })
      .int("Whole years")
      .min(0)
      .max(70, "At most 70 years"),
    specialisms: z
      .array(z.enum(SPECIALISMS.map((s) => s.id) as [string, ...string[]]))
      .max(SPECIALISMS.length),
    region: z.enum(REGION_IDS, { error: "Choose a region" }),
    centreLat: optionalNumber(z.number().min(-90).max(90)),
    centreLng: optionalNumber(z.number().min(-180).max(180)),
    travelRadiusKm: optionalNumber(z.number().int().min(1).max(500)),
    hourlyRatePounds: optionalNumber(z.number().min(0).max(1000, "At most 1000 per hour")),
  })
  .refine((v) => (v.centreLat === undefined) === (v.centreLng === undefined), {
    path: ["centreLng"],
    message: "Give both latitude and longitude, or neither",
  });
export type ReviewerProfileInput = z.input<typeof reviewerProfileSchema>;

export const credentialSchema = z.object({
  kind: z.enum(CREDENTIAL_KINDS, { error: "Choose the kind of credential" }),
  issuer: z.string().trim().min(2, "Who issued it?").max(160),
  number: z.string().trim().min(2, "Enter the certificate or policy number").max(80),
  expiresOn: z.iso.date({ error: "Enter the expiry date" }),
});
export type CredentialInput = z.input<typeof credentialSchema>;

export const credentialDecisionSchema = z.discriminatedUnion("decision", [
  z.object({
    decision: z.literal("verify"),
    credentialId: idSchema,
    expiresOn: z.iso.date({ error: "Enter the expiry date" }),
  }),
  z.object({
    decision: z.literal("reject"),
    credentialId: idSchema,
    reason: z
      .string()
      .trim()
      .min(5, "Give the reviewer a reason (at least 5 characters)")
      .max(2000),
  }),
]);
export type CredentialDecisionInput = z.input<typeof credentialDecisionSchema>;

export const suspensionSchema = z.object({
  reviewerId: idSchema,
  suspend: z.boolean(),
  reason: z.string().trim().min(5, "Give a reason (at least 5 characters)").max(2000),
});
