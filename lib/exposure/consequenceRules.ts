import type { ConsequenceEstimate } from "../consequence/evaluate";
import type { ConsequenceModel } from "../consequence/definitions";
import { isConsequenceRule, ruleChannel, type ConsequenceRule, type LimitSet } from "./limits";
import type { RuleStatus } from "./rules";

export interface ConsequenceRuleFinding {
  id: string;
  kind: "growth" | "shelf_life";
  model: string;
  channel: string;
  quantity: "log10_increase" | "shelf_life_consumed_percent";
  limit: number;
  central: number;
  lower: number;
  upper: number;
  guard_K: number;
  /** when the central estimate reaches the limit, epoch s, or null */
  reached_at_s: number | null;
  status: RuleStatus;
  reason: string;
}

const fmt = (x: number) => (Math.abs(x) >= 100 ? x.toFixed(0) : Math.abs(x) >= 1 ? x.toFixed(2) : x.toPrecision(3)).replace(/\.?0+$/, (m) => (m.includes(".") ? "" : m));

/** The product model a consequence rule names (a shelf-life rule without a model takes the product's only one), or why not. */
export function ruleModel(rule: ConsequenceRule, models: readonly ConsequenceModel[]): { ok: true; model: ConsequenceModel } | { ok: false; message: string } {
  const kindWord = rule.kind === "growth" ? "growth" : "shelf-life";
  const ofKind = models.filter((m) => m.kind === rule.kind);
  if (rule.model !== undefined) {
    const m = models.find((x) => x.id === rule.model);
    if (!m) return { ok: false, message: `rule '${rule.id}' names the ${kindWord} model '${rule.model}', which the product does not have${ofKind.length ? ` (it has ${ofKind.map((x) => `'${x.id}'`).join(", ")})` : ""}` };
    if (m.kind !== rule.kind) return { ok: false, message: `rule '${rule.id}' is a ${kindWord} rule, but the product's model '${m.id}' is a ${m.kind === "growth" ? "growth" : "shelf-life"} model` };
    return { ok: true, model: m };
  }
  if (ofKind.length === 1) return { ok: true, model: ofKind[0]! };
  return { ok: false, message: ofKind.length === 0 ? `rule '${rule.id}' needs a ${kindWord} model on the product, which has none` : `rule '${rule.id}': the product has ${ofKind.length} ${kindWord} models; name one with "model"` };
}

/** The first consequence rule of a limit set that the product cannot serve, with its index and why. */
export function unmatchedConsequenceRule(limits: LimitSet, models: readonly ConsequenceModel[]): { index: number; id: string; message: string } | null {
  for (let i = 0; i < limits.rules.length; i++) {
    const r = limits.rules[i]!;
    if (!isConsequenceRule(r)) continue;
    const m = ruleModel(r, models);
    if (!m.ok) return { index: i, id: r.id, message: m.message };
  }
  return null;
}

/**
 * Judges a growth or shelf-life rule on a consequence estimate, like the threshold rules (ISO 14253-1 decision
 * rules): "pass" only if the estimate at the unfavourable end of the guard band (T + u) is within the limit,
 * "fail" only if the estimate at the favourable end (T − u, with bridged data adding nothing) exceeds it,
 * "inconclusive" between; a channel that crosses bridged data can at best be inconclusive.
 */
export function judgeConsequenceRule(rule: ConsequenceRule, est: ConsequenceEstimate, bridgedSpans: number): ConsequenceRuleFinding {
  const limit = rule.kind === "growth" ? rule.max_log10_increase : rule.max_consumed_percent;
  const what = rule.kind === "growth" ? `log10 increase of ${est.model}` : `shelf life consumed (${est.model})`;
  const unit = rule.kind === "growth" ? " log10" : " %";
  const u = est.guard_K;
  const q = (x: number) => `${fmt(x)}${unit}`;
  let status: RuleStatus;
  let reason: string;
  if (est.lower > limit) {
    status = "fail";
    reason = u > 0 || bridgedSpans > 0
      ? `fails even in the shipment's favour (temperatures ${fmt(u)} K lower${bridgedSpans > 0 ? ", bridged gaps left out" : ""}): ${what} ${q(est.lower)} > ${q(limit)} allowed`
      : `fails: ${what} ${q(est.central)} > ${q(limit)} allowed`;
  } else if (est.upper > limit) {
    status = "inconclusive";
    reason = `inside the ±${fmt(u)} K guard band: ${what} ${q(est.lower)} to ${q(est.upper)} against ${q(limit)} allowed (central ${q(est.central)})`;
  } else if (bridgedSpans > 0) {
    status = "inconclusive";
    reason = `within the limit (${what} at most ${q(est.upper)} ≤ ${q(limit)}), but judged across ${bridgedSpans} data gap(s) bridged by linear interpolation`;
  } else {
    status = "pass";
    reason = u > 0 ? `passes with temperatures ${fmt(u)} K higher: ${what} ${q(est.upper)} ≤ ${q(limit)} allowed` : `passes: ${what} ${q(est.central)} ≤ ${q(limit)} allowed`;
  }
  return {
    id: rule.id,
    kind: rule.kind,
    model: est.model,
    channel: ruleChannel(rule),
    quantity: est.quantity,
    limit,
    central: est.central,
    lower: est.lower,
    upper: est.upper,
    guard_K: u,
    reached_at_s: est.timeTo(limit),
    status,
    reason,
  };
}
