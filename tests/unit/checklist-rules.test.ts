/**
 * The hazard catalogue's own rules, stated one by one (the catalogue is the product's data; the
 * trade facts behind each item are "common practice" or the standard named in its `basis`).
 * Written so that a blanked word, a dropped item, a moved `applies` rule or a wrong finding key
 * fails a test (mutation testing: tests/mutation/survivors.md).
 */
import { describe, expect, it } from "vitest";
import { buildChecklist } from "@/lib/checklist/build";
import { CATALOGUE, CATALOGUE_VERSION, SECTIONS } from "@/lib/checklist/catalogue";
import { ITEM_TITLES, itemTitle } from "@/lib/checklist/item-titles";
import {
  PHOTO_GUIDANCE,
  ROOF_PHOTO_CAUTION,
  photoGuidanceFor,
} from "@/lib/checklist/photo-guidance";
import { checkDelivery, type DeliveryInput } from "@/lib/checklist/delivery";
import { numberPins, onImage } from "@/lib/checklist/pins";
import {
  OUTCOME_HINTS,
  OUTCOME_LABELS,
  VERDICT_HINTS,
  VERDICT_LABELS,
} from "@/lib/checklist/verdicts";
import { demoSystem } from "@/lib/calc/demo-system";
import { systemSchema } from "@/lib/validation/system";
import { PHOTO_TAGS } from "@/lib/validation/request";

const byKey = (key: string) => CATALOGUE.find((i) => i.key === key)!;

describe("the catalogue's data", () => {
  it("has its version and its ten sections, in the order the checklist shows them", () => {
    expect(CATALOGUE_VERSION).toBe("2026-12.2");
    expect(SECTIONS).toEqual([
      "Roof and access",
      "Collector and hot zone",
      "Pressure and expansion",
      "Temperature ratings",
      "Fluid and freeze",
      "Circulation and controls",
      "Cylinder and hot-water safety",
      "Discharge and drainage",
      "Electrical and bonding",
      "Commissioning",
    ]);
    // Items are grouped by section, in section order.
    const order = CATALOGUE.map((i) => SECTIONS.indexOf(i.section));
    expect(order.every((s, n) => s >= 0 && (n === 0 || s >= order[n - 1]!))).toBe(true);
  });

  it("gives every item words to show: a check, a basis, the rule in words, and a photo line where one is asked for", () => {
    expect(CATALOGUE).toHaveLength(43);
    for (const item of CATALOGUE) {
      expect(item.key, item.key).toMatch(/^[a-z]+(-[a-z]+)*$/);
      expect(item.check.length, item.key).toBeGreaterThan(30);
      expect(item.check.trim(), item.key).toBe(item.check);
      expect(item.basis.length, item.key).toBeGreaterThan(5);
      if (item.photo !== undefined) expect(item.photo.length, item.key).toBeGreaterThan(20);
      // An item that always applies says "always"; a conditional one says when, in words.
      if (item.applies === "always") expect(item.appliesWhen, item.key).toBe("always");
      else expect(item.appliesWhen.length, item.key).toBeGreaterThan(15);
    }
  });

  it("says in words when each conditional item applies", () => {
    const conditional = CATALOGUE.filter((i) => i.applies !== "always").map((i) => [
      i.key,
      i.appliesWhen,
    ]);
    expect(conditional).toEqual([
      ["high-point-vent", "a vent is fitted at the high point"],
      ["unvented", "the cylinder is unvented"],
      ["unvented-cutout", "the cylinder is unvented"],
      ["other-sources", "more than one heat source feeds the cylinder"],
    ]);
  });

  it("backs each item with the loop-check finding that measures it", () => {
    const computed = Object.fromEntries(
      CATALOGUE.filter((i) => i.computed).map((i) => [i.key, i.computed]),
    );
    expect(computed).toEqual({
      orientation: "collector-output",
      "hot-zone-joints": "stagnation",
      "hot-zone-insulation": "stagnation",
      "high-point-vent": "stagnation",
      "steam-reach": "steam-reach",
      "vessel-rating": "vessel-rating",
      "vessel-size": "vessel-size",
      "vessel-precharge": "vessel-precharge",
      "vessel-cooling": "vessel-rating",
      "relief-valve": "relief-margin",
      "relief-temperature": "relief-margin",
      "fill-pressure": "fill-pressure",
      "night-pressure": "fill-pressure",
      "pump-rating": "component-ratings",
      "component-ratings": "component-ratings",
      "fluid-type": "fluid",
      freeze: "freeze",
      "fluid-testing": "fluid",
      "fluid-volume": "fluid-volume",
      "flow-rate": "flow-rate",
      "pipe-sizing": "hydraulics",
      "air-separation": "component-ratings",
      "pipe-insulation": "pipe-insulation",
      "coil-connection": "coil-position",
      "store-size": "store-size",
      unvented: "unvented",
      "unvented-cutout": "unvented",
      scald: "scald",
      "first-run": "first-fill",
    });
  });

  it("asks for a photo of the items a reviewer can judge from one", () => {
    expect(CATALOGUE.filter((i) => i.photo).map((i) => i.key)).toEqual([
      "roof-fixing",
      "hot-zone-joints",
      "hot-zone-insulation",
      "high-point-vent",
      "steam-reach",
      "vessel-rating",
      "vessel-cooling",
      "relief-valve",
      "return-side",
      "relief-temperature",
      "night-pressure",
      "pump-rating",
      "fluid-type",
      "air-separation",
      "pipe-insulation",
      "coil-connection",
      "heat-trap",
      "unvented",
      "unvented-cutout",
      "scald",
      "relief-discharge",
    ]);
  });

  it("keeps the safety wording of the items that can hurt someone (common practice)", () => {
    expect(byKey("roof-access").check).toMatch(/scaffold or tower with edge protection/);
    expect(byKey("hot-zone-joints").check).toMatch(/never soft solder/);
    expect(byKey("unvented-cutout").section).toBe("Cylinder and hot-water safety");
    expect(byKey("bonding").section).toBe("Electrical and bonding");
  });
});

