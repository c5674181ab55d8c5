import { EventEmitter } from "node:events";
import { LiveMonitor, type AirHold } from "../live";
import { modelChoiceSchema, packSchema, productSchema, type Pack, type Product } from "../thermal/definitions";
import { limitSetSchema, type LimitSet } from "../exposure/limits";
import { getDefinition } from "../db/definitions";
import { getMonitor, monitorArrivals, monitorReadings, type StoredMonitor } from "../db/monitors";
import { storedRefusal } from "./storedRefusal";

/**
 * The live state of each monitor in this server process: a LiveMonitor rebuilt once from the stored
 * readings (one incremental pass), then advanced by each accepted batch. The readings are the record;
 * this state is derived and can always be rebuilt. Work on one monitor is serialised (`withMonitor`), so
 * two batches never interleave between checking and storing.
 */
export interface LiveEntry {
  monitor: StoredMonitor;
  live: LiveMonitor;
  product: Product;
  pack?: Pack;
  limits: LimitSet;
  hold: AirHold;
  /** times batches were received, epoch s (staleness is judged on arrivals, not on the device's clock) */
  arrivals_s: number[];
}

interface Registry {
  entries: Map<string, Promise<LiveEntry>>;
  locks: Map<string, Promise<unknown>>;
  events: EventEmitter;
}

const g = globalThis as unknown as { __corelagLive?: Registry };
function registry(): Registry {
  if (!g.__corelagLive) {
    const events = new EventEmitter();
    events.setMaxListeners(0);
    g.__corelagLive = { entries: new Map(), locks: new Map(), events };
  }
  return g.__corelagLive;
}

/** Subscribes to a monitor's changes (new readings, alerts); returns the unsubscribe function. */
export function onMonitorChange(id: string, listener: () => void): () => void {
  const ev = registry().events;
  ev.on(id, listener);
  return () => ev.off(id, listener);
}

export function notifyMonitorChange(id: string): void {
  registry().events.emit(id);
}

/** The monitor's definitions, re-validated as a review re-validates them; a refusal names the definition. */
export async function loadMonitorDefinitions(m: { productId: string; packId: string | null; limitsId: string }): Promise<{ ok: true; product: Product; pack?: Pack; limits: LimitSet } | { ok: false; field: "product_id" | "pack_id" | "limits_id"; message: string }> {
  const productDef = await getDefinition<Product>(m.productId);
  if (!productDef || productDef.kind !== "product") return { ok: false, field: "product_id", message: "that product does not exist" };
  const packDef = m.packId ? await getDefinition<Pack>(m.packId) : null;
  if (m.packId && (!packDef || packDef.kind !== "pack")) return { ok: false, field: "pack_id", message: "that pack does not exist" };
  const limitsDef = await getDefinition<LimitSet>(m.limitsId);
  if (!limitsDef || limitsDef.kind !== "limits") return { ok: false, field: "limits_id", message: "that limit set does not exist" };
  const product = productSchema.safeParse(productDef.body);
  if (!product.success) return { ok: false, field: "product_id", message: storedRefusal("product", productDef, product.error) };
  const pack = packDef ? packSchema.safeParse(packDef.body) : undefined;
  if (pack && !pack.success) return { ok: false, field: "pack_id", message: storedRefusal("pack", packDef!, pack.error) };
  const limits = limitSetSchema.safeParse(limitsDef.body);
  if (!limits.success) return { ok: false, field: "limits_id", message: storedRefusal("limit set", limitsDef, limits.error) };
  if (!pack?.data && product.data.h_W_m2K === undefined) return { ok: false, field: "pack_id", message: "this product has no surface coefficient of its own: choose a pack" };
  const bad = limits.data.rules.find((r) => r.channel === "probe");
  if (bad) return { ok: false, field: "limits_id", message: `rule '${bad.id}' is on the probe channel; a monitor's forecast and alerts work on the air and the modelled core, surface and mean` };
  return { ok: true, product: product.data, ...(pack?.data ? { pack: pack.data } : {}), limits: limits.data };
}

async function build(id: string): Promise<LiveEntry> {
  const monitor = await getMonitor(id);
  if (!monitor) throw new MonitorMissing(id);
  const defs = await loadMonitorDefinitions(monitor);
  if (!defs.ok) throw new Error(`monitor ${id}: ${defs.message}`);
  const live = new LiveMonitor({ product: defs.product, pack: defs.pack, limits: defs.limits, model: modelChoiceSchema.parse(monitor.model) });
  const readings = await monitorReadings(id);
  if (readings.length) live.add(readings.map((r) => ({ t_s: r.t_s, air_C: r.air_C, ...(r.probe_C !== null ? { probe_C: r.probe_C } : {}) })));
  const hold: AirHold = monitor.airHold === "mean" ? { kind: "mean", last: monitor.airHoldCount ?? 6 } : { kind: "current" };
  return { monitor, live, product: defs.product, pack: defs.pack, limits: defs.limits, hold, arrivals_s: await monitorArrivals(id) };
}

export class MonitorMissing extends Error {
  constructor(id: string) {
    super(`no monitor ${id}`);
  }
}

/** The live entry of a monitor (built on first use in this process). */
export async function liveEntry(id: string): Promise<LiveEntry> {
  const r = registry();
  let p = r.entries.get(id);
  if (!p) {
    p = build(id);
    r.entries.set(id, p);
    p.catch(() => r.entries.delete(id));
  }
  return p;
}

/** Forgets a monitor's live state (after closing, or in tests). */
export function dropLiveEntry(id: string): void {
  registry().entries.delete(id);
}

/** Runs `work` with no other work on the same monitor in between. */
export async function withMonitor<T>(id: string, work: () => Promise<T>): Promise<T> {
  const r = registry();
  const before = r.locks.get(id) ?? Promise.resolve();
  const run = before.then(work, work);
  const tail = run.catch(() => undefined);
  r.locks.set(id, tail);
  try {
    return await run;
  } finally {
    if (r.locks.get(id) === tail) r.locks.delete(id);
  }
}
