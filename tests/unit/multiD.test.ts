import { describe, it, expect } from "vitest";
import { predict, screenDefinition } from "@/lib/thermal/predict";
import type { Pack, Product } from "@/lib/thermal/definitions";
import { centreTheta } from "../helpers/series";
import { expectClose } from "../helpers/numeric";

// Multi-dimensional conduction against the exact product solutions: with a uniform h on every face, the
// centre of a box is θ = θ_slab(x)·θ_slab(y)·θ_slab(z) and the centre of a finite cylinder
// θ = θ_cylinder(r)·θ_slab(z) (Incropera et al., Fundamentals of Heat and Mass Transfer, §5.8, "Multidimensional
// effects"), each factor the exact series for its own Biot and Fourier numbers (tests/helpers/series.ts).
// 20 K step (20 °C product into 0 °C air); k = 0.5 W/m·K, ρ = 1000 kg/m³, cp = 3600 J/kg·K.
const k = 0.5, rho = 1000, cp = 3600;
const alpha = k / (rho * cp);
const props = { density_kg_m3: rho, cp_J_kgK: cp, k_W_mK: k };
const times = (n: number, dt: number) => Float64Array.from({ length: n }, (_, i) => i * dt);
const slab = (h: number, half: number, t: number) => centreTheta("slab", (h * half) / k, (alpha * t) / (half * half));
const cyl = (h: number, r0: number, t: number) => centreTheta("cylinder", (h * r0) / k, (alpha * t) / (r0 * r0));

function boxExact(h: number, [a, b, c]: [number, number, number], t: number): number {
  return 20 * slab(h, a / 2, t) * slab(h, b / 2, t) * slab(h, c / 2, t);
}
function cylinderExact(h: number, r0: number, L: number, t: number): number {
  return 20 * cyl(h, r0, t) * slab(h, L / 2, t);
}
function maxError(core: Float64Array, t: Float64Array, exact: (t: number) => number): number {
  let e = 0;
  for (let i = 1; i < t.length; i++) e = Math.max(e, Math.abs(core[i]! - exact(t[i]!)));
  return e;
}
const step = (product: Product, t: Float64Array, model: "conduction" | "conduction-1d" = "conduction", intervals?: number) =>
  predict(product, undefined, t, new Float64Array(t.length), { model, ...(intervals ? { intervals } : {}) });

describe("auto picks the multi-dimensional model for boxes and finite cylinders", () => {
  it("screenDefinition(auto) at Bi ≥ 0.1 names the 3-D box, the r–z cylinder and, for a sphere, 1-D conduction", () => {
    const base = { name: "p", properties: props, initial_C: 4, h_W_m2K: 25 };
    expect(screenDefinition({ ...base, shape: { kind: "box", x_m: 0.2, y_m: 0.1, z_m: 0.06 } }, undefined).conduction_kind).toBe("3-D box");
    expect(screenDefinition({ ...base, shape: { kind: "cylinder", radius_m: 0.1, length_m: 0.1 } }, undefined).conduction_kind).toBe("r–z cylinder");
    expect(screenDefinition({ ...base, shape: { kind: "sphere", radius_m: 0.05 } }, undefined).conduction_kind).toBe("1-D");
  });
});

