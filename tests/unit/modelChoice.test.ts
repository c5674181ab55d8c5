import { describe, it, expect } from "vitest";
import { predict, screenDefinition } from "@/lib/thermal/predict";
import { mixture } from "@/lib/thermal/properties/choiOkos";
import { compositionMaterial, latentHeatAt } from "@/lib/thermal/properties/material";
import { estimateFreezingPoint } from "@/lib/thermal/properties/freezingPoint";
import { respirationHeat_W_kg } from "@/lib/thermal/respiration";
import { lumpedResponse } from "@/lib/thermal/lumped";
import { runChain } from "@/lib/thermal/solvers/chain";
import { buildNetwork } from "@/lib/thermal/network";
import { resolveProduct } from "@/lib/thermal/resolve";
import { resistances } from "@/lib/thermal/resistances";
import type { Product } from "@/lib/thermal/definitions";
import { expectClose, seeded } from "../helpers/numeric";

const meat = { water: 0.74, protein: 0.21, fat: 0.04, carbohydrate: 0, fiber: 0, ash: 0.01 };

describe("model choice over the temperature range (issue defect 3)", () => {
  it("a 40 mm slab of meat thawing from −18 °C in +25 °C air is judged with the thawed conductivity and conducted", () => {
    // Reference for the smallest k: the Choi–Okos mixture with all water liquid, evaluated just above the
    // freezing point (unfrozen water conducts least there), computed here from the correlations directly.
    const slab: Product = { name: "meat slab", shape: { kind: "slab", thickness_m: 0.04, width_m: 0.3, length_m: 0.3 }, composition: meat, freezing_point_C: -1.7, initial_C: -18, h_W_m2K: 10 };
    const t = Float64Array.from({ length: 37 }, (_, i) => i * 600);
    const p = predict(slab, undefined, t, new Float64Array(t.length).fill(25), { model: "auto" });
    const thawed = mixture({ ...meat }, -1.69).k_W_mK;
    expectClose(p.screening.k_min_W_mK!, thawed, { rel: 0.01 });
    expect(p.screening.k_min_W_mK!).toBeLessThan(0.55);
    expect(p.screening.model).toBe("conduction");
    expect(p.screening.reason).toMatch(/crosses its freezing range/);
    // the lumped core runs ahead of the conduction core (the issue measured 18.1 against 12.6 °C at 6 h)
    const lumped = predict(slab, undefined, t, new Float64Array(t.length).fill(25), { model: "lumped" });
    expect(lumped.core[36]! - p.core[36]!).toBeGreaterThan(2);
  });

  it("screenDefinition over a range uses the smallest conductivity in it", () => {
    const frozen: Product = { name: "block", shape: { kind: "box", x_m: 0.1, y_m: 0.1, z_m: 0.04 }, composition: meat, freezing_point_C: -1.7, initial_C: -18, h_W_m2K: 10 };
    const atStart = screenDefinition(frozen, undefined, "auto");
    const overRange = screenDefinition(frozen, undefined, "auto", -18, { lo_C: -18, hi_C: 25 });
    expect(overRange.biot!).toBeGreaterThan(2 * atStart.biot!);
  });
});

describe("no silent non-freezing (issue defect 4)", () => {
  it("estimateFreezingPoint gives Chang and Tao's meat value for 74 % water: 271.18 + 1.47·0.74 K = −0.88 °C (worked by hand)", () => {
    const e = estimateFreezingPoint(meat);
    expect("freezing_point_C" in e && e.correlation).toBe("meat");
    expectClose((e as { freezing_point_C: number }).freezing_point_C, 271.18 + 1.47 * 0.74 - 273.15, { abs: 1e-12 });
  });

  it("a 74 %-water product starting at −18 °C without a freezing point freezes at the estimate, and the review says so", () => {
    const product: Product = { name: "frozen meat", shape: { kind: "sphere", radius_m: 0.04 }, composition: meat, initial_C: -18, h_W_m2K: 10 };
    const t = Float64Array.from({ length: 25 }, (_, i) => i * 600);
    const air = new Float64Array(t.length).fill(20);
    const p = predict(product, undefined, t, air, { model: "conduction" });
    const given = predict({ ...product, freezing_point_C: 271.18 + 1.47 * 0.74 - 273.15 }, undefined, t, air, { model: "conduction" });
    expect(p.screening.freezing_source).toBe("estimated");
    expect(p.screening.notes.join(" ")).toMatch(/estimated at -0.9 °C/);
    for (let i = 0; i < t.length; i++) expectClose(p.core[i]!, given.core[i]!, { abs: 1e-9 });
    // with latent heat the core is still near or below its freezing point after 4 h (without it: 21 K warmer, per the issue)
    expect(p.core[24]!).toBeLessThan(0);
  });

  it("where no correlation applies the review says that water below 0 °C is treated as liquid", () => {
    const butterish: Product = { name: "spread", mass_kg: 0.25, area_m2: 0.03, composition: { water: 0.16, protein: 0.01, fat: 0.82, carbohydrate: 0.01, fiber: 0, ash: 0 }, initial_C: -10, h_W_m2K: 8 };
    const s = screenDefinition(butterish, undefined);
    expect(s.freezing_source).toBe("none");
    expect(s.notes.join(" ")).toMatch(/treated as liquid below 0 °C/);
  });
});

