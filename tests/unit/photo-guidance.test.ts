import { describe, expect, it } from "vitest";
import { CATALOGUE } from "@/lib/checklist/catalogue";
import { PHOTO_GUIDANCE, ROOF_PHOTO_CAUTION } from "@/lib/checklist/photo-guidance";

describe("photo guidance", () => {
  it("has one line for every catalogue item that names a photo", () => {
    const missing = CATALOGUE.filter((i) => i.photo && !PHOTO_GUIDANCE[i.key]).map((i) => i.key);
    expect(missing).toEqual([]);
  });

  it("marks the photos taken at the collector, and the caution says never from the roof", () => {
    expect(PHOTO_GUIDANCE["hot-zone-joints"]?.fromRoof).toBe(true);
    expect(PHOTO_GUIDANCE["vessel-rating"]?.fromRoof).toBeFalsy();
    expect(ROOF_PHOTO_CAUTION).toMatch(/never from a ladder on the roof/);
  });
});
