import { describe, it, expect } from "vitest";
import { readableDuration } from "@/lib/thermal/screening";
import { screenDefinition } from "@/lib/thermal/predict";
import { productSchema, packSchema, type Product } from "@/lib/thermal/definitions";
import { shapeGeometry } from "@/lib/thermal/geometry";
import { resistances, STEFAN_BOLTZMANN } from "@/lib/thermal/resistances";
import { expectClose } from "../helpers/numeric";

const bare: Product = { name: "p", mass_kg: 0.5, properties: { cp_J_kgK: 3600, density_kg_m3: 1000, k_W_mK: 0.5 }, area_m2: 0.05, h_W_m2K: 8, initial_C: 4 };

describe("screenDefinition", () => {
  it("screenDefinition gives tau = m·cp/(h·A) and Bi = h·(V/A)/k for a bare product", () => {
    // R = 1/(8·0.05) = 2.5 K/W, C = 0.5·3600 = 1800 J/K, tau = 4500 s; V = 0.5/1000 m³, Lc = 0.01 m, Bi = 8·0.01/0.5 = 0.16.
    const s = screenDefinition(bare, undefined);
    expectClose(s.tau_s, 4500, { rel: 1e-14 });
    expectClose(s.r_total_K_W, 2.5, { rel: 1e-14 });
    expectClose(s.lc_m!, 0.01, { rel: 1e-14 });
    expectClose(s.biot!, 0.16, { rel: 1e-14 });
    // Bi ≥ 0.1 but no shape: conduction is impossible, and the reason says so
    expect(s.model).toBe("lumped");
    expect(s.reason).toMatch(/needs a shape/);
  });

  it("screenDefinition picks conduction for a shaped product with Bi ≥ 0.1", () => {
    const s = screenDefinition({ ...bare, shape: { kind: "sphere", radius_m: 0.03 }, mass_kg: undefined, area_m2: undefined }, undefined);
    // sphere r = 0.03 m: Lc = r/3 = 0.01 m, Bi = 8·0.01/0.5 = 0.16
    expectClose(s.lc_m!, 0.01, { rel: 1e-12 });
    expectClose(s.biot!, 0.16, { rel: 1e-12 });
    expect(s.model).toBe("conduction");
  });

  it("screenDefinition says the Biot number was not checked without density and conductivity", () => {
    const s = screenDefinition({ name: "p", mass_kg: 1, properties: { cp_J_kgK: 3000 }, area_m2: 0.1, h_W_m2K: 5, initial_C: 2 }, undefined);
    expect(s.biot).toBeNull();
    expect(s.reason).toMatch(/not checked/);
  });
});

