// Shipment outcome from logger × product reviews (issue 15): the combination rules on small cases, then an
// invented 8-logger shipment (tests/fixtures/shipment.ts) run through `corelag shipment review` in process,
// each review compared with `corelag review` of the same trace and product run on its own.
import { mkdtempSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { combineShipment, worstExcursions, manifestSchema, calibrationOverdue, loggerReviewOption, type ReviewSummary } from "@/lib/shipment";
import { runReview } from "@/lib/review";
import { shipmentCommand } from "@/lib/cli/commands/shipment";
import { reviewCommand } from "@/lib/cli/commands/review";
import { CliError } from "@/lib/cli/common";
import { writeShipment, LOGGERS } from "../fixtures/shipment";
import { writeFileSync } from "node:fs";

const summary = (outcome: ReviewSummary["outcome"], minutes = 0): ReviewSummary => ({ outcome, rules: [{ id: "r", channel: "core", status: outcome === "accept" ? "pass" : "fail", cumulative_min: minutes, excursions: [] }] });

describe("combineShipment", () => {
  it("rejects if any governing review rejects, holds if any holds, accepts only if all accept", () => {
    const two = (a: ReviewSummary["outcome"], b: ReviewSummary["outcome"]) =>
      combineShipment([{ key: "L1", reviews: [{ product: "P", result: summary(a) }] }, { key: "L2", reviews: [{ product: "Q", result: summary(b) }] }]).outcome;
    expect(two("accept", "accept")).toBe("accept");
    expect(two("accept", "hold")).toBe("hold");
    expect(two("hold", "reject")).toBe("reject");
    expect(two("reject", "accept")).toBe("reject");
  });
  it("a product without a named logger is governed by the worst, ties broken by minutes beyond thresholds, then order", () => {
    const r = combineShipment([
      { key: "A", reviews: [{ product: "P", result: summary("hold", 5) }] },
      { key: "B", reviews: [{ product: "P", result: summary("hold", 30) }] },
      { key: "C", reviews: [{ product: "P", result: summary("accept", 300) }] },
      { key: "D", reviews: [{ product: "P", result: summary("hold", 30) }] },
    ]);
    expect(r.products).toEqual([{ product: "P", outcome: "hold", governing_logger: "B", governing_by: "worst" }]);
    expect(r.loggers.map((l) => l.outcome)).toEqual(["hold", "hold", "accept", "hold"]);
  });
  it("a named governing logger decides its product even when another logger is worse, and says so", () => {
    const r = combineShipment([
      { key: "A", reviews: [{ product: "P", result: summary("reject", 50) }] },
      { key: "B", reviews: [{ product: "P", governing: true, result: summary("accept") }] },
    ]);
    expect(r.outcome).toBe("accept");
    expect(r.products[0]).toMatchObject({ governing_logger: "B", governing_by: "named" });
    expect(r.notes[0]).toContain("A gives reject");
  });
  it("worst excursions: largest degree-minutes first; one logger's air excursion listed once", () => {
    const exc = (deg: number) => ({ start: "s", end: "e", duration_min: deg / 2, peak_C: 9, degree_min: deg });
    const withAir = (deg: number): ReviewSummary => ({ outcome: "reject", rules: [{ id: "air", channel: "air", status: "fail", cumulative_min: 1, excursions: [exc(deg)] }] });
    const list = worstExcursions([
      { key: "L1", reviews: [{ product: "P", result: withAir(10) }, { product: "Q", result: withAir(10) }] },
      { key: "L2", reviews: [{ product: "P", result: withAir(40) }] },
    ]);
    expect(list.map((e) => [e.logger, e.degree_min])).toEqual([["L2", 40], ["L1", 10]]);
  });
});

describe("manifest", () => {
  it("refuses two governing loggers for one product, naming the field", () => {
    const p = manifestSchema.safeParse({ reference: "X", limits: "l.json", loggers: [
      { trace: "a.csv", products: [{ product: "p.json", governing: true }] },
      { trace: "b.csv", products: [{ product: "p.json", governing: true }] },
    ] });
    expect(p.success).toBe(false);
    expect(p.error!.issues[0]!.path.join(".")).toBe("loggers.1.products.0.governing");
  });
});

describe("logger register in a review", () => {
  // A 2-min air trace at 3 °C with 100 min at 8.3 °C, judged by air rules with no allowance (any time beyond
  // the threshold fails): the guard band decides, by construction, whether 8.3 °C counts as beyond.
  const t_s = Float64Array.from({ length: 181 }, (_, i) => 1_780_000_000 + 120 * i);
  const air_C = Float64Array.from({ length: 181 }, (_, i) => (i >= 60 && i < 110 ? 8.3 : 3));
  const tray = { name: "t", mass_kg: 0.45, properties: { cp_J_kgK: 3600 }, area_m2: 0.062, h_W_m2K: 2.5, initial_C: 3 };
  const guardRule = { name: "l", rules: [{ id: "air-8.5", channel: "air" as const, above_C: 8.5 }] };
  const run = (limits: typeof guardRule & { sensor_accuracy_K?: number }, logger?: Parameters<typeof loggerReviewOption>[0], shipment_s = t_s[0]!) =>
    runReview({ series: { t_s, air_C }, product: tray, limits, options: { model: "auto", ...(logger ? { logger: loggerReviewOption(logger, shipment_s) } : {}) } }).result;

  it("the logger's stated accuracy becomes the guard band when the limit set states none", () => {
    // 8.3 °C never exceeds 8.5 °C: a pass without a guard band; with ±0.3 K the strict threshold 8.2 °C is
    // exceeded and the lenient 8.8 °C is not: inconclusive, so hold.
    expect(run(guardRule).rules[0]).toMatchObject({ status: "pass", guard_K: 0 });
    const withLogger = run(guardRule, { serial: "SN-1", accuracy_K: 0.3 });
    expect(withLogger.rules[0]).toMatchObject({ status: "inconclusive", guard_K: 0.3 });
    expect(withLogger.outcome).toBe("hold");
    expect(withLogger.cautions.some((c) => c.includes("±0.3 K") && c.includes("SN-1"))).toBe(true);
    // the limit set's own accuracy wins
    expect(run({ ...guardRule, sensor_accuracy_K: 0.1 }, { serial: "SN-1", accuracy_K: 0.3 }).rules[0]).toMatchObject({ status: "pass", guard_K: 0.1 });
  });

  it("a calibration overdue on the shipment date makes the outcome at best hold", () => {
    const due = t_s[0]! - 86400;
    const passing = { name: "l", rules: [{ id: "air-10", channel: "air" as const, above_C: 10 }] };
    expect(run(passing, { serial: "SN-2", accuracy_K: 0.1, nextCalibration_s: due + 2 * 86400 }).outcome).toBe("accept");
    const overdue = run(passing, { serial: "SN-2", accuracy_K: 0.1, nextCalibration_s: due });
    expect(overdue.rules[0]!.status).toBe("pass");
    expect(overdue.outcome).toBe("hold");
    expect(overdue.cautions.some((c) => c.includes("SN-2 was due for calibration"))).toBe(true);
    // a reject stays a reject
    const failing = { name: "l", rules: [{ id: "air-5", channel: "air" as const, above_C: 5 }] };
    expect(run(failing, { serial: "SN-2", accuracy_K: 0.1, nextCalibration_s: due }).outcome).toBe("reject");
    expect(calibrationOverdue({ serial: "S", accuracy_K: 0.3, nextCalibration_s: due }, due + 1)).toBe(true);
    expect(calibrationOverdue({ serial: "S", accuracy_K: 0.3, nextCalibration_s: null }, due + 1)).toBe(false);
  });
});

describe("corelag shipment review: 8 generated loggers", async () => {
  const dir = mkdtempSync(path.join(os.tmpdir(), "corelag-ship-"));
  const manifest = writeShipment(dir);
  const out = (await shipmentCommand(["review", "--manifest", manifest])) as {
    reference: string; outcome: string;
    products: Array<{ product: string; outcome: string; governing_logger: string }>;
    loggers: Array<{ trace: string; position: string; outcome: string; reviews: Array<{ product: string; outcome: string; rules: Array<{ id: string; status: string; cumulative_min: number }> }> }>;
    cautions: string[];
  };

  it("the air excursions are the ones built into the traces (minutes worked by hand)", () => {
    // minutes above 8 °C: the samples at the excursion value span (duration − 2) min, plus on each side the
    // part of the 2-min linear ramp above 8 °C: 2·(v − 8)/(v − 3) min.
    const air = (n: number) => out.loggers[n - 1]!.reviews[0]!.rules.find((r) => r.id === "air-above-8C")!;
    expect(air(1).cumulative_min).toBe(0);
    expect(air(2).cumulative_min).toBeCloseTo(8 + 2 * (2 * 2) / 7, 3); // 10 °C for 10 min: 9.143
    expect(air(3).cumulative_min).toBeCloseTo(238 + 2 * (2 * 4) / 9, 3); // 12 °C for 240 min: 239.778
    expect(air(4).cumulative_min).toBeCloseTo(2 * (98 + 2 * (2 * 1) / 6), 3); // 9 °C twice for 100 min: 197.333
    expect(air(5).cumulative_min).toBeCloseTo(148 + 2 * (2 * 0.3) / 5.3, 3); // 8.3 °C for 150 min: 148.226
    // 240 min continuous > 120 allowed; 197 min cumulative > 180 allowed; 148 min continuous > 120 allowed
    expect([3, 4, 5].map((n) => air(n).status)).toEqual(["fail", "fail", "fail"]);
    expect([1, 2, 6, 7, 8].map((n) => air(n).status)).toEqual(["pass", "pass", "pass", "pass", "pass"]);
  });

  it("outcome and the governing logger of each product", () => {
    expect(out.reference).toBe("TEST-0616");
    // loggers 3, 4, 5 fail the air rule, so the tray (on every logger) is rejected; logger 3's 240 min at 12 °C
    // gives the most minutes beyond thresholds among the rejecting ones, so it governs the tray.
    expect(out.products).toEqual([
      { product: "tray.json", outcome: "reject", governing_logger: "traces/logger-3.csv" },
      // the cup is named to logger 2 (10 min at 10 °C: accepted), although logger 5 rejects it
      { product: "cup.json", outcome: "accept", governing_logger: "traces/logger-2.csv" },
    ]);
    expect(out.outcome).toBe("reject");
    expect(out.loggers.map((l) => l.outcome)).toEqual(["accept", "accept", "reject", "reject", "reject", "accept", "accept", "accept"]);
    expect(out.cautions.some((c) => c.includes("cup.json is governed by traces/logger-2.csv") && c.includes("logger-5.csv gives reject"))).toBe(true);
  });

  it("each review equals the same review run on its own", async () => {
    let compared = 0;
    for (const [i, l] of out.loggers.entries()) {
      for (const r of l.reviews) {
        const single = (await reviewCommand(["--trace", path.join(dir, l.trace), "--product", path.join(dir, r.product), "--limits", path.join(dir, "limits.json")])) as { outcome: string; rules: unknown };
        expect(r.outcome, `${l.trace} × ${r.product}`).toBe(single.outcome);
        expect(r.rules).toEqual(single.rules);
        compared++;
      }
      expect(l.position).toBe(LOGGERS[i]!.position);
    }
    expect(compared).toBe(11);
  });

  it("a refused trace fails the command naming the file, row and column", async () => {
    writeFileSync(path.join(dir, "traces", "logger-8.csv"), "Logger serial: SN-1008\nTime,Air (°C)\n2026-06-16T04:00:00Z,3.0\n2026-06-16T04:02:00Z,warm\n2026-06-16T04:04:00Z,3.0\n");
    const err = await shipmentCommand(["review", "--manifest", manifest]).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(CliError);
    expect((err as Error).message).toMatch(/logger-8\.csv: .*row 4.*column/i);
  });
});
