import { describe, it, expect } from "vitest";
import { mixture } from "@/lib/thermal/properties/choiOkos";
import { compositionMaterial } from "@/lib/thermal/properties/material";
import { iceFraction } from "@/lib/thermal/properties/iceFraction";
import { expectClose } from "../helpers/numeric";

// Choi–Okos (1986) correlations as reproduced in ASHRAE Handbook—Refrigeration, "Thermal Properties of Foods".
describe("Choi–Okos pure water against a water property table", () => {
  // Saturated liquid water, Incropera et al., Table A.6 (values recalled from memory of the table):
  // 280 K: ρ = 1000 kg/m³, cp = 4198 J/kg·K, k = 0.582 W/m·K
  // 300 K: ρ = 997,  cp = 4179, k = 0.613
  // 320 K: ρ = 989,  cp = 4180, k = 0.640
  const table: Array<[number, number, number, number]> = [
    [280, 1000, 4198, 0.582],
    [300, 997, 4179, 0.613],
    [320, 989, 4180, 0.64],
  ];
  for (const [T, rho, cp, k] of table) {
    it(`mixture({ water: 1 }) at ${T} K is within 1 % (ρ, cp) and 3 % (k) of the table`, () => {
      const m = mixture({ water: 1 }, T - 273.15);
      expectClose(m.density_kg_m3, rho, { rel: 0.01 });
      expectClose(m.cp_J_kgK, cp, { rel: 0.01 });
      expectClose(m.k_W_mK, k, { rel: 0.03 });
    });
  }
});

describe("compositionMaterial", () => {
  const beef = { water: 0.74, protein: 0.21, fat: 0.04, carbohydrate: 0, fiber: 0, ash: 0.01 };

  it("compositionMaterial at 20 °C matches the correlations worked by hand for lean beef", () => {
    // Worked by hand (separate calculation) from the ASHRAE Table 1 correlations and mixing rules for
    // 74 % water, 21 % protein, 4 % fat, 1 % ash: ρ = 1052.568 kg/m³, cp = 3609.11 J/kg·K, k = 0.51557 W/m·K.
    const m = compositionMaterial(beef, -1.7);
    expectClose(m.density(20), 1052.568, { abs: 1e-3 });
    expectClose(m.conductivity(20), 0.515568, { abs: 1e-6 });
    // apparent cp is the slope of the tabulated enthalpy: within 0.1 % of the correlation
    expectClose(m.apparentCp(20), 3609.11, { rel: 1e-3 });
  });

  it("compositionMaterial gives lean-beef values inside the handbook's range for unfrozen meat", () => {
    // ASHRAE Handbook—Refrigeration, "Thermal Properties of Foods", tables for lean beef (about 74 % water):
    // cp about 3.5–3.7 kJ/kg·K and k about 0.45–0.52 W/m·K above freezing (ranges recalled from memory).
    const m = compositionMaterial(beef, -1.7);
    expect(m.apparentCp(5)).toBeGreaterThan(3450);
    expect(m.apparentCp(5)).toBeLessThan(3700);
    expect(m.conductivity(5)).toBeGreaterThan(0.45);
    expect(m.conductivity(5)).toBeLessThan(0.52);
  });

  it("compositionMaterial's enthalpy rises by the latent heat of the frozen water across the freezing range", () => {
    // From −40 °C to the freezing point, h gains the sensible heat plus L·x_ice(−40 °C) (latent heat of
    // fusion 333.6 kJ/kg). With cp between 2 and 4 kJ/kg·K for the sensible part, the rise lies in:
    const m = compositionMaterial(beef, -1.7);
    const latent = 333_600 * iceFraction(-40, 0.74, -1.7);
    const rise = m.enthalpy.hAt(-1.7) - m.enthalpy.hAt(-40);
    expect(rise).toBeGreaterThan(latent + 2000 * 38.3);
    expect(rise).toBeLessThan(latent + 4000 * 38.3);
  });

  it("compositionMaterial conducts better frozen than unfrozen (ice k ≈ 2.2 vs water 0.57 W/m·K)", () => {
    const m = compositionMaterial(beef, -1.7);
    expect(m.conductivity(-20)).toBeGreaterThan(2.5 * m.conductivity(5));
  });

  it("iceFraction is zero at the freezing point and below the water content everywhere", () => {
    expect(iceFraction(-1.7, 0.74, -1.7)).toBe(0);
    for (const t of [-2, -5, -10, -40]) expect(iceFraction(t, 0.74, -1.7)).toBeLessThan(0.74);
    expect(iceFraction(-40, 0.74, -1.7)).toBeGreaterThan(iceFraction(-5, 0.74, -1.7));
  });
});
