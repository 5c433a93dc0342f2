import { describe, expect, it } from "vitest";
import { haversineKm } from "@/lib/geo";

describe("haversine distance", () => {
  it("one degree of latitude is about 111.2 km (2π·6371/360)", () => {
    expect(haversineKm({ lat: 52, lng: -3 }, { lat: 53, lng: -3 })).toBeCloseTo(
      (2 * Math.PI * 6371) / 360,
      6,
    );
  });

  it("London to Paris is about 344 km (a common reference figure, recalled from memory; ±1 %)", () => {
    const d = haversineKm({ lat: 51.5074, lng: -0.1278 }, { lat: 48.8566, lng: 2.3522 });
    expect(Math.abs(d - 344) / 344).toBeLessThan(0.01);
  });

  it("is symmetric and zero at the same point", () => {
    const a = { lat: 50.1, lng: -5.2 };
    const b = { lat: 55.9, lng: -3.2 };
    expect(haversineKm(a, b)).toBeCloseTo(haversineKm(b, a), 9);
    expect(haversineKm(a, a)).toBe(0);
  });
});
