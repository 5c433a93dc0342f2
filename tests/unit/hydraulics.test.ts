import { describe, expect, it } from "vitest";
import {
  colebrook,
  frictionFactor,
  pipePressureDrop,
  reynolds,
  swameeJain,
  velocity,
} from "@/lib/calc/hydraulics";

describe("Darcy–Weisbach worked examples", () => {
  it("Çengel & Cimbala, head loss in a water pipe: f ≈ 0.0172, Δp ≈ 96.5 kPa", () => {
    // Water at 15 °C: ρ = 999.1 kg/m³, μ = 1.138e-3 Pa·s (the book's property table);
    // D = 5 cm, 6 L/s, 60 m of stainless pipe, ε = 0.002 mm.
    const r = pipePressureDrop({
      flowM3s: 0.006,
      innerDiameterM: 0.05,
      lengthM: 60,
      roughnessM: 0.002e-3,
      densityKgM3: 999.1,
      dynamicViscosityPas: 1.138e-3,
    });
    expect(r.velocityMs).toBeCloseTo(3.06, 2);
    expect(r.frictionFactor).toBeCloseTo(0.0172, 3); // the book rounds f to three figures
    expect(Math.abs(r.pressureDropPa / 1000 - 96.5) / 96.5).toBeLessThan(0.01);
  });

  it("White, Fluid Mechanics Ex. 6.7: Re ≈ 1.28e5, f ≈ 0.0227", () => {
    // Oil ν = 1e-5 m²/s, Q = 0.2 m³/s, D = 200 mm, ε = 0.26 mm.
    const v = velocity(0.2, 0.2);
    const re = reynolds(v, 0.2, 1e-5);
    expect(Math.abs(re - 1.28e5) / 1.28e5).toBeLessThan(0.01);
    expect(colebrook(re, 0.26 / 200)).toBeCloseTo(0.0227, 3);
  });

  it("Swamee–Jain stays within 2 % of Colebrook (its published accuracy)", () => {
    for (const re of [5e3, 1e4, 1e5, 1e6]) {
      for (const rr of [1e-5, 1e-4, 1e-3]) {
        expect(Math.abs(swameeJain(re, rr) - colebrook(re, rr)) / colebrook(re, rr)).toBeLessThan(
          0.02,
        );
      }
    }
  });

  it("laminar branch is 64/Re", () => {
    expect(frictionFactor(1000, 1e-4)).toBeCloseTo(0.064, 12);
    const r = pipePressureDrop({
      flowM3s: 1e-5,
      innerDiameterM: 0.0136,
      lengthM: 10,
      roughnessM: 1.5e-6,
      densityKgM3: 1030,
      dynamicViscosityPas: 4e-3,
    });
    expect(r.laminar).toBe(true);
    // Hagen–Poiseuille: Δp = 128 μ L Q / (π D⁴)
    const hp = (128 * 4e-3 * 10 * 1e-5) / (Math.PI * 0.0136 ** 4);
    expect(r.pressureDropPa).toBeCloseTo(hp, 6);
  });
});
