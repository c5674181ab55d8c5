import { describe, it, expect } from "vitest";
import { predict } from "@/lib/thermal/predict";
import type { Pack, Product } from "@/lib/thermal/definitions";
import { runChain } from "@/lib/thermal/solvers/chain";
import { coolantEnthalpy } from "@/lib/thermal/coolant";
import { expectClose } from "../helpers/numeric";

describe("phase change by the enthalpy method", () => {
  it("a lumped ice mass at its melt point melts in t = m·L·R/ΔT under constant air", () => {
    // Energy balance at constant temperature: heat in at (T_air − T_m)/R until m·L is absorbed.
    // m = 2 kg, L = 334,000 J/kg, R = 0.5 K/W, ΔT = 20 K → t = 2·334000·0.5/20 = 16,700 s.
    const ice = coolantEnthalpy([{ name: "ice", mass_kg: 2, melt_C: 0, latent_J_kg: 334_000, cp_solid_J_kgK: 2100, cp_liquid_J_kgK: 4200, initial_C: 0 }]);
    const net = { mass: Float64Array.of(1), curves: [ice], gAmbient: 1 / 0.5, g: new Float64Array(0), linear: false };
    const t = Float64Array.from({ length: 401 }, (_, i) => i * 60);
    const air = new Float64Array(t.length).fill(20);
    const run = runChain(net, t, air, Float64Array.of(0), 60);
    // the plateau: exactly 0 °C until the ice has melted
    const melted = t.findIndex((_, i) => run.T[i]! > 1e-9);
    expect(run.T[Math.floor(16_700 / 60)]).toBe(0);
    // first sample after melting completes (16,700 s lies between samples 278 and 279)
    expect(t[melted]).toBe(16_740);
    // after melting, liquid warms with tau = m·cp_l·R = 4200 s: T = 20·(1 − exp(−(t − 16,700)/4200))
    const i = 300;
    expectClose(run.T[i]!, 20 * (1 - Math.exp(-(t[i]! - 16_700) / 4200)), { abs: 2e-3 });
    expectClose(run.heatIn_J, run.storedEnd_J - run.storedStart_J, { rel: 1e-12 });
  });

  it("a coolant pack holds the inner air at its melt point while the product stays cool", () => {
    const product: Product = { name: "tray", mass_kg: 1, properties: { cp_J_kgK: 3600 }, area_m2: 0.1, initial_C: 2 };
    const pack: Pack = {
      name: "tote with gel packs",
      h_outside_W_m2K: 8,
      h_inside_W_m2K: 5,
      layers: [{ name: "EPS wall", thickness_m: 0.03, k_W_mK: 0.035 }],
      area_m2: 0.5,
      coolants: [{ name: "gel pack", mass_kg: 1, melt_C: 0, latent_J_kg: 330_000, cp_solid_J_kgK: 2000, cp_liquid_J_kgK: 3800, initial_C: -5 }],
    };
    const t = Float64Array.from({ length: 49 }, (_, i) => i * 1800); // 24 h, 30-min samples
    const air = new Float64Array(t.length).fill(25);
    const p = predict(product, pack, t, air, { model: "lumped" });
    // wall: R = 1/(8·0.5) + 0.03/(0.035·0.5) = 0.25 + 1.714 = 1.964 K/W → 12.7 W at 25 K; the pack's
    // sensible 5 K·2000 J/kg·K = 10 kJ warms it in about 15 min, then 330 kJ melt takes about 7 h.
    const c = p.coolant!;
    expect(c[4]).toBe(0); // 2 h: on the plateau
    expect(c[12]).toBe(0); // 6 h: still melting
    expect(c[20]).toBeGreaterThan(0); // 10 h: melted
    // the product cools towards the plateau while the coolant holds it
    expect(p.core[12]).toBeLessThan(2);
    expect(p.core[12]).toBeGreaterThan(0);
    expect(Math.abs(p.solver.energy_residual_J!)).toBeLessThan(1e-6);
  });

  it("freezing a slab of meat takes the order of time given by Plank's equation", () => {
    // Plank's equation (ASHRAE Handbook—Refrigeration, "Cooling and Freezing Times of Foods"):
    //   t = (ρ·L/ΔT)·(P·a/h + R·a²/k), slab P = 1/2, R = 1/8, a = full thickness.
    // Lean meat (invented composition), 40 mm slab, h = 15 W/m²·K, air −30 °C, start at the freezing point.
    const composition = { water: 0.74, protein: 0.21, fat: 0.04, carbohydrate: 0, fiber: 0, ash: 0.01 };
    const product: Product = {
      name: "meat slab",
      shape: { kind: "slab", thickness_m: 0.04, width_m: 10, length_m: 10 },
      composition,
      freezing_point_C: -1.7,
      initial_C: -1.7,
      h_W_m2K: 15,
    };
    const t = Float64Array.from({ length: 24 * 12 + 1 }, (_, i) => i * 300);
    const air = new Float64Array(t.length).fill(-30);
    // Plank's slab is infinite: the 1-D model by name
    const p = predict(product, undefined, t, air, { model: "conduction-1d" });
    const reached = t[p.core.findIndex((x) => x <= -10)]!;
    // Plank with ρ ≈ 1050 kg/m³ (frozen), L = 0.74·333.6 kJ/kg, k_frozen ≈ 1.4 W/m·K, ΔT = 28.3 K:
    const L = 0.74 * 333_600, a = 0.04, k = 1.4, h = 15, dT = 28.3, rho = 1050;
    const plank = ((rho * L) / dT) * (a / (2 * h) + (a * a) / (8 * k));
    // Plank ignores sensible heat and the gradual freezing of foods: agreement within a factor of 2 is its known accuracy.
    expect(reached / plank).toBeGreaterThan(0.5);
    expect(reached / plank).toBeLessThan(2);
  });
});
