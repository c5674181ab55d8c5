import { describe, it, expect } from "vitest";
import { predict } from "@/lib/thermal/predict";
import { runChain } from "@/lib/thermal/solvers/chain";
import { EnthalpyCurve } from "@/lib/thermal/properties/enthalpyCurve";
import { STEFAN_BOLTZMANN, resistances } from "@/lib/thermal/resistances";
import { shapeGeometry } from "@/lib/thermal/geometry";
import type { Pack, Product } from "@/lib/thermal/definitions";
import { expectClose } from "../helpers/numeric";

const gel = { melt_C: 0, latent_J_kg: 330_000, cp_solid_J_kgK: 2000, cp_liquid_J_kgK: 3800 };
const linearCurve = (cp: number) => new EnthalpyCurve(Float64Array.of(-80, 120), Float64Array.of(0, 200 * cp));

describe("coolants with different initial temperatures (issue defect 5)", () => {
  it("without area_m2 they share one node holding the sum of their own enthalpies: the plateau ends when the rest of the latent heat is in", () => {
    // Hand energy balance: 1 kg at −20 °C (−40 kJ below solid at 0 °C) and 1 kg at +10 °C (330 + 38 kJ above it)
    // hold 328 kJ of the 660 kJ needed to melt both: 332 kJ remain. The product starts at the melt point too, so
    // while the coolant holds 0 °C nothing flows to the product, and the wall brings (T_air − 0)/R_wall.
    // The old mass-weighted start (both solid at −5 °C) would need 680 kJ: twice as long.
    const product: Product = { name: "p", mass_kg: 1, properties: { cp_J_kgK: 3600 }, area_m2: 0.1, initial_C: 0 };
    const pack: Pack = {
      name: "box", h_outside_W_m2K: 10, h_inside_W_m2K: 5, area_m2: 0.5,
      layers: [{ name: "foam", thickness_m: 0.03, k_W_mK: 0.035 }],
      coolants: [{ name: "cold gel", mass_kg: 1, ...gel, initial_C: -20 }, { name: "warm gel", mass_kg: 1, ...gel, initial_C: 10 }],
    };
    const rWall = 1 / (10 * 0.5) + 0.03 / (0.035 * 0.5);
    const tEnd = (332_000 * rWall) / 20;
    const t = Float64Array.from({ length: 48 * 6 + 1 }, (_, i) => i * 600);
    const p = predict(product, pack, t, new Float64Array(t.length).fill(20), { model: "lumped" });
    const leaves = t[p.coolant!.findIndex((x) => x > 0.01)]!;
    expectClose(leaves, tEnd, { abs: 1200 });
    expect(p.screening.notes.join(" ")).toMatch(/inner-air temperature/);
  });

  it("with area_m2 each coolant is its own node with its own film; energy balances to round-off", () => {
    const product: Product = { name: "p", mass_kg: 1, properties: { cp_J_kgK: 3600 }, area_m2: 0.1, initial_C: 2 };
    const pack: Pack = {
      name: "box", h_outside_W_m2K: 10, h_inside_W_m2K: 5, area_m2: 0.5,
      layers: [{ name: "foam", thickness_m: 0.03, k_W_mK: 0.035 }],
      coolants: [{ name: "cold gel", mass_kg: 1, ...gel, initial_C: -20, area_m2: 0.05 }, { name: "warm gel", mass_kg: 1, ...gel, initial_C: 10, area_m2: 0.05, h_W_m2K: 8 }],
    };
    const t = Float64Array.from({ length: 24 * 6 + 1 }, (_, i) => i * 600);
    const p = predict(product, pack, t, new Float64Array(t.length).fill(20), { model: "lumped" });
    expect(Math.abs(p.solver.energy_residual_J!)).toBeLessThan(1e-5);
    // the mass-weighted coolant channel starts at the mean of −20 and 10, and each node keeps its own latent heat
    expectClose(p.coolant![0]!, -5, { abs: 1e-9 });
    expect(p.screening.notes.join(" ")).toMatch(/own node/);
  });
});