describe("geometry and resistances", () => {
  it("shapeGeometry gives V, A and Lc = V/A for each shape", () => {
    const s = shapeGeometry({ kind: "sphere", radius_m: 0.1 });
    expectClose(s.lc_m, 0.1 / 3, { rel: 1e-14 });
    const c = shapeGeometry({ kind: "cylinder", radius_m: 0.1, length_m: 0.4 });
    expectClose(c.volume_m3, Math.PI * 0.01 * 0.4, { rel: 1e-14 });
    const b = shapeGeometry({ kind: "box", x_m: 0.3, y_m: 0.2, z_m: 0.05 });
    expectClose(b.area_m2, 2 * (0.06 + 0.015 + 0.01), { rel: 1e-14 });
    expect(b.conduction).toMatchObject({ kind: "slab", half_m: 0.025 });
  });

  it("resistances adds films and layers in series and reports each share", () => {
    // Plane wall of 0.5 m²: outer film 1/((8 + h_r)·0.5), EPS 0.03/(0.035·0.5), inner film 1/(4·0.1) on a 0.1 m² product.
    const pack = packSchema.parse({ name: "tote", h_outside_W_m2K: 8, h_inside_W_m2K: 4, emissivity: 0.9, area_m2: 0.5, layers: [{ name: "EPS", thickness_m: 0.03, k_W_mK: 0.035 }] });
    const r = resistances({ ...bare, area_m2: 0.1 }, null, 0.1, pack, 20);
    const hr = 4 * 0.9 * STEFAN_BOLTZMANN * 293.15 ** 3; // linearised radiation, about 5.1 W/m²·K
    expectClose(r.h_radiation_W_m2K, hr, { rel: 1e-14 });
    expectClose(r.r_total_K_W, 1 / ((8 + hr) * 0.5) + 0.03 / (0.035 * 0.5) + 1 / (4 * 0.1), { rel: 1e-14 });
    expect(r.items.map((i) => i.name)).toEqual(["outside film", "EPS", "inside film"]);
    expectClose(r.items.reduce((s, i) => s + i.share, 0), 1, { abs: 1e-14 });
  });

  it("resistances uses the spherical-shell form around a sphere without a wall area", () => {
    // (1/r1 − 1/r2)/(4πk), r1 = 0.05, r2 = 0.07, k = 0.04 (Incropera et al., §3.4.2)
    const pack = packSchema.parse({ name: "shell", h_outside_W_m2K: 10, layers: [{ name: "foam", thickness_m: 0.02, k_W_mK: 0.04 }] });
    const product = { ...bare, shape: { kind: "sphere" as const, radius_m: 0.05 } };
    const r = resistances(product, shapeGeometry(product.shape), 4 * Math.PI * 0.0025, pack, 20);
    expectClose(r.items[1]!.r_K_W, (1 / 0.05 - 1 / 0.07) / (4 * Math.PI * 0.04), { rel: 1e-14 });
    expectClose(r.items[0]!.r_K_W, 1 / (10 * 4 * Math.PI * 0.07 ** 2), { rel: 1e-14 });
  });
});

describe("definition schemas", () => {
  const issue = (r: { success: boolean; error?: { issues: Array<{ path: PropertyKey[]; message: string }> } }) => r.error!.issues[0]!;
  it("productSchema names the field at fault", () => {
    expect(issue(productSchema.safeParse({ ...bare, mass_kg: -1 }))).toMatchObject({ path: ["mass_kg"], message: "mass must be between 0.001 and 2000 kg" });
  });
  it("productSchema refuses mass fractions that do not sum to 1 within 0.5 %", () => {
    const r = productSchema.safeParse({ name: "x", shape: { kind: "sphere", radius_m: 0.05 }, composition: { water: 0.7, protein: 0.2 }, initial_C: 4, h_W_m2K: 5 });
    expect(issue(r)).toMatchObject({ path: ["composition"], message: "mass fractions must sum to 1 (within 0.5 %)" });
  });
  it("packSchema refuses a negative layer thickness, naming the layer", () => {
    const r = packSchema.safeParse({ name: "k", h_outside_W_m2K: 8, layers: [{ name: "EPS", thickness_m: -0.01, k_W_mK: 0.035 }] });
    expect(issue(r)).toMatchObject({ path: ["layers", 0, "thickness_m"], message: "thickness must be between 0.00001 and 1 m" });
  });
  it("packSchema requires the inside coefficient when there is coolant", () => {
    const r = packSchema.safeParse({ name: "k", h_outside_W_m2K: 8, coolants: [{ name: "gel", mass_kg: 1, melt_C: 0, latent_J_kg: 3e5, cp_solid_J_kgK: 2000, cp_liquid_J_kgK: 3800, initial_C: -5 }] });
    expect(issue(r).path).toEqual(["h_inside_W_m2K"]);
  });
});

describe("readableDuration", () => {
  it("readableDuration picks seconds, minutes, hours or days", () => {
    expect(readableDuration(45)).toBe("45 s");
    expect(readableDuration(750)).toBe("12.5 min");
    expect(readableDuration(10452)).toBe("2 h 54 min");
    expect(readableDuration(3599.9 + 3600)).toBe("2 h 0 min");
    expect(readableDuration(3 * 86400 + 7200)).toBe("3 d 2 h");
  });
});
