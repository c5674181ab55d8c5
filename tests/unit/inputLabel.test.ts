import { describe, it, expect } from "vitest";
import { inputLabel } from "@/app/design/size/inputLabel";
import type { Pack, Product } from "@/lib/thermal/definitions";

const product: Product = { name: "tray", mass_kg: 0.45, shape: { kind: "box", x_m: 0.17, y_m: 0.12, z_m: 0.03 }, composition: { water: 0.72, protein: 0.08, fat: 0.06, carbohydrate: 0.12, fiber: 0.01, ash: 0.01 }, initial_C: 3.2 };
const pack: Pack = { name: "tote", h_outside_W_m2K: 8, area_m2: 0.08, layers: [{ name: "EPS wall", thickness_m: 0.025, k_W_mK: 0.035 }], coolants: [{ name: "gel pack", mass_kg: 0.15, melt_C: 0, latent_J_kg: 330000, cp_solid_J_kgK: 2000, cp_liquid_J_kgK: 3800, initial_C: -12 }] };

describe("inputLabel", () => {
  it("inputLabel names a layer's field by the layer's name, with its unit", () => {
    expect(inputLabel("pack.layers.0.k_W_mK", product, pack)).toBe("EPS wall conductivity, W/(m·K)");
    expect(inputLabel("pack.coolants.0.mass_kg", product, pack)).toBe("gel pack mass, kg");
    expect(inputLabel("pack.h_outside_W_m2K", product, pack)).toBe("pack outside heat-transfer coefficient, W/(m²·K)");
  });
  it("inputLabel names the product's shape and composition fields", () => {
    expect(inputLabel("product.shape.z_m", product, pack)).toBe("product box z, m");
    expect(inputLabel("product.composition.water", product, pack)).toBe("product water mass fraction");
    expect(inputLabel("product.initial_C", product, pack)).toBe("product initial temperature, °C");
  });
});