describe("3-D box (one octant) against the product of three slab series", () => {
  const dims: [number, number, number] = [0.2, 0.1, 0.06]; // the brick
  for (const h of [5, 25, 100]) {
    it(`predict(conduction) centre of a 200×100×60 mm box at h = ${h} W/m²·K is within 0.1 K of θx·θy·θz over 8 h`, () => {
      const t = times(97, 300);
      const box: Product = { name: "brick", shape: { kind: "box", x_m: dims[0], y_m: dims[1], z_m: dims[2] }, properties: props, initial_C: 20, h_W_m2K: h };
      const p = step(box, t);
      expect(p.screening.conduction_kind).toBe("3-D box");
      expect(maxError(p.core, t, (ti) => boxExact(h, dims, ti))).toBeLessThan(0.1);
      expect(p.solver.halving_change_K!).toBeLessThanOrEqual(0.01);
    });
  }

  it("mesh convergence: the centre error falls by about 4 when the intervals double (second order)", () => {
    const t = times(49, 300);
    const box: Product = { name: "cube", shape: { kind: "box", x_m: 0.1, y_m: 0.1, z_m: 0.1 }, properties: props, initial_C: 20, h_W_m2K: 50 };
    const e = (n: number) => maxError(step(box, t, "conduction", n).core, t, (ti) => boxExact(50, [0.1, 0.1, 0.1], ti));
    const e3 = e(3), e6 = e(6);
    expect(e3).toBeGreaterThan(e6);
    expect(e3 / e6).toBeGreaterThan(2.5);
  });

  it("a very thin box tends to the 1-D slab series (its edges add under 1 % of the area)", () => {
    const t = times(49, 300);
    const thin: Product = { name: "sheet", shape: { kind: "box", x_m: 0.04, y_m: 8, z_m: 8 }, properties: props, initial_C: 20, h_W_m2K: 25 };
    const p = step(thin, t);
    for (let i = 1; i < t.length; i++) expectClose(p.core[i]!, 20 * slab(25, 0.02, t[i]!), { abs: 0.1 });
  });

  it("the brick's core reaches 5 °C in warm air at the exact time within 5 min; the sphere shortcut is late (the unsafe side) and says so", () => {
    // 20 K warming step: product 0 °C into 20 °C air, h = 10 W/m²·K; the exact time from θx·θy·θz by bisection.
    const h = 10;
    const t = times(4 * 12 + 1, 300);
    const air = new Float64Array(t.length).fill(20);
    const box: Product = { name: "brick", shape: { kind: "box", x_m: dims[0], y_m: dims[1], z_m: dims[2] }, properties: props, initial_C: 0, h_W_m2K: h };
    let lo = 0, hi = 4 * 3600;
    for (let i = 0; i < 60; i++) {
      const mid = (lo + hi) / 2;
      if (20 - boxExact(h, dims, mid) >= 5) hi = mid;
      else lo = mid;
    }
    const reach = (core: Float64Array) => {
      const i = core.findIndex((x) => x >= 5);
      return t[i - 1]! + ((5 - core[i - 1]!) / (core[i]! - core[i - 1]!)) * (t[i]! - t[i - 1]!);
    };
    const multi = predict(box, undefined, t, air, { model: "conduction" });
    const shortcut = predict(box, undefined, t, air, { model: "conduction-1d" });
    expectClose(reach(multi.core), lo, { abs: 300 });
    expect(reach(shortcut.core)).toBeGreaterThan(lo + 600);
    expect(shortcut.screening.geometry_note).toMatch(/unsafe side/);
  });
});

describe("finite cylinder (r–z) against θ_cylinder·θ_slab", () => {
  for (const h of [5, 25, 100]) {
    it(`predict(conduction) centre of a wheel r = 100 mm, L = 100 mm at h = ${h} W/m²·K is within 0.1 K over 8 h`, () => {
      const t = times(97, 300);
      const wheel: Product = { name: "wheel", shape: { kind: "cylinder", radius_m: 0.1, length_m: 0.1 }, properties: props, initial_C: 20, h_W_m2K: h };
      const p = step(wheel, t);
      expect(p.screening.conduction_kind).toBe("r–z cylinder");
      expect(maxError(p.core, t, (ti) => cylinderExact(h, 0.1, 0.1, ti))).toBeLessThan(0.1);
    });
  }

  it("a very long cylinder tends to the infinite-cylinder series", () => {
    const t = times(49, 300);
    const rod: Product = { name: "rod", shape: { kind: "cylinder", radius_m: 0.05, length_m: 20 }, properties: props, initial_C: 20, h_W_m2K: 10 };
    const p = step(rod, t);
    for (let i = 1; i < t.length; i++) expectClose(p.core[i]!, 20 * cyl(10, 0.05, t[i]!), { abs: 0.1 });
  });

  it("the radial-only shortcut is colder than the exact wheel in warm air (the issue's defect 2) and its note says which way it errs", () => {
    const t = times(6 * 12 + 1, 300);
    const wheel: Product = { name: "wheel", shape: { kind: "cylinder", radius_m: 0.1, length_m: 0.1 }, properties: props, initial_C: 0, h_W_m2K: 10 };
    const air = new Float64Array(t.length).fill(20);
    const multi = predict(wheel, undefined, t, air, { model: "conduction" });
    const radial = predict(wheel, undefined, t, air, { model: "conduction-1d" });
    const i = 36; // 3 h
    expectClose(multi.core[i]!, 20 - cylinderExact(10, 0.1, 0.1, t[i]!), { abs: 0.1 });
    expect(multi.core[i]! - radial.core[i]!).toBeGreaterThan(1);
    expect(radial.screening.geometry_note).toMatch(/unsafe side/);
  });
});

