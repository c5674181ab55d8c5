import { csvRow } from "./csv";
import type { ReviewResult } from "./runReview";

const iso = (t_s: number) => new Date(Math.round(t_s * 1000)).toISOString();
const fix = (x: number | undefined) => (x === undefined || !Number.isFinite(x) ? "" : x.toFixed(4));

/** The predicted series as CSV: one row per trace sample, UTC times, °C. */
export function seriesCsv(t_s: Float64Array, channels: Array<{ name: string; values: Float64Array | null }>): string {
  const present = channels.filter((c) => c.values) as Array<{ name: string; values: Float64Array }>;
  const lines = [csvRow(["time_utc", ...present.map((c) => c.name)])];
  for (let i = 0; i < t_s.length; i++) lines.push(csvRow([iso(t_s[i]!), ...present.map((c) => fix(c.values[i]))]));
  return lines.join("\r\n") + "\r\n";
}

/**
 * The findings as CSV: a header block with the review's identity, then one row per rule and one per
 * excursion. Text cells go through csvRow, which neutralises spreadsheet formulas (a rule id or title
 * such as "=cmd|…" is written as text).
 */
export interface FindingsMeta {
  id: string;
  title: string;
  traceSha256: string;
  resultSha256: string;
  /** the sign-off: null fields while the review is open */
  decision: string | null;
  signComment: string | null;
  /** what the signature means (21 CFR 11.50), as recorded at sign-off */
  signMeaning: string | null;
  signedBy: string | null;
  signedAt: Date | null;
}

export function findingsCsv(meta: FindingsMeta, r: ReviewResult): string {
  const rows: Array<Array<string | number>> = [
    ["review", meta.id],
    ["title", meta.title],
    ["trace_sha256", meta.traceSha256],
    ["result_sha256", meta.resultSha256],
    ["engine_version", r.engine_version],
    ["window", `${r.window.start}/${r.window.end}`],
    ["suggested_outcome", r.outcome],
    ["status", meta.decision ? "signed" : "open"],
    ["decision", meta.decision ?? "not signed off"],
    ["decision_comment", meta.signComment ?? ""],
    ["signed_by", meta.signedBy ?? ""],
    ["signed_at_utc", meta.signedAt ? meta.signedAt.toISOString() : ""],
    ["signature_meaning", meta.signMeaning ?? ""],
    [],
    ["rule", "channel", "direction", "threshold_C", "cumulative_min", "longest_continuous_min", "extreme_C", "guard_K", "status", "reason"],
    ...r.rules.map((x) => [x.id, x.channel, x.direction, x.threshold_C, x.cumulative_min, x.longest_continuous_min, x.extreme_C, x.guard_K, x.status, x.reason]),
    [],
    ["rule", "excursion_start_utc", "excursion_end_utc", "duration_min", "peak_C", "degree_min"],
    ...r.rules.flatMap((x) => x.excursions.map((e) => [x.id, e.start, e.end, e.duration_min, e.peak_C, e.degree_min])),
    ...consequenceRows(r),
    [],
    ...r.cautions.map((c) => ["caution", c]),
  ];
  return rows.map((row) => csvRow(row)).join("\r\n") + "\r\n";
}

/** Growth and shelf-life estimates and rules, when the review has them (none: no rows, as before engine 0.5.0). */
function consequenceRows(r: ReviewResult): Array<Array<string | number>> {
  if (!r.consequences && !r.consequence_rules) return [];
  const n = (x: number | null | undefined) => (x === null || x === undefined ? "" : x);
  return [
    [],
    ["consequence", "model", "kind", "channel", "log10_increase", "shelf_life_consumed_days", "shelf_life_consumed_percent", "remaining_days_at_C", "storage_C", "lower", "upper", "guard_K", "minutes_above", "comparison_threshold_C"],
    ...(r.consequences ?? []).map((c) => [c.id, c.model, c.kind, c.channel, n(c.log10_increase), n(c.shelf_life_consumed_days), n(c.shelf_life_consumed_percent), n(c.remaining_days_at_C), n(c.storage_C), c.lower, c.upper, c.guard_K, c.comparison.minutes_above, c.comparison.threshold_C]),
    [],
    ["consequence_rule", "kind", "model", "channel", "limit", "central", "lower", "upper", "reached_at_utc", "status", "reason"],
    ...(r.consequence_rules ?? []).map((x) => [x.id, x.kind, x.model, x.channel, x.limit, x.central, x.lower, x.upper, x.reached_at ?? "", x.status, x.reason]),
  ];
}
