// Writes the demo scenario's files under public/demo/. Deterministic: same script, same bytes.
// Scenario (invented): "Harrowgate Fresh Kitchens" sends chilled ready meals in insulated totes on a
// five-drop regional route; at the third drop the tote waits on a warm loading dock for an hour.
import { writeFileSync, mkdirSync } from "node:fs";
import path from "node:path";
import { lumpedResponse } from "../lib/thermal/lumped";
import { EXAMPLE_PROFILES } from "../lib/design/profile";
import { mulberry32 } from "../lib/uncertainty/random";
import { DEMO_DESIGN_NAMES } from "../lib/services/demoNames";


const OUT = path.join(__dirname, "..", "public", "demo");
const START_UTC_MS = Date.UTC(2026, 5, 16, 3, 0, 0); // 05:00 local (UTC+02:00)
const STEP_MIN = 2;
const HOURS = 12;

/** Air temperature inside the van around the tote, °C, at minute m of the route (with or without the dock delay). */
function airAt(m: number, dockDelay = true): number {
  const setpoint = 3.0;
  const drops = [95, 190, 300, 470, 560]; // door opens for each drop (minutes from departure)
  let a = setpoint;
  if (m < 20) a = 9 - (6 * m) / 20; // loading bay, van pulling down to setpoint
  for (const d of drops) {
    if (m >= d && m < d + 8) a = 11.5; // doors open at the drop
    else if (m >= d + 8 && m < d + 30) a = setpoint + 8.5 * Math.exp(-(m - d - 8) / 7);
  }
  if (!dockDelay) return a;
  if (m >= 310 && m < 370) a = 14.5 + 1.5 * Math.sin(((m - 310) / 60) * Math.PI); // tote left on the dock
  if (m >= 370 && m < 405) a = setpoint + 11.5 * Math.exp(-(m - 370) / 9);
  return a;
}

