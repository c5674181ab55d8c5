import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { predict } from "@/lib/thermal/predict";
import { lumpedResponse } from "@/lib/thermal/lumped";
import { runChain } from "@/lib/thermal/solvers/chain";
import { EnthalpyCurve } from "@/lib/thermal/properties/enthalpyCurve";
import type { Pack, Product } from "@/lib/thermal/definitions";
import { expectClose, seeded } from "../helpers/numeric";

describe("network energy balance", () => {
  it("heat in through the boundary equals the change in stored enthalpy over a whole trace", () => {
    // A frozen-then-thawing sphere (composition with freezing) in a pack with a coolant, under a
    // noisy day-long ambient: the most nonlinear case the solver has.
    const rand = seeded(11);
    const t = Float64Array.from({ length: 289 }, (_, i) => i * 300);
    const air = Float64Array.from(t, (ti) => 10 + 12 * Math.sin((2 * Math.PI * ti) / 86400) + 2 * (rand() - 0.5));
    const product: Product = {
      name: "sphere",
      shape: { kind: "sphere", radius_m: 0.06 },
      composition: { water: 0.8, protein: 0.15, fat: 0.03, carbohydrate: 0.01, fiber: 0, ash: 0.01 },
      freezing_point_C: -1.2,
      initial_C: -18,
    };
    const pack: Pack = {
      name: "box",
      h_outside_W_m2K: 10,
      h_inside_W_m2K: 6,
      emissivity: 0.9,
      layers: [{ name: "foam", thickness_m: 0.02, k_W_mK: 0.03 }],
      coolants: [{ name: "dry pack", mass_kg: 0.4, melt_C: -3, latent_J_kg: 300_000, cp_solid_J_kgK: 2000, cp_liquid_J_kgK: 3500, initial_C: -20 }],
    };
    const p = predict(product, pack, t, air, { model: "conduction" });
    // stored enthalpy of about 4 kg·J/kg-scale values: round-off level is well under 1e-6 J
    expect(Math.abs(p.solver.energy_residual_J!)).toBeLessThan(1e-6);
    expect(p.solver.halving_change_K!).toBeLessThanOrEqual(0.01);
  });
});

describe("lumped model against analytical solutions", () => {
  it("a sinusoidal ambient gives amplitude ratio 1/√(1+(ωτ)²) and phase lag atan(ωτ)", () => {
    // Steady periodic solution of the first-order lumped balance (any linear-systems or heat-transfer
    // text, e.g. Incropera et al. §5.2 with a periodic T_air).
    const tau = 3 * 3600, period = 86400, w = (2 * Math.PI) / period;
    const t = Float64Array.from({ length: 10 * 1440 + 1 }, (_, i) => i * 60);
    const air = Float64Array.from(t, (ti) => 5 + 4 * Math.sin(w * ti));
    const T = lumpedResponse(t, air, 5, tau);
    // after 9 periods the transient (e^(−9·86400/10800) ≈ 1e-31) is gone; read amplitude and lag in the last period
    const last = Array.from({ length: 1441 }, (_, i) => 9 * 1440 + i);
    const peak = last.reduce((a, b) => (T[b]! > T[a]! ? b : a));
    expectClose((T[peak]! - 5) / 4, 1 / Math.sqrt(1 + (w * tau) ** 2), { abs: 1e-4 });
    // peak time lag behind the air's peak (at 1/4 period), within one sample (60 s)
    const lag = t[peak]! - 9 * period - period / 4;
    expectClose(lag, Math.atan(w * tau) / w, { abs: 60 });
  });

  it("the network solver on one linear node matches the exact lumped update within 0.01 K", () => {
    const rand = seeded(5);
    const t = Float64Array.from({ length: 500 }, (_, i) => i * 120);
    const air = Float64Array.from(t, () => 2 + 10 * rand());
    const cp = 3600, m = 0.5, R = 2;
    const net = {
      mass: Float64Array.of(m),
      curves: [new EnthalpyCurve(Float64Array.of(-60, 100), Float64Array.of(0, 160 * cp))],
      gAmbient: 1 / R,
      g: new Float64Array(0),
      linear: true,
    };
    const exact = lumpedResponse(t, air, 4, R * m * cp);
    const run = runChain(net, t, air, Float64Array.of(4), 30);
    for (let i = 0; i < t.length; i++) expectClose(run.T[i]!, exact[i]!, { abs: 0.01 });
  });
});

