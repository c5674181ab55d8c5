import type { RateFunction } from "./rates";

// Time integral of a rate along a piecewise-linear temperature history. On each interval the temperature
// is T(s) = T0 + (T1 − T0)·s for s in [0, 1] over dt seconds (the same interpolation the rules use), so
// ∫ rate(T(t)) dt over the interval is a one-dimensional integral of a known function:
// - square (k·(T − Tmin)² above Tmin): exact, a cubic; an interval that crosses Tmin is integrated only over
//   its part above Tmin, which ends at s* = a/(a − b), giving k·dt·a³/(3(a − b));
// - exponential (exp(a + s·T)): exact, dt·e^x0·(e^(x1−x0) − 1)/(x1 − x0), with expm1 for small differences;
// - smooth (Arrhenius; the extended square-root model): split at the breaks, then adaptive Gauss–Legendre
//   (5 points, halving until the whole and its two halves agree within 1e-12 relative; the accepted halves
//   are then accurate to about that or better, the 5-point rule's error falling as h^10).

/** 5-point Gauss–Legendre nodes and weights on [−1, 1] (Abramowitz and Stegun, Table 25.4). */
const GL_X = [0, -0.5384693101056831, 0.5384693101056831, -0.906179845938664, 0.906179845938664];
const GL_W = [0.5688888888888889, 0.47862867049936647, 0.47862867049936647, 0.23692688505618908, 0.23692688505618908];
const REL_TOL = 1e-12;
const MAX_DEPTH = 40;

function gauss5(f: (T: number) => number, T0: number, T1: number, dt: number): number {
  // ∫₀^dt f(T0 + (T1 − T0)·t/dt) dt
  let sum = 0;
  for (let i = 0; i < 5; i++) sum += GL_W[i]! * f(T0 + (T1 - T0) * (1 + GL_X[i]!) * 0.5);
  return sum * dt * 0.5;
}

function adaptive(f: (T: number) => number, T0: number, T1: number, dt: number, whole: number, depth: number): number {
  const Tm = (T0 + T1) / 2;
  const left = gauss5(f, T0, Tm, dt / 2);
  const right = gauss5(f, Tm, T1, dt / 2);
  const halves = left + right;
  if (depth >= MAX_DEPTH || Math.abs(halves - whole) <= REL_TOL * Math.abs(halves) + 1e-300) return halves;
  return adaptive(f, T0, Tm, dt / 2, left, depth + 1) + adaptive(f, Tm, T1, dt / 2, right, depth + 1);
}

function smoothIntegral(f: RateFunction, T0: number, T1: number, dt: number): number {
  if (T0 === T1) return f.value(T0) * dt;
  // cut at every break strictly inside (T0, T1), so each piece is smooth
  const lo = Math.min(T0, T1), hi = Math.max(T0, T1);
  const cuts = f.breaks_C.filter((c) => c > lo && c < hi).map((c) => (c - T0) / (T1 - T0)).sort((a, b) => a - b);
  const s = [0, ...cuts, 1];
  let sum = 0;
  for (let k = 0; k + 1 < s.length; k++) {
    const a = T0 + (T1 - T0) * s[k]!, b = T0 + (T1 - T0) * s[k + 1]!, d = dt * (s[k + 1]! - s[k]!);
    if (d <= 0) continue;
    // outside the growth range the rate is zero at the midpoint of a piece and everywhere on it
    if (f.value((a + b) / 2) === 0 && f.value(a) === 0 && f.value(b) === 0) continue;
    sum += adaptive(f.value, a, b, d, gauss5(f.value, a, b, d), 0);
  }
  return sum;
}

