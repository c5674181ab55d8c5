import type { LiveMonitor } from "./monitor";
import type { StepperState } from "../thermal";
import { isThresholdRule } from "../exposure/limits";

/**
 * How far ahead a forecast is given, in time constants. Holding the air still is only a forecast for as long
 * as the product's own response matters: after 3·tau a first-order body has made 95 % of its response to a
 * step (1 − e⁻³), so past that the answer is set by the held air, not by the product, and says nothing the
 * air reading does not.
 */
export const FORECAST_HORIZON_TAUS = 3;
/** Marching steps per horizon for the network forecast (each an ordinary stepper interval with its own internal steps). */
const MARCH_INTERVALS = 240;

/** The air the forecast holds: the last reading's, or the mean of the last K readings. */
export type AirHold = { kind: "current" } | { kind: "mean"; last: number };

export interface Forecast {
  assumed_air_C: number;
  minutes_to_limit: number | null;
  limit_rule: string | null;
  horizon_min: number;
  reason: string;
  /** the predicted channel under the held air, from the last reading to the crossing (or the horizon): the dashed line */
  path: Array<{ t_s: number; value_C: number }>;
  /** the channel and threshold the answer is about */
  channel?: string;
  threshold_C?: number;
}

const MODELLED = ["core", "surface", "mean"] as const;
type Modelled = (typeof MODELLED)[number];

export function assumedAir(m: LiveMonitor, hold: AirHold): number {
  const n = m.length;
  if (hold.kind === "current") return m.air_C[n - 1]!;
  const k = Math.max(1, Math.min(n, Math.floor(hold.last)));
  let s = 0;
  for (let i = n - k; i < n; i++) s += m.air_C[i]!;
  return s / k;
}

interface Candidate {
  rule: string;
  channel: Modelled;
  dir: "above" | "below";
  threshold_C: number;
}

/** Rules a held air can make the product cross: thresholds on a modelled channel (air and probe rules are about readings, not a forecast). */
function candidates(m: LiveMonitor): Candidate[] {
  return m.config.limits.rules.flatMap((r) => {
    // growth and shelf-life rules have no threshold to cross: they are judged on the history, not forecast here
    if (!isThresholdRule(r) || !(MODELLED as readonly string[]).includes(r.channel)) return [];
    const dir: "above" | "below" = r.above_C !== undefined ? "above" : "below";
    return [{ rule: r.id, channel: r.channel as Modelled, dir, threshold_C: (r.above_C ?? r.below_C)! }];
  });
}

const beyond = (v: number, c: Candidate) => (c.dir === "above" ? v > c.threshold_C : v < c.threshold_C);
const fmt = (x: number) => `${Number(x.toFixed(2))} °C`;
const fmtMin = (x: number) => `${Math.round(x)} min`;

/**
 * When the product first crosses the nearest relevant threshold if the air holds at `assumed_air_C`. A lumped
 * body (the exact update) answers in closed form, T(t) = Ta + (T0 − Ta)·e^(−t/tau), so
 * t = tau·ln((T0 − Ta)/(T_limit − Ta)) when Ta is beyond T_limit (Incropera et al., §5.2, solved for t);
 * a network is marched forward from its current state with the same stepper. Null, with the reason, when the
 * channel never gets there at that air, or only after the horizon.
 */