describe("latent heat at the temperature (issue item 9)", () => {
  it("latentHeatAt(−10) is 312 kJ/kg within 1 % (Kirchhoff's law; tables of supercooled water give about 312 kJ/kg, from memory)", () => {
    expectClose(latentHeatAt(-10), 312_000, { rel: 0.01 });
    expectClose(latentHeatAt(0), 333_600, { abs: 1e-9 });
  });

  it("compositionMaterial releases L(T)·dx_ice, not 333.6 kJ/kg: enthalpy between −1.7 and −20 °C is about 3 % below the constant-L value for lean meat", () => {
    const m = compositionMaterial(meat, -1.7);
    const dh = m.enthalpy.hAt(-1.7) - m.enthalpy.hAt(-20);
    expect(dh).toBeGreaterThan(150_000);
    const ice = m.ice(-20);
    // same sensible heat, constant latent heat: the pre-fix formula (worked from the same correlations)
    const constantL = dh + ice * (333_600 - latentHeatAt(-10));
    expect(dh / constantL).toBeLessThan(0.99);
    expect(dh / constantL).toBeGreaterThan(0.9);
  });
});

describe("heat of respiration", () => {
  it("respirationHeat_W_kg(becker-fricke) follows W = (10.7·f/3600)·(9t/5+32)^g (worked by hand at 5 °C)", () => {
    const r = { model: "becker-fricke" as const, f: 5.6871e-4, g: 2.5977 };
    expectClose(respirationHeat_W_kg(r, 5), ((10.7 * 5.6871e-4) / 3600) * 41 ** 2.5977, { rel: 1e-12 });
    expect(respirationHeat_W_kg(r, -20)).toBe(0);
  });

  it("a lumped product with constant heat generation q in constant air rises to T_air + q·m·R as 1 − e^(−t/τ) (analytical)", () => {
    const m = 5, cp = 3800, A = 0.2, h = 6, q = 0.05;
    const product: Product = { name: "crate of produce", mass_kg: m, properties: { cp_J_kgK: cp }, area_m2: A, initial_C: 2, h_W_m2K: h, respiration: { model: "constant", W_kg: q } };
    const t = Float64Array.from({ length: 49 }, (_, i) => i * 1800);
    const p = predict(product, undefined, t, new Float64Array(t.length).fill(2), { model: "lumped" });
    const R = 1 / (h * A), tau = R * m * cp;
    for (let i = 0; i < t.length; i++) expectClose(p.core[i]!, 2 + q * m * R * (1 - Math.exp(-t[i]! / tau)), { abs: 0.01 });
    expect(Math.abs(p.solver.energy_residual_J!)).toBeLessThan(1e-6);
    expectClose(p.solver.generated_J!, q * m * t[t.length - 1]!, { rel: 0.01 });
  });
});

describe("step control covers short intervals (issue defect 7)", () => {
  it("on irregular sampling the reported halving change bounds the achieved error against a 64-times finer run", () => {
    const rand = seeded(3);
    const times = [0];
    while (times[times.length - 1]! < 12 * 3600) times.push(times[times.length - 1]! + (rand() < 0.6 ? 600 : 20 + 40 * rand()));
    const t = Float64Array.from(times);
    const air = Float64Array.from(t, (ti) => 5 + 15 * Math.sin(ti / 5000) + 3 * (rand() - 0.5));
    const product: Product = { name: "sphere", shape: { kind: "sphere", radius_m: 0.05 }, properties: { density_kg_m3: 1000, cp_J_kgK: 3600, k_W_mK: 0.5 }, initial_C: 4, h_W_m2K: 20 };
    const p = predict(product, undefined, t, air, { model: "conduction" });
    // reference: the same network with every interval split into 64× as many steps as the finest run used
    const rp = resolveProduct(product);
    const b = buildNetwork(rp, undefined, resistances(product, rp.geometry, rp.area_m2, undefined, 4), "conduction", 40);
    const sub = Int32Array.from({ length: t.length - 1 }, (_, k) => Math.max(1, Math.ceil((t[k + 1]! - t[k]!) / (p.solver.step_s! / 64))));
    const run = runChain(b.net, t, air, b.initial_C, 1, sub);
    const n = b.net.mass.length;
    let err = 0;
    for (let k = 0; k < t.length; k++) {
      const t0 = run.T[k * n + n - 1]!, t1 = run.T[k * n + n - 2]!;
      err = Math.max(err, Math.abs(p.core[k]! - (t0 - (t1 - t0) / 8)));
    }
    expect(err).toBeLessThanOrEqual(p.solver.halving_change_K!);
  });
});

void lumpedResponse;