describe("radiation updated every step (issue defect 6)", () => {
  it("a film-only wrapped product on a hot excursion follows an independent RK4 integration with h_r = εσ(Ts²+Ta²)(Ts+Ta) within 0.05 K", () => {
    // Reference: the lumped balance m·c·dT/dt = (h_c + h_r(T, T_air))·A·(T_air − T), classical RK4 at 1 s
    // (Incropera et al. eq. 1.9 for h_r; the product surface is the film's surface).
    const m = 0.5, cp = 3600, A = 0.06, hc = 4, eps = 0.9;
    const product: Product = { name: "wrapped", mass_kg: m, properties: { cp_J_kgK: cp }, area_m2: A, initial_C: 4 };
    const pack: Pack = { name: "film", h_outside_W_m2K: hc, emissivity: eps, layers: [], coolants: [] };
    const t = Float64Array.from({ length: 6 * 12 + 1 }, (_, i) => i * 300);
    const airAt = (ti: number) => (ti < 3600 ? 4 : ti < 4 * 3600 ? 40 : 4);
    const air = Float64Array.from(t, airAt);
    // air linear between samples, as the models take it
    const airLin = (ti: number) => {
      const k = Math.min(Math.floor(ti / 300), t.length - 2);
      return air[k]! + ((air[k + 1]! - air[k]!) * (ti - t[k]!)) / 300;
    };
    const rhs = (ti: number, T: number) => {
      const s = T + 273.15, a = airLin(ti) + 273.15;
      return ((hc + eps * STEFAN_BOLTZMANN * (s * s + a * a) * (s + a)) * A * (airLin(ti) - T)) / (m * cp);
    };
    const ref = [4];
    let T = 4;
    for (let ti = 0; ti < t[t.length - 1]!; ti += 1) {
      const k1 = rhs(ti, T), k2 = rhs(ti + 0.5, T + 0.5 * k1), k3 = rhs(ti + 0.5, T + 0.5 * k2), k4 = rhs(ti + 1, T + k3);
      T += (k1 + 2 * k2 + 2 * k3 + k4) / 6;
      if ((ti + 1) % 300 === 0) ref.push(T);
    }
    const p = predict(product, pack, t, air, { model: "lumped" });
    for (let i = 0; i < t.length; i++) expectClose(p.core[i]!, ref[i]!, { abs: 0.05 });
  });
});

describe("wall layers that store heat", () => {
  it("a pack whose wall has density and specific heat matches the same RC ladder built by hand and run on the chain solver within 0.01 K", () => {
    // Independent network: 4 wall nodes (R/4 each, capacity ρ·c·V/4), outside film to the first node's centre,
    // inner film to the product; the chain solver (Thomas algorithm) integrates it at a fixed 10 s step.
    const rho = 30, cw = 1300, L = 0.04, kw = 0.035, A = 0.3, ho = 10, hi = 5;
    const product: Product = { name: "p", mass_kg: 2, properties: { cp_J_kgK: 3600 }, area_m2: 0.12, initial_C: 3 };
    const pack: Pack = { name: "thick wall", h_outside_W_m2K: ho, h_inside_W_m2K: hi, area_m2: A, layers: [{ name: "foam", thickness_m: L, k_W_mK: kw, density_kg_m3: rho, cp_J_kgK: cw }], coolants: [] };
    const t = Float64Array.from({ length: 12 * 6 + 1 }, (_, i) => i * 600);
    const air = Float64Array.from(t, (ti) => (ti < 3600 ? 3 : 25));
    const p = predict(product, pack, t, air, { model: "lumped" });
    const R = L / (kw * A), Rf = 1 / (ho * A), Ri = 1 / (hi * 0.12);
    // The wall starts on the steady profile between the first air reading (3 °C) and the product (3 °C): 3 °C.
    const net = {
      mass: Float64Array.of(...Array(4).fill((rho * A * L) / 4), 2),
      curves: [...Array(4).fill(linearCurve(cw)), linearCurve(3600)],
      gAmbient: 1 / (Rf + R / 8),
      g: Float64Array.of(4 / R, 4 / R, 4 / R, 1 / (R / 8 + Ri)),
      linear: true,
    };
    const run = runChain(net, t, air, Float64Array.of(3, 3, 3, 3, 3), 10);
    for (let i = 0; i < t.length; i++) expectClose(p.core[i]!, run.T[i * 5 + 4]!, { abs: 0.01 });
    expect(p.screening.notes.join(" ")).toMatch(/store heat/);
  });
});

describe("wrapped cylinder ends (issue item 9)", () => {
  it("each layer is the curved shell in parallel with two discs at its mid-radius, worked by hand", () => {
    const product: Product = { name: "wheel", shape: { kind: "cylinder", radius_m: 0.1, length_m: 0.1 }, properties: { density_kg_m3: 1000, cp_J_kgK: 3000, k_W_mK: 0.4 }, initial_C: 4 };
    const pack: Pack = { name: "wrap", h_outside_W_m2K: 8, layers: [{ name: "foam", thickness_m: 0.02, k_W_mK: 0.04 }], coolants: [] };
    const r = resistances(product, shapeGeometry(product.shape!), shapeGeometry(product.shape!).area_m2, pack, 4);
    const curved = Math.log(0.12 / 0.1) / (2 * Math.PI * 0.04 * 0.1);
    const discs = 0.02 / (0.04 * 2 * Math.PI * 0.11 ** 2);
    expectClose(r.items.find((i) => i.kind === "layer")!.r_K_W, 1 / (1 / curved + 1 / discs), { rel: 1e-12 });
    expectClose(r.outer_area_m2, 2 * Math.PI * 0.12 * 0.1 + 2 * Math.PI * 0.12 ** 2, { rel: 1e-12 });
  });
});
