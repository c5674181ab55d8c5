import type { Coolant } from "./definitions";
import { EnthalpyCurve } from "./properties/enthalpyCurve";

const T_LOW = -80;
const T_HIGH = 120;

/**
 * Enthalpy E(T), J, of all coolants together at one temperature: each melts at its melt point,
 * absorbing m·L at constant temperature (a plateau), with solid and liquid specific heats on either
 * side. Returned as a curve per unit "mass" 1 so it can share the node machinery.
 */
export function coolantEnthalpy(coolants: readonly Coolant[]): EnthalpyCurve {
  const active = coolants.filter((c) => c.mass_kg > 0);
  if (active.length === 0) throw new Error("no coolant with mass");
  const breaks = [...new Set([T_LOW, ...active.map((c) => c.melt_C), T_HIGH])].sort((a, b) => a - b);
  const E = (t: number, liquidAtMelt: boolean) =>
    active.reduce((sum, c) => {
      if (t < c.melt_C || (t === c.melt_C && !liquidAtMelt)) return sum + c.mass_kg * c.cp_solid_J_kgK * (t - c.melt_C);
      return sum + c.mass_kg * (c.latent_J_kg + c.cp_liquid_J_kgK * (t - c.melt_C));
    }, 0);
  const T: number[] = [];
  const H: number[] = [];
  for (const t of breaks) {
    const solid = E(t, false);
    const liquid = E(t, true);
    T.push(t);
    H.push(solid);
    if (liquid > solid) {
      T.push(t);
      H.push(liquid);
    }
  }
  // Shift so that every value is positive (only differences matter).
  const shift = -H[0]! + 1;
  return new EnthalpyCurve(Float64Array.from(T), Float64Array.from(H, (h) => h + shift));
}

/** Enthalpy of one coolant at t_C, J, relative to its solid at the melt point (the same form as the curve). */
function ownEnthalpy(c: Coolant, t_C: number): number {
  return t_C <= c.melt_C ? c.mass_kg * c.cp_solid_J_kgK * (t_C - c.melt_C) : c.mass_kg * (c.latent_J_kg + c.cp_liquid_J_kgK * (t_C - c.melt_C));
}

/**
 * The enthalpy, on `curve` (from coolantEnthalpy of the same coolants), of these coolants when each
 * starts at its own initial temperature: the sum of their own enthalpies, so no heat is lost when
 * coolants that start at different temperatures share one node (a warm and a cold gel pack).
 */
export function coolantStartEnthalpy(coolants: readonly Coolant[], curve: EnthalpyCurve): number {
  const active = coolants.filter((c) => c.mass_kg > 0);
  const atLow = active.reduce((s, c) => s + ownEnthalpy(c, curve.T[0]!), 0);
  return curve.H[0]! + active.reduce((s, c) => s + ownEnthalpy(c, c.initial_C), 0) - atLow;
}
