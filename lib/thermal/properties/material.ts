import type { Composition } from "../definitions";
import { componentEnthalpy, mixture, type Component, type MassFractions } from "./choiOkos";
import { iceFraction, LATENT_FUSION_WATER_J_kg } from "./iceFraction";
import { EnthalpyCurve } from "./enthalpyCurve";

/** Thermal properties of a product material as functions of temperature (°C). */
export interface Material {
  density(t_C: number): number;
  conductivity(t_C: number): number;
  /** apparent specific heat dh/dT, J/(kg·K), including latent heat released or absorbed */
  apparentCp(t_C: number): number;
  /** specific enthalpy, J/kg, as a table */
  enthalpy: EnthalpyCurve;
  /** constant properties and no phase change: the lumped model may use its exact update */
  linear: boolean;
  /** ice mass fraction at t_C (0 for a material without a freezing model) */
  ice(t_C: number): number;
  description: string;
}

/** Temperature range of the tables, °C: the import's plausible range with a margin. */
const T_MIN = -60;
const T_MAX = 100;

export function constantMaterial(props: { cp_J_kgK: number; density_kg_m3?: number; k_W_mK?: number }): Material {
  const { cp_J_kgK: cp } = props;
  const enthalpy = new EnthalpyCurve(Float64Array.from([T_MIN, T_MAX]), Float64Array.from([0, cp * (T_MAX - T_MIN)]));
  return {
    density: () => props.density_kg_m3 ?? Number.NaN,
    conductivity: () => props.k_W_mK ?? Number.NaN,
    apparentCp: () => cp,
    enthalpy,
    linear: true,
    ice: () => 0,
    description: "properties as given (constant)",
  };
}

/**
 * Latent heat of fusion of water at t_C, J/kg: L₀ = 333.6 kJ/kg at 0 °C corrected by Kirchhoff's law,
 * L(t) = L₀ + ∫₀ᵗ (cp_water − cp_ice) dt, with the Choi–Okos specific heats (supercooled-water fit below
 * 0 °C). About 312 kJ/kg at −10 °C.
 */
export function latentHeatAt(t_C: number): number {
  return LATENT_FUSION_WATER_J_kg + componentEnthalpy("water", t_C) - componentEnthalpy("ice", t_C);
}

/**
 * Properties from composition with the Choi–Okos correlations. Above the initial freezing point the
 * water is liquid; below it, the ice fraction follows Tchigeov's equation and the enthalpy is the sum
 * of each component's own,
 *   h(T) = Σ_solids xᵢ·Hᵢ(T) + (x_wo − x_ice(T))·H_water(T) + x_ice(T)·(H_ice(T) − L₀),
 * with Hᵢ(T) = ∫₀ᵀ cpᵢ dt (Choi–Okos) and L₀ = 333.6 kJ/kg at 0 °C, so that the latent heat released at
 * T is L(T) = H_water − H_ice + L₀ (Kirchhoff), not the 0 °C value. The apparent specific heat is dh/dT.
 * Below −40 °C the correlations are extrapolated. Without a freezing point, no freezing is modelled.
 */
export function compositionMaterial(c: Composition, freezingPoint_C?: number, estimated = false): Material {
  const solids: MassFractions = { protein: c.protein, fat: c.fat, carbohydrate: c.carbohydrate, fiber: c.fiber, ash: c.ash };
  const xIce = (t: number) => (freezingPoint_C === undefined ? 0 : iceFraction(t, c.water, freezingPoint_C));
  const fractionsAt = (t: number): MassFractions => {
    const ice = xIce(t);
    return { ...solids, water: c.water - ice, ice };
  };
  const props = (t: number) => mixture(fractionsAt(t), t);
  const hAt = (t: number) => {
    let h = 0;
    for (const [k, x] of Object.entries(solids) as Array<[Component, number]>) if (x) h += x * componentEnthalpy(k, t);
    const ice = xIce(t);
    return h + (c.water - ice) * componentEnthalpy("water", t) + ice * (componentEnthalpy("ice", t) - LATENT_FUSION_WATER_J_kg);
  };

  // Tabulate h(T): fine steps near and below the freezing point where the curve bends, coarser above.
  const temps: number[] = [];
  const fine = 0.02, coarse = 0.25;
  const tf = freezingPoint_C ?? Number.NEGATIVE_INFINITY;
  for (let t = T_MIN; t < T_MAX; ) {
    temps.push(t);
    const step = t < tf + 1 && t > tf - 15 ? fine : t <= tf - 15 ? 0.1 : coarse;
    const next = t + step;
    if (t < tf && next > tf) {
      temps.push(tf);
      t = tf + fine;
    } else if (t < 0 && next > 0) {
      temps.push(0); // water's cp fit switches at 0 °C
      t = next;
    } else t = next;
  }
  temps.push(T_MAX);
  const T = Float64Array.from(temps);
  const enthalpy = new EnthalpyCurve(T, Float64Array.from(T, hAt));
  // Conductivity is asked for at every conductance update: tabulated every 0.05 K (linear between,
  // well under 0.1 % from the correlations except within 0.05 K of the freezing point's kink).
  const K_STEP = 0.05;
  const kTable = Float64Array.from({ length: Math.round((T_MAX - T_MIN) / K_STEP) + 1 }, (_, i) => props(T_MIN + i * K_STEP).k_W_mK);
  const conductivity = (t: number) => {
    const x = (Math.min(Math.max(t, T_MIN), T_MAX) - T_MIN) / K_STEP;
    const i = Math.min(Math.floor(x), kTable.length - 2);
    return kTable[i]! + (x - i) * (kTable[i + 1]! - kTable[i]!);
  };
  return {
    density: (t) => props(t).density_kg_m3,
    conductivity,
    apparentCp: (t) => {
      const h = 0.01;
      return (enthalpy.hAt(t + h) - enthalpy.hAt(t - h)) / (2 * h);
    },
    enthalpy,
    linear: false,
    ice: xIce,
    description:
      freezingPoint_C === undefined
        ? "Choi–Okos (1986) from composition, unfrozen (no freezing point)"
        : `Choi–Okos (1986) from composition; ice fraction by Tchigeov's equation below ${Number(freezingPoint_C.toFixed(2))} °C${estimated ? " (estimated)" : ""}`,
  };
}