/** ∫ rate(T(t)) dt over one interval of dt seconds (or hours: the unit of dt is the unit of the result's time). */
export function segmentIntegral(f: RateFunction, T0: number, T1: number, dt: number): number {
  if (f.kind === "square") {
    const a = T0 - f.tmin_C, b = T1 - f.tmin_C;
    if (a <= 0 && b <= 0) return 0;
    if (a > 0 && b > 0) return (f.k * dt * (a * a + a * b + b * b)) / 3;
    return a > 0 ? (f.k * dt * a * a * a) / (3 * (a - b)) : (f.k * dt * b * b * b) / (3 * (b - a));
  }
  if (f.kind === "exponential") {
    const x0 = f.a + f.s * T0, d = f.s * (T1 - T0);
    return d === 0 ? dt * Math.exp(x0) : (dt * Math.exp(x0) * Math.expm1(d)) / d;
  }
  return smoothIntegral(f, T0, T1, dt);
}

/** The integral over the part [sa, sb] (fractions of the interval) of one interval. */
export function partialIntegral(f: RateFunction, T0: number, T1: number, dt: number, sa: number, sb: number): number {
  return segmentIntegral(f, T0 + (T1 - T0) * sa, T0 + (T1 - T0) * sb, dt * (sb - sa));
}

/** A span [start_s, end_s] of the series whose values rest on bridged (not measured) data. */
export type SpanS = readonly [number, number];

/**
 * Cumulative integral of the rate at every sample, in rate-units × `timeUnit_s` (3600 for a rate per hour,
 * 86400 for a rate per day), from the first sample; `shift_K` moves the whole history (the guard band), and
 * parts inside `skip` spans add nothing (the measure in the shipment's favour across data gaps).
 */
export function cumulativeIntegral(t_s: Float64Array, v_C: Float64Array, f: RateFunction, timeUnit_s: number, shift_K = 0, skip: readonly SpanS[] = []): Float64Array {
  const n = t_s.length;
  const out = new Float64Array(n);
  // compensated (Kahan–Babuška/Neumaier) summation: a month of one-minute intervals adds 43,000 terms
  let sum = 0, c = 0;
  for (let i = 1; i < n; i++) {
    const t0 = t_s[i - 1]!, t1 = t_s[i]!;
    const dt = (t1 - t0) / timeUnit_s;
    const T0 = v_C[i - 1]! + shift_K, T1 = v_C[i]! + shift_K;
    let term: number;
    const inside = skip.filter(([a, b]) => b > t0 && a < t1);
    if (inside.length === 0) term = segmentIntegral(f, T0, T1, dt);
    else {
      // integrate over the parts of [t0, t1] outside every span
      const cuts = inside.map(([a, b]) => [Math.max(0, (a - t0) / (t1 - t0)), Math.min(1, (b - t0) / (t1 - t0))] as const).sort((x, y) => x[0] - y[0]);
      term = 0;
      let from = 0;
      for (const [a, b] of cuts) {
        if (a > from) term += partialIntegral(f, T0, T1, dt, from, a);
        from = Math.max(from, b);
      }
      if (from < 1) term += partialIntegral(f, T0, T1, dt, from, 1);
    }
    const s = sum + term;
    c += Math.abs(sum) >= Math.abs(term) ? sum - s + term : term - s + sum;
    sum = s;
    out[i] = sum + c;
  }
  return out;
}

/**
 * The time at which the cumulative integral first reaches `target` (same units), or null if it never does
 * in the series: the interval is found from the cumulative values, then the fraction of it by bisection
 * on the partial integral (60 halvings: to the double-precision resolution of the interval).
 */
export function timeToReach(t_s: Float64Array, v_C: Float64Array, f: RateFunction, timeUnit_s: number, cumulative: Float64Array, target: number): number | null {
  if (target <= 0) return t_s[0]!;
  const n = cumulative.length;
  let i = 1;
  while (i < n && cumulative[i]! < target) i++;
  if (i >= n) return null;
  const need = target - cumulative[i - 1]!;
  const T0 = v_C[i - 1]!, T1 = v_C[i]!, dt = (t_s[i]! - t_s[i - 1]!) / timeUnit_s;
  let lo = 0, hi = 1;
  for (let k = 0; k < 60; k++) {
    const mid = (lo + hi) / 2;
    if (partialIntegral(f, T0, T1, dt, 0, mid) < need) lo = mid;
    else hi = mid;
  }
  return t_s[i - 1]! + hi * (t_s[i]! - t_s[i - 1]!);
}
