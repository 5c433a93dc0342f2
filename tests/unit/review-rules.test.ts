import { describe, expect, it } from "vitest";
import { checkDelivery, type DeliveryInput } from "@/lib/checklist/delivery";
import { numberPins, onImage } from "@/lib/checklist/pins";
import { CATALOGUE } from "@/lib/checklist/catalogue";
import { ITEM_TITLES, itemTitle } from "@/lib/checklist/item-titles";
import { PHOTO_GUIDANCE } from "@/lib/checklist/photo-guidance";
import { PHOTO_TAGS } from "@/lib/validation/request";
import { answerSchema, reportDraftSchema } from "@/lib/validation/review";
import type { Verdict } from "@/lib/types/review";

// The delivery rules are the product's own (issue 12, "The report"); nothing outside to check against.
const keys = ["relief-valve", "vessel-size", "freeze"];
const allSound: Record<string, Verdict> = {
  "relief-valve": "sound",
  "vessel-size": "sound",
  freeze: "sound",
};
const ready: DeliveryInput = {
  itemKeys: keys,
  verdicts: allSound,
  outcome: "ready_to_commission",
  summaryMd: "All sound.",
  requiredChanges: [],
};
const codes = (i: DeliveryInput) => checkDelivery(i).problems.map((p) => p.code);

describe("the delivery rules", () => {
  it("lets a complete, consistent report through", () => {
    expect(checkDelivery(ready)).toEqual({ ok: true, problems: [], warnings: [] });
  });

  it("refuses unanswered items and names each one in words", () => {
    const c = checkDelivery({ ...ready, verdicts: { "relief-valve": "sound", freeze: null } });
    expect(c.ok).toBe(false);
    expect(c.problems).toHaveLength(1);
    expect(c.problems[0]!.code).toBe("unanswered");
    expect(c.problems[0]!.itemKeys).toEqual(["vessel-size", "freeze"]);
    expect(c.problems[0]!.message).toBe(
      "2 items have no verdict yet: Expansion vessel size, Freeze protection.",
    );
    expect(c.problems[0]!.message).not.toMatch(/vessel-size/);
  });

  it("refuses an unsafe item with the outcome ready to commission, and allows it with the others", () => {
    const unsafe = { ...allSound, "vessel-size": "unsafe" as const };
    const c = checkDelivery({ ...ready, verdicts: unsafe });
    expect(c.problems.map((p) => p.code)).toEqual(["unsafe_but_ready"]);
    expect(c.problems[0]!.itemKeys).toEqual(["vessel-size"]);
    const change = [{ text: "Fit an 18 L vessel.", itemKeys: ["vessel-size"] }];
    for (const outcome of ["fix_before_filling", "do_not_proceed"] as const)
      expect(
        checkDelivery({ ...ready, verdicts: unsafe, outcome, requiredChanges: change }).ok,
      ).toBe(true);
  });

  it("needs an outcome and a summary", () => {
    expect(codes({ ...ready, outcome: null, summaryMd: "  \n" })).toEqual([
      "no_outcome",
      "no_summary",
    ]);
  });

  it("needs at least one required change for fix before filling and do not proceed", () => {
    expect(codes({ ...ready, outcome: "fix_before_filling" })).toEqual(["no_required_changes"]);
    expect(codes({ ...ready, outcome: "do_not_proceed" })).toEqual(["no_required_changes"]);
  });

  it("needs each required change to say something and name an item of this checklist", () => {
    expect(
      codes({
        ...ready,
        outcome: "fix_before_filling",
        requiredChanges: [
          { text: " ", itemKeys: ["freeze"] },
          { text: "Lag the pipe.", itemKeys: [] },
          { text: "Fit a vent.", itemKeys: ["high-point-vent"] },
        ],
      }),
    ).toEqual(["change_without_text", "change_without_items", "change_unknown_item"]);
  });

  it("warns, without blocking, when an unsafe or concern item is in no required change", () => {
    const c = checkDelivery({
      ...ready,
      outcome: "fix_before_filling",
      verdicts: { ...allSound, freeze: "concern", "vessel-size": "unsafe" },
      requiredChanges: [{ text: "Fit an 18 L vessel.", itemKeys: ["vessel-size"] }],
    });
    expect(c.ok).toBe(true);
    expect(c.warnings).toHaveLength(1);
    expect(c.warnings[0]!.itemKeys).toEqual(["freeze"]);
  });

  it("counts not applicable and could not verify as answered", () => {
    expect(
      checkDelivery({
        ...ready,
        verdicts: {
          "relief-valve": "not_applicable",
          "vessel-size": "could_not_verify",
          freeze: "sound",
        },
      }).ok,
    ).toBe(true);
  });
});

describe("pins", () => {
  it("are numbered once over the report, in checklist order", () => {
    const pins = {
      freeze: [{ attachmentId: 1, x: 0.1, y: 0.1, label: "glycol" }],
      "relief-valve": [
        { attachmentId: 1, x: 0.5, y: 0.5, label: "valve" },
        { attachmentId: 2, x: 0, y: 1, label: "gauge" },
      ],
    } as Record<string, { attachmentId: number; x: number; y: number; label: string }[]>;
    const n = numberPins(keys, (k) => pins[k]);
    expect(n.map((p) => [p.n, p.itemKey, p.label])).toEqual([
      [1, "relief-valve", "valve"],
      [2, "relief-valve", "gauge"],
      [3, "freeze", "glycol"],
    ]);
  });

  it("lie on the image only between its edges", () => {
    expect(onImage(0, 1)).toBe(true);
    expect(onImage(1.01, 0.5)).toBe(false);
    expect(onImage(0.5, -0.001)).toBe(false);
    expect(onImage(Number.NaN, 0.5)).toBe(false);
  });
});

describe("the review's input schemas", () => {
  it("refuse a verdict not in the list, a pin off the image and a note over the limit", () => {
    const r = answerSchema.safeParse({
      verdict: "fine",
      noteMd: "x".repeat(8001),
      pins: [{ attachmentId: 3, x: 1.2, y: 0.5, label: "here" }],
      expectedVersion: 0,
    });
    expect(r.success).toBe(false);
    const paths = r.error!.issues.map((i) => `${i.path.join(".")}: ${i.message}`);
    expect(paths).toEqual([
      "verdict: Choose sound, concern, unsafe, not applicable or could not verify",
      "noteMd: A note is at most 8,000 characters",
      "pins.0.x: The pin is outside the image",
    ]);
  });

  it("take a partial save (a verdict alone) and require the version it was based on", () => {
    expect(answerSchema.safeParse({ verdict: "sound", expectedVersion: 2 }).success).toBe(true);
    expect(answerSchema.safeParse({ verdict: "sound" }).success).toBe(false);
    expect(reportDraftSchema.safeParse({ outcome: "maybe", expectedVersion: 0 }).success).toBe(
      false,
    );
  });
});

describe("titles and photo guidance", () => {
  it("give every catalogue item a title, and guidance only for catalogue items, with known areas", () => {
    for (const item of CATALOGUE) expect(ITEM_TITLES[item.key], item.key).toBeTruthy();
    const keys = new Set(CATALOGUE.map((i) => i.key));
    for (const [key, g] of Object.entries(PHOTO_GUIDANCE)) {
      expect(keys.has(key), key).toBe(true);
      expect(g.photo.length).toBeGreaterThan(10);
      for (const a of g.areas) expect(PHOTO_TAGS).toContain(a);
    }
    expect(itemTitle("some-new-item")).toBe("Some new item");
  });
});