export function forecast(m: LiveMonitor, hold: AirHold = { kind: "current" }): Forecast | null {
  const state = m.lastState;
  const model = m.model;
  if (!state || !model) return null;
  const n = m.length;
  const Ta = assumedAir(m, hold);
  const tau = model.screening.tau_s;
  const horizon_s = FORECAST_HORIZON_TAUS * tau;
  const horizon_min = horizon_s / 60;
  const cands = candidates(m);
  const base = { assumed_air_C: Ta, horizon_min, path: [] as Forecast["path"] };
  if (cands.length === 0) return { ...base, minutes_to_limit: null, limit_rule: null, reason: "no rule on the core, surface or mean: nothing to forecast" };
  const now = { core: m.core_C[n - 1]!, surface: m.surface_C[n - 1]!, mean: m.mean_C[n - 1]! };
  const already = cands.find((c) => beyond(now[c.channel], c));
  if (already) {
    return { ...base, minutes_to_limit: 0, limit_rule: already.rule, channel: already.channel, threshold_C: already.threshold_C, reason: `the ${already.channel} is already ${already.dir} ${fmt(already.threshold_C)} (${fmt(now[already.channel])})` };
  }
  const t0 = m.t_s[n - 1]!;
  if (model.path === "exact") {
    const T0 = now.core;
    let best: { c: Candidate; t_s: number } | null = null;
    for (const c of cands) {
      if (!beyond(Ta, c)) continue;
      const t = tau * Math.log((T0 - Ta) / (c.threshold_C - Ta));
      if (!best || t < best.t_s) best = { c, t_s: t };
    }
    const curve = (upTo: number) => Array.from({ length: 41 }, (_, i) => {
      const t = (upTo * i) / 40;
      return { t_s: t0 + t, value_C: Ta + (T0 - Ta) * Math.exp(-t / tau) };
    });
    if (!best) return { ...base, path: curve(horizon_s), minutes_to_limit: null, limit_rule: null, reason: neverReason(cands, Ta) };
    if (best.t_s > horizon_s) {
      return { ...base, path: curve(horizon_s), minutes_to_limit: null, limit_rule: best.c.rule, channel: best.c.channel, threshold_C: best.c.threshold_C, reason: beyondReason(best.c, Ta, best.t_s, horizon_s, tau) };
    }
    return { ...base, path: curve(best.t_s), minutes_to_limit: best.t_s / 60, limit_rule: best.c.rule, channel: best.c.channel, threshold_C: best.c.threshold_C, reason: `with the air held at ${fmt(Ta)} the ${best.c.channel} reaches ${fmt(best.c.threshold_C)} (rule ${best.c.rule}) in ${fmtMin(best.t_s / 60)}: closed form of the lumped body, tau = ${fmtMin(tau / 60)}` };
  }
  // network: march from the stored state with the air held (the first interval ramps from the last reading's air to the held one)
  const dt = horizon_s / MARCH_INTERVALS;
  let s: StepperState = state;
  let prev = now;
  const path: Forecast["path"] = [{ t_s: t0, value_C: now.core }];
  for (let k = 1; k <= MARCH_INTERVALS; k++) {
    s = model.advance(s, t0 + k * dt, Ta, n + k);
    const v = model.read(s);
    let hit: { c: Candidate; t: number } | null = null;
    for (const c of cands) {
      if (!beyond(v[c.channel], c)) continue;
      // linear within the interval: the interval is horizon/240 = tau/80, where the response is close to straight
      const f = (c.threshold_C - prev[c.channel]) / (v[c.channel] - prev[c.channel]);
      const t = (k - 1 + f) * dt;
      if (!hit || t < hit.t) hit = { c, t };
    }
    if (hit) {
      path.push({ t_s: t0 + hit.t, value_C: prev[hit.c.channel] + (v[hit.c.channel] - prev[hit.c.channel]) * (hit.t / dt - (k - 1)) });
      return { ...base, path, minutes_to_limit: hit.t / 60, limit_rule: hit.c.rule, channel: hit.c.channel, threshold_C: hit.c.threshold_C, reason: `with the air held at ${fmt(Ta)} the ${hit.c.channel} reaches ${fmt(hit.c.threshold_C)} (rule ${hit.c.rule}) in ${fmtMin(hit.t / 60)}: the network marched forward from its current state` };
    }
    path.push({ t_s: t0 + k * dt, value_C: v.core });
    prev = { core: v.core, surface: v.surface, mean: v.mean };
  }
  const drawn = cands.find((c) => beyond(Ta, c));
  if (drawn) return { ...base, path, minutes_to_limit: null, limit_rule: drawn.rule, channel: drawn.channel, threshold_C: drawn.threshold_C, reason: `with the air held at ${fmt(Ta)} the ${drawn.channel} does not reach ${fmt(drawn.threshold_C)} within the horizon of ${FORECAST_HORIZON_TAUS}·tau = ${fmtMin(horizon_min)}; beyond it the held air, not the product, decides, so no time is given` };
  return { ...base, path, minutes_to_limit: null, limit_rule: null, reason: neverReason(cands, Ta) };
}

function neverReason(cands: Candidate[], Ta: number): string {
  const c = cands[0]!;
  return `with the air held at ${fmt(Ta)} the product never gets ${c.dir} ${fmt(c.threshold_C)}: it approaches the air temperature${cands.length > 1 ? ", which is inside every rule's threshold" : ""}`;
}

function beyondReason(c: Candidate, Ta: number, t_s: number, horizon_s: number, tau: number): string {
  return `with the air held at ${fmt(Ta)} the ${c.channel} would reach ${fmt(c.threshold_C)} only after ${fmtMin(t_s / 60)}, beyond the horizon of ${FORECAST_HORIZON_TAUS}·tau = ${fmtMin(horizon_s / 60)} (tau = ${fmtMin(tau / 60)}): that far ahead the held air, not the product, decides, so no time is given`;
}
