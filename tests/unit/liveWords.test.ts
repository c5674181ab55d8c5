import { describe, it, expect } from "vitest";
import { LiveMonitor, forecast, thresholdWords, type LiveReading } from "@/lib/live";
import type { Pack, Product } from "@/lib/thermal/definitions";
import type { LimitSet } from "@/lib/exposure/limits";

// The live page's threshold words keep "beyond the threshold now" apart from "allowance used up", and say that
// the forecast is the time to a threshold crossing. Invented lumped tray in a foam box (as liveMonitor.test.ts);
// with the air held at 12 °C from the first reading the core follows T(t) = Ta + (T0 − Ta)·e^(−t/tau)
// (Incropera et al., §5.2), so it crosses 5 °C at t* = tau·ln((T0 − Ta)/(5 − Ta)).
const tray: Product = { name: "tray", mass_kg: 0.45, properties: { cp_J_kgK: 3600 }, area_m2: 0.062, initial_C: 3.2 };
const box: Pack = { name: "box", h_outside_W_m2K: 8, area_m2: 0.1, layers: [{ name: "foam", thickness_m: 0.01, k_W_mK: 0.035 }], coolants: [] };
const limits: LimitSet = { name: "chilled", rules: [{ id: "core-5", channel: "core", above_C: 5, max_cumulative_min: 120 }] };
const T0 = 3.2, Ta = 12, STEP_S = 300, START = 1_780_000_000;

function monitorAfter(minutes: number): LiveMonitor {
  const m = new LiveMonitor({ product: tray, pack: box, limits, model: "auto" });
  const rs: LiveReading[] = [];
  for (let t = 0; t <= minutes * 60; t += STEP_S) rs.push({ t_s: START + t, air_C: Ta });
  m.add(rs);
  return m;
}

function wordsOf(m: LiveMonitor, lead_min = 60) {
  const n = m.length;
  return thresholdWords(limits, m.rules(), { core: m.core_C[n - 1]!, surface: m.surface_C[n - 1]!, mean: m.mean_C[n - 1]! }, forecast(m), lead_min);
}

/** the crossing of 5 °C after the first reading, min (closed form above) */
function crossingMin(m: LiveMonitor): number {
  return (m.model!.screening.tau_s * Math.log((T0 - Ta) / (5 - Ta))) / 60;
}

describe("thresholdWords", () => {
  it("thresholdWords, before the crossing: no rule beyond now, and the forecast is the time the threshold is crossed, not the allowance's end", () => {
    const m = monitorAfter(10);
    expect(m.model!.path).toBe("exact");
    const w = wordsOf(m, 10_000);
    expect(w.now).toEqual([]);
    const left = crossingMin(m) - 10;
    expect(left).toBeGreaterThan(2); // the tray is still below 5 °C after 10 min
    const shown = left < 120 ? `${Math.round(left)} min` : `${(left / 60).toFixed(1)} h`;
    expect(w.forecast).toBe(`the core goes above 5 °C (rule core-5's threshold) in ${shown} if the air holds at 12 °C; this is when the threshold is crossed, not when an allowance runs out`);
    expect(w.soon).toBe(true);
  });

  it("thresholdWords, beyond the threshold with allowance left: says how much of the allowance is used and that the rule still passes", () => {
    const tCross = crossingMin(monitorAfter(5)); // tau does not depend on the readings' count here (one air value)
    const total = Math.ceil((tCross + 40) / 5) * 5; // a reading on the 5-min grid about 40 min after the crossing
    const m = monitorAfter(total);
    const used = total - tCross;
    const w = wordsOf(m);
    expect(w.now).toHaveLength(1);
    const s = w.now[0]!;
    expect(s.usedUp).toBe(false);
    // cumulative time above 5 °C from the closed-form crossing, to 0.1 min (the page's rounding); linear interpolation
    // between 5-min readings moves the crossing by well under 0.05 min on this smooth curve
    expect(s.text).toMatch(new RegExp(`^The core is above 5 °C now \\(\\d+\\.\\d+ °C\\): ${used.toFixed(1)} min of the 120 min allowance used, ${(120 - used).toFixed(1)} min left; rule core-5 still passes\\.$`));
    expect(w.forecast).toBe("no crossing to forecast: the core is already beyond 5 °C. The time until an allowance runs out is not forecast.");
    expect(`${s.text} ${w.forecast}`).not.toMatch(/limit already reached/);
  });

  it("thresholdWords, beyond the threshold with the allowance used up: says so and that the rule fails", () => {
    const tCross = crossingMin(monitorAfter(5));
    const total = Math.ceil((tCross + 150) / 5) * 5; // about 150 min beyond 5 °C: over the 120 min allowance
    const m = monitorAfter(total);
    const w = wordsOf(m);
    const s = w.now[0]!;
    expect(s.usedUp).toBe(true);
    expect(s.text).toMatch(new RegExp(`, and the 120 min allowance is used up \\(${(total - tCross).toFixed(1)} min beyond it so far\\); rule core-5 fails\\.$`));
  });

  it("rules so far: a rule that has failed leads the summary even after the core is back inside every threshold", () => {
    const tCross = crossingMin(monitorAfter(5));
    const total = Math.ceil((tCross + 150) / 5) * 5; // about 150 min above 5 °C: the 120 min allowance is used up
    const m = monitorAfter(total);
    // then 10 h at 2 °C: the core (tau about 3 h) is back under 5 °C, and the forecast says it never crosses again
    const back: LiveReading[] = [];
    for (let t = STEP_S; t <= 600 * 60; t += STEP_S) back.push({ t_s: START + total * 60 + t, air_C: 2 });
    m.add(back);
    const w = wordsOf(m);
    expect(w.now).toEqual([]);
    expect(w.forecast).toBe("no threshold crossing forecast");
    expect(w.verdict).toEqual({ failed: true, text: "Rule core-5 has failed: no later reading can bring it back to a pass. Decide on the load now." });
    // before any failure the verdict says so plainly
    expect(wordsOf(monitorAfter(10)).verdict).toEqual({ failed: false, text: "Every rule passes so far." });
  });
});
