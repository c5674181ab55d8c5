import { displaySeries } from "../display/series";
import { isThresholdRule } from "../exposure/limits";
import { thresholdWords, type ThresholdWords } from "../live/words";
import { alertHistory, getMonitor } from "../db/monitors";
import { getDefinition } from "../db/definitions";
import { liveEntry } from "./liveRegistry";
import { stateJson, viewOf, type MonitorStateJson } from "./monitors";

/** What the live page draws and lists; sent whole on every change (series decimated for display). */
export interface LivePayload {
  id: string;
  name: string;
  status: "open" | "closed";
  shipmentId: string | null;
  serial: string | null;
  productName: string;
  packName: string | null;
  limitsName: string;
  alertLeadMin: number;
  webhooks: string[];
  emails: string[];
  webhookSecret: string;
  traceId: string | null;
  reviewId: string | null;
  readingCount: number;
  /** chart: times (ms), air and core (NaN past the last reading), and the forecast line (NaN before it) */
  times_ms: number[];
  air: number[];
  core: number[];
  forecastLine: number[];
  thresholds: Array<{ value_C: number; label: string; rules: string[] }>;
  state: MonitorStateJson;
  rules: Array<{ id: string; channel: string; status_so_far: string; cumulative_min: number; remaining_min?: number; reason: string }>;
  forecast: { channel?: string; threshold_C?: number; crossing_ms: number | null } | null;
  /** thresholds beyond now (with each rule's allowance) and the forecast, in words (lib/live/words.ts) */
  words: ThresholdWords;
  stale: { stale: boolean; silent_s: number; interval_s: number | null };
  model: { path: string; tau_s: number; reason: string; step_s: number | null } | null;
  alerts: Array<{ id: string; key: string; kind: string; rule: string | null; message: string; raisedAt: string; clearedAt: string | null; /** cleared because the monitor was closed, not because the condition ended */ clearedByClose: boolean; deliveries: Array<{ id: string; event: string; channel: string; target: string; attempt: number; at: string; ok: boolean; httpStatus: number | null; error: string | null; nextAt: string | null }> }>;
}

export async function livePayload(id: string, now = new Date()): Promise<LivePayload | null> {
  const m = await getMonitor(id);
  if (!m) return null;
  const entry = await liveEntry(id);
  const v = viewOf({ ...entry, monitor: m }, now);
  const { live } = entry;
  const disp = displaySeries({
    t_s: live.t_s,
    channels: { air: live.air_C, core: live.core_C },
    thresholds: entry.limits.rules.filter(isThresholdRule).map((r) => ({ value_C: (r.above_C ?? r.below_C)!, direction: r.above_C !== undefined ? ("above" as const) : ("below" as const), channels: [r.channel === "air" ? "air" : "core"] })),
  });
  const times_ms = [...disp.times_ms];
  const air = [...(disp.channels.air ?? [])];
  const core = [...(disp.channels.core ?? [])];
  const forecastLine = times_ms.map(() => NaN);
  const path = v.forecast?.path ?? [];
  if (path.length > 1 && m.status === "open") {
    forecastLine[forecastLine.length - 1] = core[core.length - 1]!;
    for (const p of path.slice(1)) {
      times_ms.push(Math.round(p.t_s * 1000));
      air.push(NaN);
      core.push(NaN);
      forecastLine.push(Math.round(p.value_C * 1000) / 1000);
    }
  }
  const byValue = new Map<number, string[]>();
  for (const r of entry.limits.rules.filter(isThresholdRule)) {
    const value = (r.above_C ?? r.below_C)!;
    byValue.set(value, [...(byValue.get(value) ?? []), `${r.id} (${r.channel})`]);
  }
  const [product, pack, limits] = await Promise.all([getDefinition<{ name: string }>(m.productId), m.packId ? getDefinition<{ name: string }>(m.packId) : null, getDefinition<{ name: string }>(m.limitsId)]);
  const history = await alertHistory(id);
  const n = live.length;
  const last = n ? { core: live.core_C[n - 1]!, surface: live.surface_C[n - 1]!, mean: live.mean_C[n - 1]! } : null;
  const words = thresholdWords(entry.limits, v.rules, last, v.forecast, m.alertLeadMin);
  const fcHit = v.forecast && v.forecast.minutes_to_limit !== null ? live.t_s[live.length - 1]! * 1000 + v.forecast.minutes_to_limit * 60_000 : null;
  return {
    id: m.id, name: m.name, status: m.status, shipmentId: m.shipmentId, serial: m.serial,
    productName: product?.name ?? m.productId, packName: pack?.name ?? null, limitsName: limits?.name ?? m.limitsId,
    alertLeadMin: m.alertLeadMin, webhooks: m.webhooks, emails: m.emails, webhookSecret: m.webhookSecret, traceId: m.traceId, reviewId: m.reviewId,
    readingCount: live.length,
    times_ms, air, core, forecastLine,
    thresholds: [...byValue].map(([value_C, rules]) => ({ value_C, label: `${value_C} °C`, rules })),
    state: stateJson(v),
    rules: v.rules.map((r) => ({ id: r.id, channel: r.channel, status_so_far: r.status_so_far, cumulative_min: r.cumulative_min, ...(r.remaining_min !== undefined ? { remaining_min: r.remaining_min } : {}), reason: r.reason })),
    forecast: v.forecast ? { channel: v.forecast.channel, threshold_C: v.forecast.threshold_C, crossing_ms: fcHit } : null,
    words,
    stale: { stale: v.stale.stale, silent_s: v.stale.silent_s, interval_s: v.stale.interval_s },
    model: live.model ? { path: live.model.path, tau_s: live.model.screening.tau_s, reason: live.model.screening.reason, step_s: live.model.step_s } : null,
    alerts: history.map((a) => ({
      id: a.id, key: a.key, kind: a.kind, rule: a.rule, message: a.message, raisedAt: a.raisedAt.toISOString(), clearedAt: a.clearedAt?.toISOString() ?? null,
      clearedByClose: m.closedAt !== null && a.clearedAt !== null && a.clearedAt.getTime() >= m.closedAt.getTime(),
      deliveries: a.deliveries.map((d) => ({ ...d, at: d.at.toISOString(), nextAt: d.nextAt?.toISOString() ?? null })),
    })),
  };
}
