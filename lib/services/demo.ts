import { readFileSync } from "node:fs";
import path from "node:path";
import { importCsv } from "../trace";
import { packSchema, productSchema } from "../thermal/definitions";
import { EXAMPLE_PROFILES } from "../design/profile";
import { limitSetSchema } from "../exposure/limits";
import { createTrace } from "../db/traces";
import { createDefinition, listLatestDefinitions } from "../db/definitions";
import { db } from "../db/client";
import { DEMO_DESIGN_NAMES, DEMO_MONITOR, DEMO_SHIPMENT } from "./demoNames";
import { createMonitorService } from "./monitors";
import { createShipmentFromForm, registerLogger, reviewShipmentHere } from "./shipments";
import { attachTraces, getShipment } from "../db/shipments";
import { runAndStoreReview, signOff } from "./reviews";
import type { Actor } from "../access/actor";

/** The demo loader writes as itself; its historic sign-off is by the invented QA person it names. */
const DEMO_ACTOR: Actor = { kind: "system", what: "demo" };

const DEMO = path.resolve(__dirname, "..", "..", "public", "demo");
/** The demo's design files (their names are DEMO_DESIGN_NAMES). */
const DEMO_DESIGN = { product: "ready-meal-shaped.product.json", pack: "tote.pack.json", limits: "tote-design.limits.json" } as const;

/** Whether the database is empty enough for the demo (no traces, no definitions). */
export async function demoWanted(): Promise<boolean> {
  return (await db.trace.count()) === 0 && (await db.definition.count()) === 0;
}

/**
 * Loads the invented demo scenario (public/demo, written by scripts/generate-demo.ts) into an empty database.
 * Needs an administrator (the demo accounts, createDemoAccounts): the demo monitor's device token is theirs.
 */
