import { z } from "@/lib/zod";
import { idSchema } from "./id";
import { OUTCOMES, VERDICTS } from "@/lib/types/review";

/** Longest note on one checklist item, and longest summary. */
export const NOTE_MAX = 8000;
export const SUMMARY_MAX = 8000;
export const PIN_LABEL_MAX = 60;
export const PINS_PER_ITEM_MAX = 20;
export const REQUIRED_CHANGES_MAX = 30;

const thousands = (n: number) => n.toLocaleString("en-GB");

const verdict = z.enum(VERDICTS, {
  error: "Choose sound, concern, unsafe, not applicable or could not verify",
});
const outcome = z.enum(OUTCOMES, {
  error: "Choose ready to commission, fix before filling or do not proceed",
});
const version = z.number({ error: "Say which saved version this change is based on" }).int().min(0);
const itemKey = z.string().trim().min(1).max(64);

export const pinSchema = z.object({
  attachmentId: z.number({ error: "Say which image the pin is on" }).int().positive(),
  x: z
    .number({ error: "The pin needs a position" })
    .min(0, "The pin is outside the image")
    .max(1, "The pin is outside the image"),
  y: z
    .number({ error: "The pin needs a position" })
    .min(0, "The pin is outside the image")
    .max(1, "The pin is outside the image"),
  label: z
    .string({ error: "Give the pin a short label" })
    .trim()
    .min(1, "Give the pin a short label")
    .max(PIN_LABEL_MAX, `A pin's label is at most ${PIN_LABEL_MAX} characters`),
});

/** One autosave of a checklist answer: any of the three fields, and the version it was based on. */
export const answerSchema = z.object({
  verdict: verdict.nullable().optional(),
  noteMd: z
    .string()
    .max(NOTE_MAX, `A note is at most ${thousands(NOTE_MAX)} characters`)
    .optional(),
  pins: z
    .array(pinSchema)
    .max(PINS_PER_ITEM_MAX, `At most ${PINS_PER_ITEM_MAX} pins on one item`)
    .optional(),
  expectedVersion: version,
});
export type AnswerInput = z.infer<typeof answerSchema>;

export const requiredChangeSchema = z.object({
  text: z.string().trim().max(500, "A required change is at most 500 characters"),
  itemKeys: z.array(itemKey).max(20),
});

/** One autosave of the report's own fields. */
export const reportDraftSchema = z.object({
  outcome: outcome.nullable().optional(),
  summaryMd: z
    .string()
    .max(SUMMARY_MAX, `The summary is at most ${thousands(SUMMARY_MAX)} characters`)
    .optional(),
  requiredChanges: z
    .array(requiredChangeSchema)
    .max(REQUIRED_CHANGES_MAX, `At most ${REQUIRED_CHANGES_MAX} required changes`)
    .optional(),
  expectedVersion: version,
});
export type ReportDraftInput = z.infer<typeof reportDraftSchema>;

export const addendumSchema = z.object({
  bodyMd: z
    .string()
    .trim()
    .min(5, "Write the addendum (at least 5 characters)")
    .max(NOTE_MAX, `An addendum is at most ${thousands(NOTE_MAX)} characters`),
});

export const itemRequestSchema = z.object({
  itemKey,
  kind: z.enum(["photo", "fact"], { error: "Ask for a photo or a fact" }),
  questionMd: z
    .string()
    .trim()
    .min(5, "Say what you need (at least 5 characters)")
    .max(2000, "A question is at most 2,000 characters"),
});

export const itemAnswerSchema = z
  .object({
    answerMd: z.string().trim().max(4000, "An answer is at most 4,000 characters").default(""),
    attachmentId: z.preprocess(
      (v) => (v === "" || v === undefined || v === null ? undefined : v),
      idSchema.optional(),
    ),
  })
  .refine((v) => v.answerMd.length > 0 || v.attachmentId !== undefined, {
    path: ["answerMd"],
    message: "Write an answer or choose a photo",
  });

export const photoItemsSchema = z.object({
  itemKeys: z.array(itemKey).max(40),
});

export const ratingSchema = z.object({
  stars: z.coerce
    .number({ error: "Choose 1 to 5 stars" })
    .int("Choose 1 to 5 stars")
    .min(1, "Choose 1 to 5 stars")
    .max(5, "Choose 1 to 5 stars"),
  comment: z.string().trim().max(2000, "A comment is at most 2,000 characters").default(""),
});

export const ratingReplySchema = z.object({
  replyMd: z
    .string()
    .trim()
    .min(2, "Write your reply")
    .max(2000, "A reply is at most 2,000 characters"),
});
