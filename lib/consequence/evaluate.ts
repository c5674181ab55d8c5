import type { ConsequenceModel, GrowthModel, ShelfLifeModel } from "./definitions";
import { growthRate, relativeRate, type RateFunction } from "./rates";
import { cumulativeIntegral, timeToReach, type SpanS } from "./integrate";
import { lnIncrease, q0FromLag } from "./baranyi";

/** A channel to apply a model to: the same shape the rules judge (lib/exposure/rules.ts ChannelSeries). */
export interface ConsequenceChannel {
  t_s: Float64Array;
  value_C: Float64Array;
  /** spans resting on bridged data: left out of the lower bound */
  uncertainSpans: readonly SpanS[];
  /** model uncertainty of this channel, K (0 for a measured channel) */
  modelUncertainty_K: number;
}

/** Points kept of the cumulative curve in a stored result (the curve is monotone: evenly spaced samples show it). */
export const CURVE_POINTS = 241;

export interface ConsequenceEstimate {
  model: string;
  kind: "growth" | "shelf_life";
  /** the quantity bounded by lower/upper: log10 increase (growth), percent of the shelf life consumed (shelf life) */
  quantity: "log10_increase" | "shelf_life_consumed_percent";
  central: number;
  /** the smallest of the estimates at T − u, T and T + u, with bridged spans adding nothing */
  lower: number;
  /** the largest of the estimates at T − u, T and T + u */
  upper: number;
  guard_K: number;
  /** the central cumulative curve of `quantity` at every sample of the channel */
  cumulative: Float64Array;
  shelf_life_consumed_days?: number;
  /** days left at the storage temperature from the end of the window (null: no spoilage at that temperature) */
  remaining_days_at_C?: number | null;
  remaining_days_range?: [number | null, number | null];
  storage_C?: number;
  /** when the whole shelf life is used up (central), epoch s, or null */
  ends_at_s?: number | null;
  /** the q0 used (growth), null for no lag */
  q0?: number | null;
  /** the time at which a given increase is reached on the central estimate, epoch s, or null */
  timeTo(increase: number): number | null;
}

const LN10 = Math.LN10;

/** The physiological state q0 of a growth model: given, from lag_h at the initial temperature, or none (Infinity). */
export function growthQ0(m: GrowthModel, initial_C: number): number {
  if (m.q0 !== undefined) return m.q0;
  if (m.lag_h !== undefined) return q0FromLag(m.lag_h, growthRate(m).value(initial_C));
  return Infinity;
}

function bounds(ch: ConsequenceChannel, f: RateFunction, unit_s: number, toQuantity: (integral: number) => number) {
  const u = ch.modelUncertainty_K;
  const last = (a: Float64Array) => a[a.length - 1] ?? 0;
  const central = cumulativeIntegral(ch.t_s, ch.value_C, f, unit_s);
  const at = (shift: number, skip: readonly SpanS[]) => toQuantity(last(cumulativeIntegral(ch.t_s, ch.value_C, f, unit_s, shift, skip)));
  const c = toQuantity(last(central));
  // Above the optimum of the extended model a warmer history can grow less: take the extremes of all three.
  const lows = [at(-u, ch.uncertainSpans), at(0, ch.uncertainSpans), at(u, ch.uncertainSpans)];
  const highs = u === 0 ? [c] : [at(-u, []), c, at(u, [])];
  return { centralCum: central, central: c, lower: Math.min(c, ...lows), upper: Math.max(c, ...highs), guard: u };
}

/** Shelf life consumed over the channel's history (relative rate of spoilage, integrate.ts), with its guard band. */
export function evaluateShelfLife(m: ShelfLifeModel, ch: ConsequenceChannel, guard_K: number): ConsequenceEstimate {
  const f = relativeRate(m);
  const days = (d: number) => (d / m.shelf_life_days) * 100;
  const b = bounds({ ...ch, modelUncertainty_K: guard_K }, f, 86400, days);
  const consumed_days = (b.central / 100) * m.shelf_life_days;
  const storage_C = m.storage_C ?? m.reference_C;
  const rrs = f.value(storage_C);
  const remaining = (pct: number) => (rrs > 0 ? Math.max(0, m.shelf_life_days * (1 - pct / 100)) / rrs : null);
  const cumulative = b.centralCum.map((x) => days(x));
  return {
    model: m.id,
    kind: "shelf_life",
    quantity: "shelf_life_consumed_percent",
    central: b.central,
    lower: b.lower,
    upper: b.upper,
    guard_K: b.guard,
    cumulative,
    shelf_life_consumed_days: consumed_days,
    remaining_days_at_C: remaining(b.central),
    remaining_days_range: [remaining(b.upper), remaining(b.lower)],
    storage_C,
    ends_at_s: timeToReach(ch.t_s, ch.value_C, f, 86400, b.centralCum, m.shelf_life_days),
    timeTo: (pct) => timeToReach(ch.t_s, ch.value_C, f, 86400, b.centralCum, (pct / 100) * m.shelf_life_days),
  };
}

/** log10 increase of the organism over the channel's history (Baranyi and Roberts 1994, baranyi.ts), with its guard band. */
export function evaluateGrowth(m: GrowthModel, ch: ConsequenceChannel, guard_K: number, initial_C: number): ConsequenceEstimate {
  const f = growthRate(m);
  const q0 = growthQ0(m, initial_C);
  const headroom = m.max_log10 !== undefined && m.initial_log10 !== undefined ? (m.max_log10 - m.initial_log10) * LN10 : undefined;
  const log10 = (M: number) => lnIncrease(M, q0, headroom) / LN10;
  const b = bounds({ ...ch, modelUncertainty_K: guard_K }, f, 3600, log10);
  const cumulative = b.centralCum.map((M) => log10(M));
  const timeTo = (increase: number): number | null => {
    if (headroom !== undefined && increase * LN10 >= headroom) return null; // never reached below the maximum
    // invert y(M) (monotone in M) by bisection on M, then find when ∫μmax reaches it
    const total = b.centralCum[b.centralCum.length - 1] ?? 0;
    if (log10(total) < increase) return null;
    let lo = 0, hi = total;
    for (let k = 0; k < 200 && hi - lo > 1e-13 * Math.max(1, hi); k++) {
      const mid = (lo + hi) / 2;
      if (log10(mid) < increase) lo = mid;
      else hi = mid;
    }
    return timeToReach(ch.t_s, ch.value_C, f, 3600, b.centralCum, hi);
  };
  return { model: m.id, kind: "growth", quantity: "log10_increase", central: b.central, lower: b.lower, upper: b.upper, guard_K: b.guard, cumulative, q0: Number.isFinite(q0) ? q0 : null, timeTo };
}

export function evaluateConsequence(m: ConsequenceModel, ch: ConsequenceChannel, guard_K: number, initial_C: number): ConsequenceEstimate {
  return m.kind === "growth" ? evaluateGrowth(m, ch, guard_K, initial_C) : evaluateShelfLife(m, ch, guard_K);
}
