// Lanes (issue 15): a lane's shipments with their outcomes over time, how often and how long the air at
// each position exceeded each rule threshold, and design profiles learned from the lane's stored traces.
import { z } from "zod";
import { timeBeyond } from "../exposure/timeAbove";
import { isThresholdRule, type LimitSet } from "../exposure/limits";
import { profileSchema, type Profile } from "../design/profile";
import { envelopeProfile, historyEnvelope, HISTORY_PROFILE_CAUTION, type HistoryEnvelope } from "../shipment/historyProfile";
import { getLane, listShipments, getShipment } from "../db/shipments";
import { getTrace } from "../db/traces";
import { createDefinition } from "../db/definitions";
import type { Actor } from "../access/actor";

export interface PositionStat {
  position: string;
  threshold_C: number;
  direction: "above" | "below";
  /** traces at this position on the lane */
  traces: number;
  /** of them, how many went beyond the threshold at all */
  exceeded: number;
  /** minutes beyond: mean over the traces, and the most in one trace; the longest continuous spell */
  mean_min: number;
  max_min: number;
  longest_continuous_min: number;
}

/** The lane, its shipments (newest first) and the excursion statistics per position and threshold. */
export async function laneOverview(laneId: string) {
  const lane = await getLane(laneId);
  if (!lane) return null;
  const shipments = await listShipments({ laneId });
  const thresholds = new Map<string, { threshold_C: number; direction: "above" | "below" }>();
  const samples = new Map<string, Array<{ cumulative_s: number; longest_s: number }>>();
  const positions: Array<{ position: string; traceId: string }> = [];
  for (const s of shipments) {
    const full = await getShipment(s.id);
    if (!full) continue;
    for (const r of (full.limits.body as unknown as LimitSet).rules.filter(isThresholdRule)) {
      const t = r.above_C ?? r.below_C!;
      const direction = r.above_C !== undefined ? "above" : "below";
      thresholds.set(`${direction}:${t}`, { threshold_C: t, direction });
    }
    for (const l of full.loggers) if (l.traceId) positions.push({ position: l.position.trim().toLowerCase(), traceId: l.traceId });
  }
  for (const p of positions) {
    const trace = await getTrace(p.traceId);
    if (!trace) continue;
    for (const [key, th] of thresholds) {
      const e = timeBeyond(trace.series.t_s, trace.series.air_C, th.threshold_C, th.direction);
      const k = `${p.position}|${key}`;
      samples.set(k, [...(samples.get(k) ?? []), { cumulative_s: e.cumulative_s, longest_s: e.longest_s }]);
    }
  }
  const stats: PositionStat[] = [];
  for (const [k, v] of samples) {
    const [position, key] = k.split("|") as [string, string];
    const th = thresholds.get(key)!;
    stats.push({
      position,
      ...th,
      traces: v.length,
      exceeded: v.filter((x) => x.cumulative_s > 0).length,
      mean_min: v.reduce((a, x) => a + x.cumulative_s, 0) / v.length / 60,
      max_min: Math.max(...v.map((x) => x.cumulative_s)) / 60,
      longest_continuous_min: Math.max(...v.map((x) => x.longest_s)) / 60,
    });
  }
  stats.sort((a, b) => a.position.localeCompare(b.position) || a.threshold_C - b.threshold_C);
  return { lane, shipments, stats };
}

export const historyRequestSchema = z.object({
  shipmentIds: z.array(z.string().min(1)).min(1, { message: "choose at least one shipment" }).max(500),
  /** only loggers at this position (case-insensitive); none: every logger */
  position: z.string().trim().max(120).optional().transform((v) => v || undefined),
  align: z.enum(["departure", "time-of-day"], { error: "align by departure or by time of day" }).default("departure"),
  percentile: z.coerce.number({ error: "percentile must be a number from 0 to 100" }).min(0, { message: "percentile must be from 0 to 100" }).max(100, { message: "percentile must be from 0 to 100" }),
  step_min: z.coerce.number({ error: "step must be a number of minutes" }).refine((m) => Number.isInteger(Math.round(m * 60 * 1e6) / 1e6) && m * 60 >= 10 && m <= 1440, { message: "step must be a whole number of seconds, from 10 s to 1440 min" }),
  smooth_steps: z.coerce.number().int({ message: "smoothing must be an odd whole number of steps" }).min(1).max(999).refine((k) => k % 2 === 1, { message: "smoothing must be an odd whole number of steps (1 = none)" }).default(1),
  timeZone: z.string().trim().optional().transform((v) => v || undefined),
  name: z.string().trim().max(120).optional(),
});
export type HistoryRequest = z.input<typeof historyRequestSchema>;

