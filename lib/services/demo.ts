import { readFileSync } from "node:fs";
import path from "node:path";
import { importCsv } from "../trace";
import { packSchema, productSchema } from "../thermal/definitions";
import { EXAMPLE_PROFILES } from "../design/profile";
import { limitSetSchema } from "../exposure/limits";
import { createTrace } from "../db/traces";
import { createDefinition } from "../db/definitions";
import { db } from "../db/client";
import { runAndStoreReview } from "./reviews";

const DEMO = path.resolve(__dirname, "..", "..", "public", "demo");

/** Loads the invented demo scenario (public/demo, written by scripts/generate-demo.ts) into an empty database. */
export async function loadDemoIfEmpty(): Promise<"loaded" | "skipped"> {
  if ((await db.trace.count()) > 0 || (await db.definition.count()) > 0) return "skipped";
  const fileName = "route7-tote3.csv";
  const bytes = readFileSync(path.join(DEMO, fileName));
  const traceId = await createTrace({ name: "Route 7 north, tote 3 (demo)", fileName, bytes, imported: importCsv(bytes) });
  const product = productSchema.parse(JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8")));
  const limits = limitSetSchema.parse(JSON.parse(readFileSync(path.join(DEMO, "ready-meal.limits.json"), "utf8")));
  const p = await createDefinition("product", product);
  const l = await createDefinition("limits", limits);
  const res = await runAndStoreReview({ title: "Route 7, 16 June: tote 3 after the dock delay (demo)", traceId, productId: p.id, limitsId: l.id });
  if (!res.ok) throw new Error(`demo review failed: ${res.message}`);
  // For the design pages: a probe test, a shaped product in a tote with a gel pack, and example profiles.
  const probeBytes = readFileSync(path.join(DEMO, "probe-test.csv"));
  await createTrace({ name: "Probe test, tray with simulant (demo)", fileName: "probe-test.csv", bytes: probeBytes, imported: importCsv(probeBytes) });
  await createDefinition("product", productSchema.parse(JSON.parse(readFileSync(path.join(DEMO, "ready-meal-shaped.product.json"), "utf8"))));
  await createDefinition("pack", packSchema.parse(JSON.parse(readFileSync(path.join(DEMO, "tote.pack.json"), "utf8"))));
  await createDefinition("limits", limitSetSchema.parse(JSON.parse(readFileSync(path.join(DEMO, "tote-design.limits.json"), "utf8"))));
  for (const profile of EXAMPLE_PROFILES) await createDefinition("profile", profile);
  return "loaded";
}