describe("which items a system gets", () => {
  const keysFor = (edit: (s: typeof demoSystem) => void) => {
    const s = structuredClone(demoSystem);
    edit(s);
    return buildChecklist(systemSchema.parse(s), []).items.map((i) => i.key);
  };

  it("the high-point vent item only when a vent is fitted", () => {
    expect(keysFor((s) => (s.collectors.highPointVent = "none"))).not.toContain("high-point-vent");
    expect(keysFor((s) => (s.collectors.highPointVent = "manual"))).toContain("high-point-vent");
  });

  it("the other-sources item only for a second, different heat source: two solar coils are one source", () => {
    const twoSolar = keysFor((s) => {
      s.cylinder.coils = [
        { heatSource: "solar", position: "bottom", contentL: 4 },
        { heatSource: "solar", position: "top", contentL: 3 },
      ];
    });
    expect(twoSolar).not.toContain("other-sources");
    const solarAndBoiler = keysFor((s) => {
      s.cylinder.coils = [
        { heatSource: "solar", position: "bottom", contentL: 4 },
        { heatSource: "solid_fuel", position: "top", contentL: 3 },
      ];
    });
    expect(solarAndBoiler).toContain("other-sources");
  });

  it("every always-item, in catalogue order, and items without a computed name get no evidence", () => {
    const s = systemSchema.parse(demoSystem);
    const finding = {
      key: "stagnation",
      level: "note",
      title: "t",
      values: [],
      source: "s",
      how: "h",
      action: "a",
    } as unknown as Parameters<typeof buildChecklist>[1][number];
    const list = buildChecklist(s, [finding]);
    const always = CATALOGUE.filter((i) => i.applies === "always").map((i) => i.key);
    expect(list.items.map((i) => i.key).filter((k) => always.includes(k))).toEqual(always);
    for (const item of list.items) {
      expect("applies" in item, item.key).toBe(false);
      expect(item.evidence, item.key).toEqual(item.computed === "stagnation" ? [finding] : []);
    }
  });
});

describe("titles", () => {
  it("every catalogue key has a title in words, and no title is left without an item", () => {
    expect(Object.keys(ITEM_TITLES).sort()).toEqual(CATALOGUE.map((i) => i.key).sort());
    for (const [key, title] of Object.entries(ITEM_TITLES)) {
      expect(title.length, key).toBeGreaterThan(4);
      expect(title[0], key).toBe(title[0]!.toUpperCase());
    }
    expect(itemTitle("vessel-size")).toBe("Expansion vessel size");
    expect(itemTitle("roof-access")).toBe("Safe roof access");
    expect(itemTitle("first-run")).toBe("First run");
  });

  it("an unknown key is shown as words, never as the key", () => {
    expect(itemTitle("solar-loop_extra--item")).toBe("Solar loop extra item");
    expect(itemTitle("  -lone-  ")).toBe("Lone");
    expect(itemTitle("x")).toBe("X");
    expect(itemTitle("--")).toBe("Checklist item");
    expect(itemTitle("")).toBe("Checklist item");
  });
});