export interface HistoryBuild {
  envelope: HistoryEnvelope;
  profile: Profile;
  sources: Array<{ file: string; sha256: string; shipment: string; trace_id: string; position: string }>;
  caution: string;
}

/**
 * The envelope and profile of the chosen shipments' air (each logger's trace, or only those at one
 * position); departure is each shipment's actual departure, else the planned one, else the trace's start.
 */
export async function buildLaneProfile(laneId: string, request: HistoryRequest): Promise<{ ok: true; build: HistoryBuild } | { ok: false; field: string; message: string }> {
  const parsed = historyRequestSchema.safeParse(request);
  if (!parsed.success) return { ok: false, field: String(parsed.error.issues[0]!.path[0] ?? "form"), message: parsed.error.issues[0]!.message };
  const r = parsed.data;
  const lane = await getLane(laneId);
  if (!lane) return { ok: false, field: "form", message: "that lane does not exist" };
  const traces = [];
  const sources: HistoryBuild["sources"] = [];
  for (const id of r.shipmentIds) {
    const s = await getShipment(id);
    if (!s || s.laneId !== laneId) return { ok: false, field: "shipmentIds", message: `shipment ${id} is not on this lane` };
    const departure = s.actualDepartureAt ?? s.plannedDepartureAt;
    for (const l of s.loggers) {
      if (!l.traceId || (r.position && l.position.trim().toLowerCase() !== r.position.toLowerCase())) continue;
      const t = await getTrace(l.traceId);
      if (!t) continue;
      const dep_s = departure ? departure.getTime() / 1000 : undefined;
      traces.push({ t_s: t.series.t_s, air_C: t.series.air_C, ...(dep_s !== undefined && dep_s <= t.series.t_s[0]! ? { departure_s: dep_s } : {}) });
      sources.push({ file: t.meta.fileName, sha256: t.meta.sha256, shipment: s.reference, trace_id: t.meta.id, position: l.position });
    }
  }
  if (traces.length === 0) return { ok: false, field: "position", message: r.position ? `no stored trace at position '${r.position}' in the chosen shipments` : "the chosen shipments have no stored traces" };
  const step_s = Math.round(r.step_min * 60);
  let envelope: HistoryEnvelope;
  try {
    envelope = historyEnvelope(traces, { percentile: r.percentile, step_s, align: r.align, smooth_steps: r.smooth_steps, timeZone: r.timeZone });
  } catch (e) {
    return { ok: false, field: "step_min", message: (e as Error).message };
  }
  const name = r.name || `${lane.name}: P${r.percentile} of ${traces.length} trace${traces.length === 1 ? "" : "s"}${r.position ? ` (${r.position})` : ""}, ${r.step_min} min steps`;
  const profile = { ...envelopeProfile(envelope, step_s, name.slice(0, 120)), percentile: r.percentile, step_min: r.step_min, sources };
  const valid = profileSchema.safeParse(profile);
  if (!valid.success) return { ok: false, field: "step_min", message: `${valid.error.issues[0]!.path.join(".")}: ${valid.error.issues[0]!.message} (choose a longer step)` };
  return { ok: true, build: { envelope, profile: valid.data, sources, caution: HISTORY_PROFILE_CAUTION } };
}

/** Saves the profile as a new profile definition (version 1) whose body lists the shipments and traces used. */
export async function saveLaneProfile(laneId: string, request: HistoryRequest, actor: Actor): Promise<{ ok: true; definitionId: string } | { ok: false; field: string; message: string }> {
  const built = await buildLaneProfile(laneId, request);
  if (!built.ok) return built;
  const def = await createDefinition("profile", built.build.profile, actor);
  return { ok: true, definitionId: def.id };
}