describe("property-based (fast-check)", () => {
  const base = (mass: number, h: number): Product => ({ name: "p", mass_kg: mass, properties: { cp_J_kgK: 3500 }, area_m2: 0.05, h_W_m2K: h, initial_C: 4 });

  it("the core stays within the range of the initial and ambient temperatures", () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: -30, max: 40, noNaN: true }), { minLength: 2, maxLength: 60 }), fc.double({ min: 0.1, max: 20, noNaN: true }), (airs, h) => {
        const t = Float64Array.from(airs, (_, i) => i * 300);
        const air = Float64Array.from(airs);
        const p = predict(base(0.5, h), undefined, t, air, { model: "lumped" });
        const lo = Math.min(4, ...airs) - 1e-9, hi = Math.max(4, ...airs) + 1e-9;
        return p.core.every((x) => x >= lo && x <= hi);
      }),
    );
  });

  it("the response to a step in air is monotone", () => {
    fc.assert(
      fc.property(fc.double({ min: -20, max: 30, noNaN: true }), fc.double({ min: 0.2, max: 3, noNaN: true }), (step, mass) => {
        const t = Float64Array.from({ length: 50 }, (_, i) => i * 600);
        const p = predict(base(mass, 8), undefined, t, new Float64Array(50).fill(step), { model: "lumped" });
        const sign = Math.sign(step - 4);
        for (let i = 1; i < 50; i++) if (sign * (p.core[i]! - p.core[i - 1]!) < -1e-12) return false;
        return true;
      }),
    );
  });

  it("doubling the mass doubles tau", () => {
    fc.assert(
      fc.property(fc.double({ min: 0.01, max: 100, noNaN: true }), fc.double({ min: 0.5, max: 100, noNaN: true }), (mass, h) => {
        const t = Float64Array.of(0, 60);
        const a = predict(base(mass, h), undefined, t, Float64Array.of(4, 4), { model: "lumped" });
        const b = predict(base(2 * mass, h), undefined, t, Float64Array.of(4, 4), { model: "lumped" });
        return Math.abs(b.screening.tau_s / a.screening.tau_s - 2) < 1e-12;
      }),
    );
  });
});

describe("runChain linear fast path", () => {
  it("runChain gives the same temperatures on the linear fast path and the general Newton path", () => {
    const n = 12;
    const curve = new EnthalpyCurve(Float64Array.of(-60, 100), Float64Array.of(0, 160 * 3000));
    const mk = (linear: boolean) => ({
      mass: Float64Array.from({ length: n }, (_, i) => 0.1 + 0.01 * i),
      curves: Array.from({ length: n }, () => curve),
      gAmbient: 0.8,
      g: Float64Array.from({ length: n - 1 }, (_, i) => 2 + i),
      linear,
    });
    const t = Float64Array.from({ length: 200 }, (_, i) => i * 90);
    const air = Float64Array.from(t, (ti) => 5 + 3 * Math.sin(ti / 2000));
    const init = new Float64Array(n).fill(1);
    const fast = runChain(mk(true), t, air, init, 45);
    const general = runChain(mk(false), t, air, init, 45);
    for (let i = 0; i < fast.T.length; i++) expectClose(fast.T[i]!, general.T[i]!, { abs: 1e-9 });
    expectClose(fast.heatIn_J, fast.storedEnd_J - fast.storedStart_J, { abs: 1e-8 });
  });
});