describe("photo guidance", () => {
  it("has a line for exactly the items that ask for a photo or that a photo shows, with known areas", () => {
    const keys = new Set(CATALOGUE.map((i) => i.key));
    expect(Object.keys(PHOTO_GUIDANCE)).toHaveLength(37);
    for (const [key, g] of Object.entries(PHOTO_GUIDANCE)) {
      expect(keys.has(key), key).toBe(true);
      expect(g.photo.length, key).toBeGreaterThan(25);
      expect(g.areas.length, key).toBeGreaterThan(0);
      for (const a of g.areas) expect(PHOTO_TAGS, key).toContain(a);
    }
  });

  it("marks exactly the photos taken at the collector, and says never from the roof", () => {
    expect(
      Object.entries(PHOTO_GUIDANCE)
        .filter(([, g]) => g.fromRoof)
        .map(([k]) => k),
    ).toEqual(["roof-fixing", "hot-zone-joints", "sensor", "pipe-insulation"]);
    expect(ROOF_PHOTO_CAUTION).toBe(
      "Take roof and collector photos only from the ground, a window, the loft or a scaffold with edge protection — never from a ladder on the roof or by walking on it. Photos of the parts before they go up are just as useful.",
    );
  });

  it("names the areas a photo of each item is likely found in", () => {
    expect(photoGuidanceFor("vessel-rating")?.areas).toEqual(["vessel"]);
    expect(photoGuidanceFor("roof-fixing")?.areas).toEqual(["roof", "collector"]);
    expect(photoGuidanceFor("steam-reach")?.areas).toEqual(["pipework", "pump_station"]);
    expect(photoGuidanceFor("bonding")?.areas).toEqual(["cylinder", "pipework"]);
    expect(photoGuidanceFor("fluid-type")?.areas).toEqual(["other"]);
    expect(photoGuidanceFor("legionella")).toBeNull();
    expect(photoGuidanceFor("no-such-item")).toBeNull();
  });
});

describe("verdict and outcome words", () => {
  it("shows each verdict and outcome in words, with a hint", () => {
    expect(VERDICT_LABELS).toEqual({
      sound: "Sound",
      concern: "Concern",
      unsafe: "Unsafe",
      not_applicable: "Not applicable",
      could_not_verify: "Could not verify",
    });
    expect(OUTCOME_LABELS).toEqual({
      ready_to_commission: "Ready to commission",
      fix_before_filling: "Fix before filling",
      do_not_proceed: "Do not proceed",
    });
    expect(VERDICT_HINTS.unsafe).toBe("Must be put right before the loop is filled or run.");
    expect(OUTCOME_HINTS.do_not_proceed).toBe(
      "Serious problems: do not fill, run or go further until they are resolved.",
    );
    for (const hint of [...Object.values(VERDICT_HINTS), ...Object.values(OUTCOME_HINTS)])
      expect(hint).toMatch(/^[A-Z].{20,}\.$/);
  });
});

