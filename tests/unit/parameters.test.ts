import { describe, it, expect } from "vitest";
import { definitionParameters, readableNumber, unitOf, describeRule, ruleAllowance } from "@/lib/review/parameters";

describe("definitionParameters", () => {
  it("definitionParameters lists every field of a pack with its unit from the SI suffix, items named and counted from 1", () => {
    const pack = {
      name: "EPS tote",
      h_outside_W_m2K: 8,
      emissivity: 0.9,
      area_m2: 0.08,
      layers: [{ name: "EPS wall", thickness_m: 0.025, k_W_mK: 0.035 }],
      coolants: [{ name: "gel pack", mass_kg: 0.15, latent_J_kg: 330000, cp_solid_J_kgK: 2000, initial_C: -12 }],
    };
    expect(definitionParameters(pack).map((r) => [r.path, r.label, r.value, r.unit])).toEqual([
      ["h_outside_W_m2K", "outside film coefficient h", 8, "W/m²·K"],
      ["emissivity", "emissivity", 0.9, ""],
      ["area_m2", "area", 0.08, "m²"],
      ["layers.1.thickness_m", "layer 1 (EPS wall): thickness", 0.025, "m"],
      ["layers.1.k_W_mK", "layer 1 (EPS wall): conductivity k", 0.035, "W/m·K"],
      ["coolants.1.mass_kg", "coolant 1 (gel pack): mass", 0.15, "kg"],
      ["coolants.1.latent_J_kg", "coolant 1 (gel pack): latent heat", 330000, "J/kg"],
      ["coolants.1.cp_solid_J_kgK", "coolant 1 (gel pack): specific heat, solid", 2000, "J/kg·K"],
      ["coolants.1.initial_C", "coolant 1 (gel pack): initial temperature", -12, "°C"],
    ]);
  });

  it("definitionParameters walks nested objects (shape, composition) and shows number pairs as a range", () => {
    const rows = definitionParameters({ name: "x", shape: { kind: "box", x_m: 0.17 }, composition: { water: 0.72 }, provenance: { tau_ci95_s: [8000, 9500] } });
    expect(rows.map((r) => [r.label, r.value, r.unit])).toEqual([
      ["shape: kind", "box", ""],
      ["shape: x", 0.17, "m"],
      ["composition: water", 0.72, ""],
      ["provenance: tau, 95 % interval", "8000 to 9500", "s"],
    ]);
  });

  it("unitOf takes the longest suffix and leaves a bare name alone", () => {
    expect(unitOf("cp_J_kgK")).toEqual({ base: "cp", unit: "J/kg·K" });
    expect(unitOf("density_kg_m3")).toEqual({ base: "density", unit: "kg/m³" });
    expect(unitOf("sensor_accuracy_K")).toEqual({ base: "sensor_accuracy", unit: "K" });
    expect(unitOf("emissivity")).toEqual({ base: "emissivity", unit: "" });
  });

  it("readableNumber rounds to 6 significant digits for display only", () => {
    expect(readableNumber(2.901649033481937)).toBe("2.90165");
    expect(readableNumber(330000)).toBe("330000");
    expect(readableNumber(-12)).toBe("-12");
    expect(readableNumber(1.5e-7)).toBe("1.5e-7");
  });

  it("describeRule says a rule in words", () => {
    expect(describeRule({ channel: "air", above_C: 8, max_cumulative_min: 180, max_continuous_min: 120 })).toBe("air above 8 °C, at most 180 min in all, at most 120 min at a stretch");
    expect(describeRule({ channel: "core", below_C: -18 })).toBe("core below -18 °C, no time allowed");
  });

  it("ruleAllowance says what a threshold rule allows beyond its threshold, in minutes and °C as the limit set has them", () => {
    // the demo plan's rules (public/demo/ready-meal.limits.json)
    expect(ruleAllowance({ channel: "core", above_C: 5, max_cumulative_min: 120 })).toBe("at most 120 min in all");
    expect(ruleAllowance({ channel: "core", above_C: 8, max_peak_C: 8 })).toBe("never beyond 8 °C");
    expect(ruleAllowance({ channel: "air", above_C: 8, max_cumulative_min: 180, max_continuous_min: 120 })).toBe("at most 180 min in all, at most 120 min at a stretch");
    expect(ruleAllowance({ channel: "core", above_C: 5 })).toBe("no time allowed");
  });
});

describe("auditSummary", () => {
  it("auditSummary says in one line what a sign-off, a run, an import and a re-check recorded", async () => {
    const { auditSummary } = await import("@/lib/review/auditSummary");
    expect(auditSummary("sign", { decision: "hold", suggested: "reject", comment: "x" })).toBe("decision hold (suggested reject)");
    expect(auditSummary("run", { outcome: "reject", engineVersion: "0.3.0", corrects: null })).toBe("suggested reject, engine 0.3.0");
    expect(auditSummary("import", { fileName: "a.csv", samples: 361, sha256: "ab".repeat(32) })).toBe("a.csv, 361 samples, SHA-256 abababababab…");
    expect(auditSummary("verify", { reproduced: false, problems: ["a", "b"] })).toBe("2 problem(s)");
    expect(auditSummary("key", { fingerprint: "f" })).toBe("");
    expect(auditSummary("sign", null)).toBe("");
  });
  it("auditSummary says why a sign-in was refused and where it came from", async () => {
    const { auditSummary } = await import("@/lib/review/auditSummary");
    // detail shapes as lib/services/access.ts records them (invented address)
    expect(auditSummary("sign-in-refused", { email: "nobody@example.test", address: "127.0.0.1", reason: "unknown-email" })).toBe("refused: no account has this address, from 127.0.0.1");
    expect(auditSummary("sign-in-refused", { email: "a@example.test", address: "127.0.0.1", reason: "wrong-password" })).toBe("refused: wrong password, from 127.0.0.1");
    expect(auditSummary("sign-in", { address: "127.0.0.1" })).toBe("from 127.0.0.1");
    expect(auditSummary("set-role", { email: "a@example.test", from: "auditor", to: "reviewer" })).toBe("role auditor → reviewer");
  });
});
