import { describe, it, expect } from "vitest";
import { predict } from "@/lib/thermal/predict";
import type { Product } from "@/lib/thermal/definitions";
import { centreTheta, coefficient, eigenvalues, type Kind } from "../helpers/series";
import { expectClose } from "../helpers/numeric";

// Centre temperature after a step in air from 20 °C to 0 °C, against the exact series solution
// (Incropera et al., Fundamentals of Heat and Mass Transfer, §5.5–5.6; eigenvalues computed in
// tests/helpers/series.ts). Half-thickness or radius 50 mm, k = 0.5 W/m·K, ρ = 1000 kg/m³,
// cp = 3600 J/kg·K (α = 1.39e-7 m²/s, L²/α = 5 h). Slab and cylinder are made long enough that their
// edges and ends add under 0.1 % to the area.
const r0 = 0.05, k = 0.5, rho = 1000, cp = 3600;
const alpha = k / (rho * cp);

function shapeOf(kind: Kind): Product["shape"] {
  if (kind === "sphere") return { kind, radius_m: r0 };
  if (kind === "cylinder") return { kind, radius_m: r0, length_m: 200 };
  return { kind: "slab", thickness_m: 2 * r0, width_m: 500, length_m: 500 };
}

function centre(kind: Kind, bi: number, shells?: number) {
  const t = Float64Array.from({ length: 721 }, (_, i) => i * 60);
  const product: Product = { name: "test body", shape: shapeOf(kind), properties: { density_kg_m3: rho, cp_J_kgK: cp, k_W_mK: k }, initial_C: 20, h_W_m2K: (bi * k) / r0 };
  // the 1-D model by name: the series below are for the infinite slab and cylinder
  return { t, p: predict(product, undefined, t, new Float64Array(t.length), { model: "conduction-1d", shells }) };
}

describe("1-D conduction (finite volumes) against the exact series", () => {
  for (const kind of ["slab", "cylinder", "sphere"] as const) {
    for (const bi of [0.5, 1, 5]) {
      it(`predict(conduction) centre of a ${kind} at Bi = ${bi} is within 0.03 K of the series at Fo = 0.06…0.6`, () => {
        const { t, p } = centre(kind, bi);
        for (const i of [30, 60, 180, 360, 720]) {
          const fo = (alpha * t[i]!) / (r0 * r0);
          expectClose(p.core[i]!, 20 * centreTheta(kind, bi, fo), { abs: 0.03 });
        }
        expect(p.solver.halving_change_K!).toBeLessThanOrEqual(0.01);
      });
    }
  }

  it("predict(conduction) converges at second order as the shells are refined", () => {
    const fo = (alpha * 360 * 60) / (r0 * r0);
    const exact = 20 * centreTheta("sphere", 1, fo);
    const err = (n: number) => Math.abs(centre("sphere", 1, n).p.core[360]! - exact);
    const e10 = err(10), e20 = err(20);
    expect(e10).toBeGreaterThan(e20);
    // halving the shell width should cut the spatial error by about 4 (time error is held below 0.01 K)
    expect(e10 / e20).toBeGreaterThan(2.5);
  });
});

describe("series helper", () => {
  // One-term coefficients at Bi = 1 as tabulated in Incropera et al., Table 5.1 (values recalled from memory
  // of the table; the helper computes them from the eigenvalue equations).
  const table: Array<[Kind, number, number]> = [
    ["slab", 0.8603, 1.1191],
    ["cylinder", 1.2558, 1.2071],
    ["sphere", 1.5708, 1.2732],
  ];
  for (const [kind, zeta, c1] of table) {
    it(`eigenvalues(${kind}, Bi = 1) reproduces Table 5.1 to 4 digits`, () => {
      const z = eigenvalues(kind, 1, 1)[0]!;
      expectClose(z, zeta, { abs: 6e-5 });
      expectClose(coefficient(kind, z), c1, { abs: 6e-5 });
    });
  }
});
