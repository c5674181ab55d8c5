import { describe, it, expect } from "vitest";
import { readableDuration, screenBareProduct } from "@/lib/thermal/screening";
import { bareProductSchema } from "@/lib/thermal/product";
import { expectClose } from "../helpers/numeric";

describe("screenBareProduct", () => {
  it("screenBareProduct gives tau = m·cp/(h·A) and Bi = h·(V/A)/k", () => {
    // 0.5 kg, 3600 J/kg·K, 8 W/m²·K over 0.05 m²: R = 2.5 K/W, C = 1800 J/K, tau = 4500 s.
    // V = 0.5/1000 m³, Lc = V/A = 0.01 m, Bi = 8·0.01/0.5 = 0.16.
    const s = screenBareProduct({
      name: "p", mass_kg: 0.5, properties: { cp_J_kgK: 3600, density_kg_m3: 1000, k_W_mK: 0.5 }, area_m2: 0.05, h_W_m2K: 8, initial_C: 4,
    });
    expectClose(s.tau_s, 4500, { rel: 1e-14 });
    expectClose(s.r_total_K_W, 2.5, { rel: 1e-14 });
    expectClose(s.lc_m!, 0.01, { rel: 1e-14 });
    expectClose(s.biot!, 0.16, { rel: 1e-14 });
    expect(s.reason).toMatch(/≥ 0.1/);
  });

  it("screenBareProduct says the Biot number was not checked without density and conductivity", () => {
    const s = screenBareProduct({ name: "p", mass_kg: 1, properties: { cp_J_kgK: 3000 }, area_m2: 0.1, h_W_m2K: 5, initial_C: 2 });
    expect(s.biot).toBeNull();
    expect(s.reason).toMatch(/not checked/);
  });
});

describe("bareProductSchema", () => {
  it("bareProductSchema names the field at fault", () => {
    const r = bareProductSchema.safeParse({ name: "p", mass_kg: -1, properties: { cp_J_kgK: 3000 }, area_m2: 0.1, h_W_m2K: 5, initial_C: 2 });
    expect(r.success).toBe(false);
    expect(r.error!.issues[0]).toMatchObject({ path: ["mass_kg"], message: "mass must be greater than zero" });
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