describe("the delivery messages, word for word", () => {
  const base: DeliveryInput = {
    itemKeys: ["relief-valve", "vessel-size"],
    verdicts: { "relief-valve": "sound", "vessel-size": "sound" },
    outcome: "ready_to_commission",
    summaryMd: "Fine.",
    requiredChanges: [],
  };

  it("one unanswered item, said in the singular", () => {
    const c = checkDelivery({ ...base, verdicts: { "relief-valve": "sound" } });
    expect(c.problems).toEqual([
      {
        code: "unanswered",
        message: "1 item has no verdict yet: Expansion vessel size.",
        itemKeys: ["vessel-size"],
      },
    ]);
  });

  it("no outcome and no summary", () => {
    const c = checkDelivery({ ...base, outcome: null, summaryMd: " \t" });
    expect(c.problems).toEqual([
      { code: "no_outcome", message: "Choose the overall outcome.", itemKeys: [] },
      { code: "no_summary", message: "Write a summary for the homeowner.", itemKeys: [] },
    ]);
  });

  it("unsafe items with ready to commission, singular and plural", () => {
    const one = checkDelivery({ ...base, verdicts: { ...base.verdicts, "vessel-size": "unsafe" } });
    expect(one.problems).toEqual([
      {
        code: "unsafe_but_ready",
        message:
          "Expansion vessel size is marked unsafe, so the outcome cannot be “Ready to commission”.",
        itemKeys: ["vessel-size"],
      },
    ]);
    const two = checkDelivery({
      ...base,
      verdicts: { "relief-valve": "unsafe", "vessel-size": "unsafe" },
    });
    expect(two.problems[0]!.message).toBe(
      "Relief valve, Expansion vessel size are marked unsafe, so the outcome cannot be “Ready to commission”.",
    );
    // A concern is not unsafe: ready to commission stays possible (with a warning).
    const concern = checkDelivery({
      ...base,
      verdicts: { ...base.verdicts, "vessel-size": "concern" },
    });
    expect(concern.ok).toBe(true);
    expect(concern.warnings).toEqual([
      {
        code: "change_without_items",
        message: "No required change mentions Expansion vessel size, marked unsafe or a concern.",
        itemKeys: ["vessel-size"],
      },
    ]);
  });

  it("an outcome that needs changes, without any", () => {
    for (const [outcome, words] of [
      ["fix_before_filling", "Fix before filling"],
      ["do_not_proceed", "Do not proceed"],
    ] as const)
      expect(checkDelivery({ ...base, outcome }).problems).toEqual([
        {
          code: "no_required_changes",
          message: `List at least one required change for “${words}”.`,
          itemKeys: [],
        },
      ]);
    // Ready to commission may have changes, or none.
    expect(
      checkDelivery({
        ...base,
        requiredChanges: [{ text: "Label the valve.", itemKeys: ["relief-valve"] }],
      }),
    ).toEqual({ ok: true, problems: [], warnings: [] });
  });

  it("each faulty required change, numbered from 1, with the unknown keys named", () => {
    const c = checkDelivery({
      ...base,
      outcome: "fix_before_filling",
      requiredChanges: [
        { text: "Fit a larger vessel.", itemKeys: ["vessel-size"] },
        { text: "", itemKeys: [] },
        { text: "Vent it.", itemKeys: ["vessel-size", "high-point-vent", "sensor"] },
      ],
    });
    expect(c.ok).toBe(false);
    expect(c.problems).toEqual([
      {
        code: "change_without_text",
        message: "Required change 2 says nothing yet: write what to do.",
        itemKeys: [],
      },
      {
        code: "change_without_items",
        message: "Required change 2 is not linked to a checklist item.",
        itemKeys: [],
      },
      {
        code: "change_unknown_item",
        message: "Required change 3 names an item that is not on this checklist.",
        itemKeys: ["high-point-vent", "sensor"],
      },
    ]);
    expect(c.warnings).toEqual([]);
  });

  it("a change that covers an unsafe item silences its warning; a sound item is never warned about", () => {
    const c = checkDelivery({
      ...base,
      outcome: "do_not_proceed",
      verdicts: { "relief-valve": "unsafe", "vessel-size": "sound" },
      requiredChanges: [{ text: "Replace the valve.", itemKeys: ["relief-valve"] }],
    });
    expect(c).toEqual({ ok: true, problems: [], warnings: [] });
  });
});

describe("pins", () => {
  it("an item without pins adds none, and numbering goes on across items", () => {
    const pin = (label: string) => ({ attachmentId: 7, x: 0.5, y: 0.5, label });
    const pins: Record<string, ReturnType<typeof pin>[]> = {
      a: [pin("one")],
      c: [pin("two"), pin("three")],
    };
    expect(numberPins(["a", "b", "c"], (k) => pins[k])).toEqual([
      { ...pin("one"), n: 1, itemKey: "a" },
      { ...pin("two"), n: 2, itemKey: "c" },
      { ...pin("three"), n: 3, itemKey: "c" },
    ]);
    expect(numberPins([], () => [pin("x")])).toEqual([]);
  });

  it("a point is on the image from edge to edge, both edges included", () => {
    expect(onImage(0, 0)).toBe(true);
    expect(onImage(1, 1)).toBe(true);
    expect(onImage(1, 0)).toBe(true);
    expect(onImage(0.5, 1.0001)).toBe(false);
    expect(onImage(-0.0001, 0.5)).toBe(false);
    expect(onImage(0.5, Number.POSITIVE_INFINITY)).toBe(false);
    expect(onImage(Number.NEGATIVE_INFINITY, 0.5)).toBe(false);
    expect(onImage(0.5, Number.NaN)).toBe(false);
  });
});
