import type { Forecast } from "./forecast";
import type { RuleRunning } from "./monitor";
import type { Staleness } from "./stale";

/** A condition that raises an alert while it holds. The key is what "once per condition" means: one open alert per key. */
export interface AlertCondition {
  key: string;
  kind: "forecast" | "rule-fail" | "stale";
  rule: string | null;
  message: string;
}

/**
 * The deadband of a forecast alert, min: once raised, it holds until the forecast moves beyond the lead by this
 * much (or says "never"), so a forecast hovering about the lead does not raise and clear at every reading.
 * A deadband on the clearing side is common practice in alarm management (ANSI/ISA-18.2); its size here, a
 * fifth of the lead and at least 5 min, is our choice, not a published value.
 */
export function forecastDeadbandMin(lead_min: number): number {
  return Math.max(5, lead_min / 5);
}

/**
 * The conditions that hold now: the forecast crosses a rule's threshold within `lead_min` (including already beyond it;
 * for an alert already open, within the lead plus its deadband), a rule fails, the monitor is stale. `last_t_s`, the
 * last reading's time, is named in the forecast and rule messages: in a replay or a late batch the server's clock
 * (when the alert is raised) is not the trip's time.
 */
export function alertConditions(rules: readonly RuleRunning[], fc: Forecast | null, stale: Staleness, lead_min: number, openKeys: readonly string[] = [], last_t_s?: number): AlertCondition[] {
  const asOf = last_t_s === undefined ? "" : ` (as of the reading at ${new Date(last_t_s * 1000).toISOString().slice(0, 16).replace("T", " ")} UTC)`;
  const out: AlertCondition[] = [];
  const forecastOpen = fc?.limit_rule ? openKeys.includes(`forecast:${fc.limit_rule}`) : false;
  const within = lead_min + (forecastOpen ? forecastDeadbandMin(lead_min) : 0);
  if (fc && fc.minutes_to_limit !== null && fc.minutes_to_limit <= within && fc.limit_rule) {
    out.push({ key: `forecast:${fc.limit_rule}`, kind: "forecast", rule: fc.limit_rule, message: (fc.minutes_to_limit === 0 ? fc.reason : `threshold crossed within ${Math.round(fc.minutes_to_limit)} min (alert lead ${lead_min} min): ${fc.reason}`) + asOf });
  }
  for (const r of rules) if (r.status_so_far === "fail") out.push({ key: `rule-fail:${r.id}`, kind: "rule-fail", rule: r.id, message: `rule ${r.id} fails: ${r.reason}${asOf}` });
  if (stale.stale) out.push({ key: "stale", kind: "stale", rule: null, message: `no reading for ${span(stale.silent_s)} (readings usually arrive every ${span(stale.interval_s ?? 0)})` });
  return out;
}

/** Which alerts to raise (conditions without an open alert) and which to clear (open alerts whose condition ended). */
export function alertChanges(conditions: readonly AlertCondition[], openKeys: readonly string[]): { raise: AlertCondition[]; clear: string[] } {
  const now = new Set(conditions.map((c) => c.key));
  const open = new Set(openKeys);
  return { raise: conditions.filter((c) => !open.has(c.key)), clear: openKeys.filter((k) => !now.has(k)) };
}

/** A duration in words: seconds under 90 s (a replay at 600× arrives every second or so), else minutes. */
function span(s: number): string {
  return s < 1 ? "under a second" : s < 90 ? `${Math.round(s)} s` : `${Math.round(s / 60)} min`;
}
