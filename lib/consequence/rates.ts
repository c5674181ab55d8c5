import type { GrowthModel, ShelfLifeModel } from "./definitions";

/** Gas constant, J/(mol·K) (CODATA 2018, exact since the 2019 SI redefinition). */
export const R_J_molK = 8.314462618;
const KELVIN = 273.15;

/**
 * A rate as a function of temperature, with what the integrator needs to be exact or accurate:
 * `kind` names the closed form used on a linear temperature segment (see integrate.ts), `breaks_C` the
 * temperatures where the function stops being smooth (Tmin, Tmax), and `value` the rate itself.
 */
export type RateFunction =
  /** k·(T − tmin)² above tmin, 0 below: integrates to a cubic on a linear segment */
  | { kind: "square"; k: number; tmin_C: number; breaks_C: number[]; value: (T: number) => number }
  /** exp(a + s·T): integrates exactly on a linear segment (exp(a + b·t) has an elementary integral) */
  | { kind: "exponential"; a: number; s: number; breaks_C: number[]; value: (T: number) => number }
  /** anything else smooth between breaks: adaptive Gauss–Legendre (integrate.ts states the accuracy) */
  | { kind: "smooth"; breaks_C: number[]; value: (T: number) => number };

/**
 * Relative rate of spoilage RRS(T) = shelf life at Tref / shelf life at T (Dalgaard 2002; Labuza 1982):
 * - sqrt: ((T − Tmin)/(Tref − Tmin))² above Tmin, 0 at or below (Ratkowsky et al. 1982 form);
 * - arrhenius: exp((Ea/R)·(1/Tref − 1/T)), T in kelvin;
 * - q10: Q10^((T − Tref)/10) = exp(ln(Q10)/10·(T − Tref)).
 * Its integral over time, in days, is the shelf life consumed expressed in days at the reference.
 */
export function relativeRate(m: ShelfLifeModel): RateFunction {
  if (m.dependence === "sqrt") {
    const k = 1 / (m.reference_C - m.tmin_C) ** 2;
    return { kind: "square", k, tmin_C: m.tmin_C, breaks_C: [m.tmin_C], value: (T) => (T > m.tmin_C ? k * (T - m.tmin_C) ** 2 : 0) };
  }
  if (m.dependence === "q10") {
    const s = Math.log(m.q10) / 10;
    const a = -s * m.reference_C;
    return { kind: "exponential", a, s, breaks_C: [], value: (T) => Math.exp(a + s * T) };
  }
  const eaR = (m.ea_kJ_mol * 1000) / R_J_molK;
  const inv = 1 / (m.reference_C + KELVIN);
  return { kind: "smooth", breaks_C: [], value: (T) => Math.exp(eaR * (inv - 1 / (T + KELVIN))) };
}

/**
 * Maximum specific growth rate μmax(T), 1/h, natural-log units: √μmax = b·(T − Tmin) (Ratkowsky et al. 1982),
 * times (1 − exp(c·(T − Tmax))) when Tmax and c are given (Ratkowsky et al. 1983); zero outside (Tmin, Tmax).
 */
export function growthRate(m: GrowthModel): RateFunction {
  const b2 = m.b_per_C_sqrt_h ** 2;
  if (m.tmax_C === undefined || m.c_per_C === undefined) {
    return { kind: "square", k: b2, tmin_C: m.tmin_C, breaks_C: [m.tmin_C], value: (T) => (T > m.tmin_C ? b2 * (T - m.tmin_C) ** 2 : 0) };
  }
  const { tmin_C, tmax_C, c_per_C } = m;
  return {
    kind: "smooth",
    breaks_C: [tmin_C, tmax_C],
    value: (T) => (T > tmin_C && T < tmax_C ? b2 * (T - tmin_C) ** 2 * (1 - Math.exp(c_per_C * (T - tmax_C))) ** 2 : 0),
  };
}
