// Live monitor: the work per reading (the model stepped once, not re-run), the rules judged over the whole
// history, and the forecast. A month of 1-minute readings on the exact lumped update; two days on the demo
// tray in the demo tote (graph network: coolant node, radiation updated every step).
import { performance } from "node:perf_hooks";
import { readFileSync } from "node:fs";
import path from "node:path";
import { LiveMonitor, forecast } from "../lib/live";
import { packSchema, productSchema } from "../lib/thermal/definitions";
import { limitSetSchema } from "../lib/exposure/limits";
import { mulberry32 } from "../lib/uncertainty/random";

const DEMO = path.join(__dirname, "../public/demo");
const read = (f: string) => JSON.parse(readFileSync(path.join(DEMO, f), "utf8"));

function feed(m: LiveMonitor, n: number, seed: number): { msPerReading: number; worstMs: number } {
  const rand = mulberry32(seed);
  let total = 0, worst = 0;
  for (let i = 0; i < n; i++) {
    const t = 1_780_000_000 + i * 60;
    const air = 4 + 3 * Math.sin((2 * Math.PI * i) / 1440) + (rand() - 0.5);
    const t0 = performance.now();
    m.add([{ t_s: t, air_C: Number(air.toFixed(2)) }]);
    const ms = performance.now() - t0;
    total += ms;
    worst = Math.max(worst, ms);
  }
  return { msPerReading: total / n, worstMs: worst };
}

export function benchLive(): void {
  const product = productSchema.parse(read("ready-meal.product.json"));
  const limits = limitSetSchema.parse(read("ready-meal.limits.json"));
  const lumped = new LiveMonitor({ product, limits, model: "auto" });
  const a = feed(lumped, 30 * 1440, 3);
  let t0 = performance.now();
  lumped.rules();
  const rulesMs = performance.now() - t0;
  t0 = performance.now();
  forecast(lumped);
  const fcMs = performance.now() - t0;
  console.log(`live monitor, exact lumped, 30 days of 1-min readings (${lumped.length}): ${(a.msPerReading * 1000).toFixed(1)} µs per reading (worst ${a.worstMs.toFixed(2)} ms); rules over the whole month ${rulesMs.toFixed(1)} ms; forecast ${fcMs.toFixed(2)} ms`);

  const pack = packSchema.parse(read("tote.pack.json"));
  const net = new LiveMonitor({ product, pack, limits, model: "auto" });
  const b = feed(net, 2 * 1440, 4);
  t0 = performance.now();
  forecast(net);
  const netFc = performance.now() - t0;
  // a reading 30 min late: re-stepped from its checkpoint (30 readings), not from the start
  t0 = performance.now();
  net.add([{ t_s: 1_780_000_000 + (2 * 1440 - 30) * 60 + 30, air_C: 5 }]);
  const lateMs = performance.now() - t0;
  console.log(`live monitor, ${net.model!.path} network (demo tray in the tote), 2 days of 1-min readings: ${b.msPerReading.toFixed(2)} ms per reading (worst ${b.worstMs.toFixed(1)} ms); forecast ${netFc.toFixed(0)} ms; a reading 30 min late ${lateMs.toFixed(1)} ms (${net.lastRestepped} readings re-stepped)`);
}

if (require.main === module) benchLive();