export async function loadDemoIfEmpty(): Promise<"loaded" | "skipped"> {
  if (!(await demoWanted())) return "skipped";
  const product = productSchema.parse(JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8")));
  const limits = limitSetSchema.parse(JSON.parse(readFileSync(path.join(DEMO, "ready-meal.limits.json"), "utf8")));
  const p = await createDefinition("product", product, DEMO_ACTOR);
  const l = await createDefinition("limits", limits, DEMO_ACTOR);
  // A historic record an auditor can open: the same route a week earlier, reviewed and signed off.
  const earlyName = "route7-tote3-0609.csv";
  const earlyBytes = readFileSync(path.join(DEMO, earlyName));
  const earlyTrace = await createTrace({ name: "Route 7 north, tote 3, 9 June (demo)", fileName: earlyName, bytes: earlyBytes, imported: importCsv(earlyBytes), actor: DEMO_ACTOR });
  const early = await runAndStoreReview({ title: "Route 7, 9 June: tote 3, door openings only (demo)", traceId: earlyTrace, productId: p.id, limitsId: l.id }, DEMO_ACTOR);
  if (!early.ok) throw new Error(`demo review failed: ${early.message}`);
  const signed = await signOff(early.reviewId, {
    reviewer: "Mara Quellen (QA, invented)",
    decision: "accept",
    comment: "Air rose only at the five drops; the core estimate stayed below 5 °C. Released.",
  }, DEMO_ACTOR);
  if (!signed.ok) throw new Error(`demo sign-off failed: ${signed.message}`);
  // The open review: the dock delay of 16 June, awaiting a decision.
  const fileName = "route7-tote3.csv";
  const bytes = readFileSync(path.join(DEMO, fileName));
  const traceId = await createTrace({ name: "Route 7 north, tote 3 (demo)", fileName, bytes, imported: importCsv(bytes), actor: DEMO_ACTOR });
  const res = await runAndStoreReview({ title: "Route 7, 16 June: tote 3 after the dock delay (demo)", traceId, productId: p.id, limitsId: l.id }, DEMO_ACTOR);
  if (!res.ok) throw new Error(`demo review failed: ${res.message}`);
  // For the design pages: a probe test, a shaped product in a tote with a gel pack, and example profiles.
  const probeBytes = readFileSync(path.join(DEMO, "probe-test.csv"));
  await createTrace({ name: "Probe test, tray with simulant (demo)", fileName: "probe-test.csv", bytes: probeBytes, imported: importCsv(probeBytes), actor: DEMO_ACTOR });
  await createDefinition("product", productSchema.parse(JSON.parse(readFileSync(path.join(DEMO, DEMO_DESIGN.product), "utf8"))), DEMO_ACTOR);
  await createDefinition("pack", packSchema.parse(JSON.parse(readFileSync(path.join(DEMO, DEMO_DESIGN.pack), "utf8"))), DEMO_ACTOR);
  // the example plan without its air rule: a route's air is not something a pack can change
  await createDefinition("limits", limitSetSchema.parse(JSON.parse(readFileSync(path.join(DEMO, DEMO_DESIGN.limits), "utf8"))), DEMO_ACTOR);
  for (const profile of EXAMPLE_PROFILES) await createDefinition("profile", profile, DEMO_ACTOR);
  // A live monitor with no readings yet: `corelag simulate` feeds it the 16 June trace on request (README). Its
  // device token is an API token of the first administrator: make the demo accounts before loading the demo.
  const live = await createMonitorService({ name: DEMO_MONITOR.name, product_id: p.id, limits_id: l.id, shipment_id: DEMO_SHIPMENT.reference, serial: DEMO_SHIPMENT.serial, alert: { lead_min: 60 } }, DEMO_ACTOR, DEMO_MONITOR.token);
  if (!live.ok) throw new Error(`demo monitor failed: ${live.message}`);
  await loadDemoShipment(p.id, l.id, traceId);
  return "loaded";
}

/**
 * The unit users work in: the 16 June load as a shipment on the demo lane, tote 3's logger registered with its
 * (invented) calibration, the 16 June trace attached, and the shipment review run, awaiting sign-off.
 */
async function loadDemoShipment(productId: string, limitsId: string, traceId: string): Promise<void> {
  const must = <T extends { ok: boolean }>(what: string, r: T) => {
    if (!r.ok) throw new Error(`demo ${what} failed: ${(r as { message?: string }).message ?? "refused"}`);
    return r as Extract<T, { ok: true }>;
  };
  must("logger", await registerLogger({ serial: DEMO_SHIPMENT.serial, description: "Air logger of tote 3, Route 7 north (demo, invented)", accuracyK: 0.5, lastCalibrationAt: "2026-01-14T09:00Z", nextCalibrationAt: "2027-01-14T09:00Z" }, DEMO_ACTOR));
  const { shipmentId } = must("shipment", await createShipmentFromForm({
    reference: DEMO_SHIPMENT.reference,
    newLaneName: DEMO_SHIPMENT.lane, newLaneOrigin: "Central depot (invented)", newLaneDestination: "Five stores on the northern ring (invented)",
    carrier: "Own fleet (invented)", vehicle: "Truck 12 (invented)",
    // the trace runs 05:00–17:00 local time (CEST); the dock delay made the load two hours late
    plannedDepartureAt: "2026-06-16T03:00Z", plannedArrivalAt: "2026-06-16T13:00Z", actualDepartureAt: "2026-06-16T03:00Z", actualArrivalAt: "2026-06-16T15:00Z",
    notes: "Invented demo load: one logger (tote 3) stands for the ready meals in all eight totes. Add loggers and upload their files to see a load with several positions.",
    limitsId,
  }, [{ position: DEMO_SHIPMENT.position, serial: DEMO_SHIPMENT.serial, products: [{ productId, governing: true }] }], DEMO_ACTOR));
  const entry = (await getShipment(shipmentId))!.loggers[0]!;
  await attachTraces(shipmentId, [{ shipmentLoggerId: entry.id, traceId }], DEMO_ACTOR);
  must("shipment review", await reviewShipmentHere(shipmentId, DEMO_ACTOR));
}

/**
 * The stored demo inputs for a sizing study (summer profile, shaped tray, tote, design limit set), as
 * the size page's query; null when any of them is missing (no demo loaded, or renamed).
 */
export async function demoSizingQuery(): Promise<{ source: string; product: string; pack: string; limits: string } | null> {
  const find = async (kind: "product" | "pack" | "limits" | "profile", name: string) => (await listLatestDefinitions(kind)).find((d) => d.name === name)?.id;
  const [profile, product, pack, limits] = await Promise.all([
    find("profile", EXAMPLE_PROFILES[0]!.name),
    find("product", DEMO_DESIGN_NAMES.product),
    find("pack", DEMO_DESIGN_NAMES.pack),
    find("limits", DEMO_DESIGN_NAMES.limits),
  ]);
  return profile && product && pack && limits ? { source: `profile:${profile}`, product, pack, limits } : null;
}
