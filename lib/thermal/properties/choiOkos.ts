// Food properties from composition: Choi, Y. and Okos, M.R. (1986), "Effects of temperature and
// composition on the thermal properties of foods", in Le Maguer and Jelen (eds.), Food Engineering
// and Process Applications, Vol. 1; as reproduced in ASHRAE Handbook—Refrigeration, chapter
// "Thermal Properties of Foods", Table 1. t in °C, valid −40 to 150 °C; P = a + b·t + c·t².

export type Component = "water" | "ice" | "protein" | "fat" | "carbohydrate" | "fiber" | "ash";

type Poly = readonly [number, number, number];
const at = ([a, b, c]: Poly, t: number) => a + b * t + c * t * t;

/** Thermal conductivity, W/(m·K). */
const K: Record<Component, Poly> = {
  water: [0.57109, 1.7625e-3, -6.7036e-6],
  ice: [2.2196, -6.2489e-3, 1.0154e-4],
  protein: [0.17881, 1.1958e-3, -2.7178e-6],
  // Fat's linear term: −2.7604e-4, not the −2.7604e-3 of some reproductions; only −2.7604e-4 is
  // consistent with the published fat diffusivity model (see DOMAIN notes).
  fat: [0.18071, -2.7604e-4, -1.7749e-7],
  carbohydrate: [0.20141, 1.3874e-3, -4.3312e-6],
  fiber: [0.18331, 1.2497e-3, -3.1683e-6],
  ash: [0.32962, 1.4011e-3, -2.9069e-6],
};

/** Density, kg/m³. */
const RHO: Record<Component, Poly> = {
  water: [997.18, 3.1439e-3, -3.7574e-3],
  ice: [916.89, -0.13071, 0],
  protein: [1329.9, -0.5184, 0],
  fat: [925.59, -0.41757, 0],
  carbohydrate: [1599.1, -0.31046, 0],
  fiber: [1311.5, -0.36589, 0],
  ash: [2423.8, -0.28063, 0],
};

/** Specific heat, kJ/(kg·K) (converted to J below). Water has separate fits above and below 0 °C. */
const CP: Record<Exclude<Component, "water">, Poly> & { waterAbove: Poly; waterBelow: Poly } = {
  waterAbove: [4.1762, -9.0864e-5, 5.4731e-6],
  waterBelow: [4.0817, -5.3062e-3, 9.9516e-4],
  ice: [2.0623, 6.0769e-3, 0],
  protein: [2.0082, 1.2089e-3, -1.3129e-6],
  fat: [1.9842, 1.4733e-3, -4.8008e-6],
  carbohydrate: [1.5488, 1.9625e-3, -5.9399e-6],
  fiber: [1.8459, 1.8306e-3, -4.6509e-6],
  ash: [1.0926, 1.8896e-3, -3.6817e-6],
};

export function componentConductivity(c: Component, t_C: number): number {
  return at(K[c], t_C);
}
export function componentDensity(c: Component, t_C: number): number {
  return at(RHO[c], t_C);
}
/** J/(kg·K) */
export function componentCp(c: Component, t_C: number): number {
  if (c === "water") return 1000 * at(t_C >= 0 ? CP.waterAbove : CP.waterBelow, t_C);
  return 1000 * at(CP[c], t_C);
}

export type MassFractions = Partial<Record<Component, number>>;

/**
 * Mixture properties with the usual rules (ASHRAE, same chapter): ρ = 1/Σ(xᵢ/ρᵢ); cp = Σ xᵢ·cpᵢ;
 * k by the parallel model k = Σ εᵢ·kᵢ with volume fractions εᵢ = (xᵢ/ρᵢ)·ρ.
 */
export function mixture(x: MassFractions, t_C: number): { density_kg_m3: number; cp_J_kgK: number; k_W_mK: number } {
  let invRho = 0;
  let cp = 0;
  for (const [c, xi] of Object.entries(x) as Array<[Component, number]>) {
    if (!xi) continue;
    invRho += xi / componentDensity(c, t_C);
    cp += xi * componentCp(c, t_C);
  }
  const rho = 1 / invRho;
  let k = 0;
  for (const [c, xi] of Object.entries(x) as Array<[Component, number]>) {
    if (!xi) continue;
    k += ((xi / componentDensity(c, t_C)) * rho) * componentConductivity(c, t_C);
  }
  return { density_kg_m3: rho, cp_J_kgK: cp, k_W_mK: k };
}

/** ∫₀ᵗ cp dt, J/kg: the component's sensible enthalpy relative to 0 °C (exact for the polynomials). */
export function componentEnthalpy(c: Component, t_C: number): number {
  const poly = c === "water" ? (t_C >= 0 ? CP.waterAbove : CP.waterBelow) : CP[c];
  const [a, b, k] = poly;
  return 1000 * (a * t_C + (b * t_C * t_C) / 2 + (k * t_C ** 3) / 3);
}