describe("multi-dimensional energy balance", () => {
  it("a frozen box thawing in a pack with radiation, a coolant with its own film and a wall that stores heat closes to round-off", () => {
    const t = times(97, 300);
    const air = Float64Array.from(t, (ti) => 12 + 10 * Math.sin(ti / 7000));
    const product: Product = {
      name: "frozen block",
      shape: { kind: "box", x_m: 0.15, y_m: 0.1, z_m: 0.05 },
      composition: { water: 0.74, protein: 0.21, fat: 0.04, carbohydrate: 0, fiber: 0, ash: 0.01 },
      freezing_point_C: -1.7,
      initial_C: -18,
    };
    const pack: Pack = {
      name: "foam box",
      h_outside_W_m2K: 8,
      h_inside_W_m2K: 5,
      emissivity: 0.9,
      area_m2: 0.2,
      layers: [{ name: "EPS", thickness_m: 0.03, k_W_mK: 0.035, density_kg_m3: 20, cp_J_kgK: 1300 }],
      coolants: [{ name: "gel", mass_kg: 0.3, melt_C: 0, latent_J_kg: 330_000, cp_solid_J_kgK: 2000, cp_liquid_J_kgK: 3800, initial_C: -20, area_m2: 0.03 }],
    };
    const p = predict(product, pack, t, air, { model: "conduction" });
    // heat moved is of order 1e5 J; round-off on sums of node enthalpies of order 1e5 J is about 1e-9 J per step
    expect(Math.abs(p.solver.energy_residual_J!)).toBeLessThan(1e-4);
    expect(p.solver.grid).toMatch(/3-D box/);
  });

  it("a finite cylinder from composition with respiration and a coolant in contact closes to round-off", () => {
    const t = times(73, 300);
    const air = Float64Array.from(t, (ti) => 8 + 12 * Math.sin(ti / 5000));
    const product: Product = {
      name: "cabbage-like",
      shape: { kind: "cylinder", radius_m: 0.08, length_m: 0.12 },
      composition: { water: 0.92, protein: 0.013, fat: 0.001, carbohydrate: 0.056, fiber: 0.002, ash: 0.008 },
      initial_C: 4,
      respiration: { model: "becker-fricke", f: 6.0e-4, g: 2.6 },
    };
    const pack: Pack = {
      name: "crate", h_outside_W_m2K: 10, h_inside_W_m2K: 6, emissivity: 0.8, area_m2: 0.25, layers: [],
      coolants: [{ name: "ice pack", mass_kg: 0.4, melt_C: 0, latent_J_kg: 333_600, cp_solid_J_kgK: 2050, cp_liquid_J_kgK: 4180, initial_C: -15, area_m2: 0.04, contact_area_m2: 0.01, h_contact_W_m2K: 50 }],
    };
    const p = predict(product, pack, t, air, { model: "conduction" });
    expect(p.solver.grid).toMatch(/r and z/);
    expect(p.solver.generated_J!).toBeGreaterThan(0);
    expect(Math.abs(p.solver.energy_residual_J!)).toBeLessThan(1e-4);
  });
});
