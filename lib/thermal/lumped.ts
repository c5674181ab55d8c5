/**
 * Lumped-capacitance body driven by an air temperature that is linear between samples:
 *   C·dT/dt = (T_air(t) − T)/R,  tau = R·C.
 * Over an interval of length Δ with air going from a0 to a1 the solution is closed form
 * (first-order linear ODE; e.g. Incropera et al., Fundamentals of Heat and Mass Transfer, §5.3):
 *   T1 = T0·E + a0·(1 − E) + (a1 − a0)·(1 − φ),  E = exp(−x), φ = (1 − E)/x, x = Δ/tau.
 * Written with expm1 so that very short or very long intervals lose no digits. There is no step size:
 * irregular and long sampling intervals carry no discretisation error.
 */
export function lumpedResponse(t_s: Float64Array, air_C: Float64Array, initial_C: number, tau_s: number): Float64Array {
  if (!(tau_s > 0) || !Number.isFinite(tau_s)) throw new RangeError("tau_s must be positive and finite");
  const n = t_s.length;
  const out = new Float64Array(n);
  if (n === 0) return out;
  let T = initial_C;
  out[0] = T;
  const rate = 1 / tau_s;
  for (let i = 1; i < n; i++) {
    T = lumpedStep(T, air_C[i - 1]!, air_C[i]!, (t_s[i]! - t_s[i - 1]!) * rate);
    out[i] = T;
  }
  return out;
}

/** One interval of the exact update: from T0 with the air going linearly from a0 to a1 over x = Δ/tau. */
export function lumpedStep(T0: number, a0: number, a1: number, x: number): number {
  const oneMinusE = -Math.expm1(-x);
  const phi = x > 0 ? oneMinusE / x : 1;
  return T0 * (1 - oneMinusE) + a0 * oneMinusE + (a1 - a0) * (1 - phi);
}
