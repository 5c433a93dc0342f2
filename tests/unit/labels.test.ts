import { describe, expect, it } from "vitest";
import { demoSystem } from "@/lib/calc/demo-system";
import { runLoopCheck } from "@/lib/calc/loop-check";
import { systemSchema } from "@/lib/validation/system";
import { requestSchema } from "@/lib/validation/request";
import {
  formatDate,
  currencySymbol,
  labelFor,
  plural,
  REQUEST_STATUS_LABELS,
  SERVICE_LABELS,
} from "@/lib/labels";
import { plainSource } from "@/components/loop-check/plain-source";
import { levelCounts } from "@/components/loop-check/loop-check-results";

describe("one place for the words of every code", () => {
  it("names the two services as product.md does", () => {
    expect(SERVICE_LABELS).toEqual({
      remote_check: "Remote design check",
      site_visit: "Site visit",
    });
  });

  it("maps codes to words and never shows a raw key", () => {
    expect(labelFor(REQUEST_STATUS_LABELS, "awarded")).toBe("Quote accepted");
    expect(labelFor({}, "pump_station")).toBe("Pump station");
  });

  it("counts in words: 1 open request, 2 open requests", () => {
    expect(plural(1, "open request")).toBe("1 open request");
    expect(plural(2, "open request")).toBe("2 open requests");
  });

  it("takes the currency symbol from the configured ISO code (Intl, CLDR data)", () => {
    expect(currencySymbol("GBP")).toBe("£");
    expect(currencySymbol("EUR")).toBe("€");
    expect(currencySymbol("USD", "en-US")).toBe("$");
  });

  it("says 'At least 1 collector' (singular) in the collector count's message", () => {
    const bad = systemSchema.shape.collectors.safeParse({
      ...demoSystem.collectors,
      count: 0,
    });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues[0]!.message).toBe("At least 1 collector");
  });

  it("types no currency symbol into a message", () => {
    const r = requestSchema.safeParse({ budgetMinPounds: 0, budgetMaxPounds: 99_999 });
    const messages = r.success ? [] : r.error.issues.map((i) => i.message);
    expect(messages).toContain("At least 1");
    expect(messages.join(" ")).not.toMatch(/[£$€]/);
  });
});

describe("dates in the user's locale", () => {
  it("shows en-GB by default (day month year, CLDR), never mm/dd/yyyy", () => {
    expect(formatDate("2026-12-14")).toBe("14 Dec 2026");
    expect(formatDate("2026-12-14", "en-US")).toBe("Dec 14, 2026");
    expect(formatDate("2026-01-01 00:30:00")).toBe("1 Jan 2026");
    expect(formatDate(null)).toBe("");
  });
});

describe("the loop check as homeowners read it", () => {
  const result = runLoopCheck(demoSystem);

  it("shows sources without provenance notes, keeping the standard's name", () => {
    expect(plainSource("VDI 6002-1 steam reach (coefficients from memory)")).toBe(
      "VDI 6002-1 steam reach",
    );
    expect(plainSource("48 °C at a bath (Approved Document G, from memory); local rules")).toBe(
      "48 °C at a bath (Approved Document G); local rules",
    );
    for (const f of result.findings) {
      expect(plainSource(f.source)).not.toMatch(/memory/i);
      if (f.method) expect(plainSource(f.method)).not.toMatch(/memory/i);
    }
  });

  it("counts levels with the badges' words", () => {
    expect(levelCounts(result)).toMatch(/^Stop \d+ · Fix \d+ · Note \d+ · OK \d+$/);
  });
});
