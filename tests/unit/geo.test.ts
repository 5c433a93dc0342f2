import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { getDistance } from "geolib";
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

  it("agrees with geolib (npm registry) for any two points, scaled to its 6378.137 km radius (±2 m for rounding)", () => {
    // geolib's getDistance is the same haversine on a sphere of radius 6 378 137 m, rounded to 1 m.
    fc.assert(
      fc.property(
        fc.double({ min: -80, max: 80, noNaN: true }),
        fc.double({ min: -179, max: 179, noNaN: true }),
        fc.double({ min: -80, max: 80, noNaN: true }),
        fc.double({ min: -179, max: 179, noNaN: true }),
        (lat1, lng1, lat2, lng2) => {
          const ours = haversineKm({ lat: lat1, lng: lng1 }, { lat: lat2, lng: lng2 });
          const theirs = getDistance(
            { latitude: lat1, longitude: lng1 },
            { latitude: lat2, longitude: lng2 },
            0.001,
          );
          expect(Math.abs(ours * 1000 * (6378137 / 6371000) - theirs)).toBeLessThan(2);
        },
      ),
    );
  });

  it("is symmetric and zero at the same point", () => {
    const a = { lat: 50.1, lng: -5.2 };
    const b = { lat: 55.9, lng: -3.2 };
    expect(haversineKm(a, b)).toBeCloseTo(haversineKm(b, a), 9);
    expect(haversineKm(a, a)).toBe(0);
  });
});