function main(): void {
  mkdirSync(OUT, { recursive: true });
  const rand = mulberry32(20260616);
  const lines = [
    "Logger serial;HX-20417",
    "Trip;Route 7 north, tote 3 of 8",
    "Exported;2026-06-16 18:05",
    "",
    "Timestamp,Air temperature (°C)",
  ];
  for (let m = 0; m <= HOURS * 60; m += STEP_MIN) {
    const t = new Date(START_UTC_MS + m * 60_000);
    const local = new Date(t.getTime() + 2 * 3600_000).toISOString().slice(0, 19);
    const noise = (rand() - 0.5) * 0.3;
    lines.push(`${local}+02:00,${(airAt(m) + noise).toFixed(1)}`);
  }
  // Metadata lines use ';' as exported by the logger's software; the data block is comma-separated.
  const csv = lines.map((l, i) => (i < 3 ? l.replace(";", ": ") : l)).join("\r\n") + "\r\n";
  writeFileSync(path.join(OUT, "route7-tote3.csv"), csv, "utf8");

  // The same route a week earlier, without the dock delay: the demo's signed, historic review.
  const earlyRand = mulberry32(20260609);
  const earlyStart = START_UTC_MS - 7 * 86_400_000;
  const early = ["Logger serial: HX-20417", "Trip: Route 7 north, tote 3 of 8", "Exported: 2026-06-09 18:02", "", "Timestamp,Air temperature (°C)"];
  for (let m = 0; m <= HOURS * 60; m += STEP_MIN) {
    const local = new Date(earlyStart + m * 60_000 + 2 * 3600_000).toISOString().slice(0, 19);
    early.push(`${local}+02:00,${(airAt(m, false) + (earlyRand() - 0.5) * 0.3).toFixed(1)}`);
  }
  writeFileSync(path.join(OUT, "route7-tote3-0609.csv"), early.join("\r\n") + "\r\n", "utf8");

  const product = {
    name: "Ready meal tray 450 g (in tote)",
    mass_kg: 0.45,
    properties: { cp_J_kgK: 3600, density_kg_m3: 1050, k_W_mK: 0.45 },
    area_m2: 0.062,
    h_W_m2K: 2.5,
    initial_C: 3.2,
  };
  writeFileSync(path.join(OUT, "ready-meal.product.json"), JSON.stringify(product, null, 2) + "\n");

  const limits = {
    name: "Harrowgate chilled ready meals (example plan)",
    sensor_accuracy_K: 0.5,
    rules: [
      { id: "core-above-5C", channel: "core", above_C: 5, max_cumulative_min: 120 },
      { id: "core-peak-8C", channel: "core", above_C: 8, max_peak_C: 8 },
      { id: "air-above-8C", channel: "air", above_C: 8, max_cumulative_min: 180, max_continuous_min: 120 },
    ],
  };
  writeFileSync(path.join(OUT, "ready-meal.limits.json"), JSON.stringify(limits, null, 2) + "\n");
  // For design: the plan's core rules only. Its air rule judges the route's air, which no pack changes
  // (the summer profile's air is above 8 °C for hours), so a sizing run against it could never pass.
  const designLimits = {
    name: DEMO_DESIGN_NAMES.limits,
    sensor_accuracy_K: limits.sensor_accuracy_K,
    rules: limits.rules.filter((r) => r.channel !== "air"),
  };
  writeFileSync(path.join(OUT, "tote-design.limits.json"), JSON.stringify(designLimits, null, 2) + "\n");

  // A test shipment with a product simulant probe beside the air probe, for calibration: the simulant
  // follows a lumped body with tau = 2.5 h (invented), read to 0.1 K like a logger.
  const probeRand = mulberry32(42);
  const tTest = Float64Array.from({ length: 16 * 30 + 1 }, (_, i) => i * 120);
  const airTest = Float64Array.from(tTest, (t) => airAt((t / 60) % (HOURS * 60)) + (probeRand() - 0.5) * 0.3);
  const simulant = lumpedResponse(tTest, airTest, 3.2, 2.5 * 3600);
  const probeLines = ["Logger serial: HX-20988 (two probes)", "Time,Air (°C),Product simulant (°C)"];
  tTest.forEach((t, i) => probeLines.push(`${new Date(START_UTC_MS + t * 1000).toISOString().slice(0, 19)}Z,${airTest[i]!.toFixed(1)},${simulant[i]!.toFixed(1)}`));
  writeFileSync(path.join(OUT, "probe-test.csv"), probeLines.join("\n") + "\n");

  const pack = {
    name: DEMO_DESIGN_NAMES.pack,
    h_outside_W_m2K: 8,
    h_inside_W_m2K: 4,
    emissivity: 0.9,
    area_m2: 0.08,
    layers: [{ name: "EPS wall", thickness_m: 0.025, k_W_mK: 0.035 }],
    coolants: [{ name: "gel pack", mass_kg: 0.15, melt_C: 0, latent_J_kg: 330000, cp_solid_J_kgK: 2000, cp_liquid_J_kgK: 3800, initial_C: -12 }],
  };
  writeFileSync(path.join(OUT, "tote.pack.json"), JSON.stringify(pack, null, 2) + "\n");
  const shaped = {
    name: DEMO_DESIGN_NAMES.product,
    shape: { kind: "box", x_m: 0.17, y_m: 0.12, z_m: 0.03 },
    mass_kg: 0.45,
    composition: { water: 0.72, protein: 0.08, fat: 0.06, carbohydrate: 0.12, fiber: 0.01, ash: 0.01 },
    initial_C: 3.2,
  };
  writeFileSync(path.join(OUT, "ready-meal-shaped.product.json"), JSON.stringify(shaped, null, 2) + "\n");
  for (const [i, p] of EXAMPLE_PROFILES.entries()) {
    writeFileSync(path.join(OUT, i === 0 ? "summer-route.profile.json" : "winter-route.profile.json"), JSON.stringify(p, null, 2) + "\n");
  }
}

main();
