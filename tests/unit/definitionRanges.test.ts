import { describe, it, expect } from "vitest";
import { readFileSync, readdirSync } from "node:fs";
import path from "node:path";
import { productSchema, packSchema, MAX_COOLANTS, MAX_LAYERS, type Product } from "@/lib/thermal/definitions";
import { limitSetSchema, MAX_RULES } from "@/lib/exposure/limits";
import { profileSchema, MAX_SEGMENTS, MAX_TOP_SEGMENTS, MAX_EXPANDED_SEGMENTS } from "@/lib/design/profile";
import { uncertaintySpecSchema } from "@/lib/uncertainty";
import { tryRunReview } from "@/lib/review";

// The ranges are the plausible ranges stated in lib/thermal/definitions.ts and README.md; the hostile
// values (1e308 kg, 1e-300 m, …) are the ones issue #9 found saved without complaint.

type Issue = { path: PropertyKey[]; message: string };
const issues = (r: { success: boolean; error?: { issues: Issue[] } }): Array<[string, string]> => (r.success ? [] : r.error!.issues.map((i) => [i.path.join("."), i.message]));

const bare = { name: "tray", mass_kg: 0.45, properties: { cp_J_kgK: 3600 }, area_m2: 0.062, h_W_m2K: 2.5, initial_C: 3.2 };
const gel = { name: "gel", mass_kg: 0.4, melt_C: 0, latent_J_kg: 3.3e5, cp_solid_J_kgK: 2000, cp_liquid_J_kgK: 3800, initial_C: -5 };
const pack = { name: "tote", h_outside_W_m2K: 8, h_inside_W_m2K: 4, layers: [{ name: "EPS", thickness_m: 0.025, k_W_mK: 0.035 }], coolants: [gel] };
const rule = { id: "core-5", channel: "core", above_C: 5, max_cumulative_min: 120 };

describe("definition schemas: unknown fields", () => {
  it("productSchema refuses 'mass_g' by name instead of dropping it", () => {
    const { mass_kg: _, ...noMass } = bare;
    expect(issues(productSchema.safeParse({ ...noMass, mass_g: 450 }))).toContainEqual(["", "unknown field 'mass_g' (did you mean 'mass_kg'?)"]);
  });
  it("productSchema names an unknown field inside the shape, the properties and the composition", () => {
    expect(issues(productSchema.safeParse({ ...bare, shape: { kind: "sphere", radius_m: 0.05, diameter_m: 0.1 } }))).toContainEqual(["shape", "unknown field 'diameter_m'"]);
    expect(issues(productSchema.safeParse({ ...bare, properties: { cp_J_kgK: 3600, k: 0.5 } }))).toContainEqual(["properties", "unknown field 'k' (did you mean 'k_W_mK'?)"]);
    const { properties: _, ...noProps } = bare;
    expect(issues(productSchema.safeParse({ ...noProps, composition: { water: 0.7, protein: 0.3, sugar: 0 } }))).toContainEqual(["composition", "unknown field 'sugar'"]);
  });
  it("packSchema, limitSetSchema, profileSchema and uncertaintySpecSchema name unknown fields with their path", () => {
    expect(issues(packSchema.safeParse({ ...pack, coolants: [{ ...gel, mass_g: 400 }] }))).toContainEqual(["coolants.0", "unknown field 'mass_g' (did you mean 'mass_kg'?)"]);
    expect(issues(packSchema.safeParse({ ...pack, layers: [{ ...pack.layers[0], emissivity: 0.9 }] }))).toContainEqual(["layers.0", "unknown field 'emissivity'"]); // emissivity belongs to the pack, not a layer
    expect(issues(limitSetSchema.safeParse({ name: "l", rules: [{ ...rule, max_minutes: 5 }] }))).toContainEqual(["rules.0", "unknown field 'max_minutes'"]);
    expect(issues(limitSetSchema.safeParse({ name: "l", rules: [rule], accuracy: 0.5 }))).toContainEqual(["", "unknown field 'accuracy'"]);
    expect(issues(profileSchema.safeParse({ name: "p", initial_C: 4, segments: [{ kind: "hold", C: 4, duration_min: 10, note: "x" }] }))).toContainEqual(["segments.0", "unknown field 'note'"]);
    expect(issues(uncertaintySpecSchema.safeParse({ inputs: [{ path: "product.mass_kg", plusminus: 5, pct: true }] }))).toContainEqual(["inputs.0", "unknown field 'pct'"]);
  });
});

describe("definition schemas: plausible ranges", () => {
  it.each([
    ["mass_kg 1e308", { ...bare, mass_kg: 1e308 }, ["mass_kg", "mass must be between 0.001 and 2000 kg"]],
    ["mass_kg 1e-300", { ...bare, mass_kg: 1e-300 }, ["mass_kg", "mass must be between 0.001 and 2000 kg"]],
    ["h_W_m2K 1e308", { ...bare, h_W_m2K: 1e308 }, ["h_W_m2K", "heat-transfer coefficient must be between 0.01 and 2000 W/(m²·K)"]],
    ["radius 1e-300 m", { ...bare, shape: { kind: "sphere", radius_m: 1e-300 } }, ["shape.radius_m", "radius must be between 0.0005 and 3 m"]],
    ["radius 1e308 m", { ...bare, shape: { kind: "sphere", radius_m: 1e308 } }, ["shape.radius_m", "radius must be between 0.0005 and 3 m"]],
    ["cp 1e9", { ...bare, properties: { cp_J_kgK: 1e9 } }, ["properties.cp_J_kgK", "specific heat must be between 500 and 6000 J/(kg·K)"]],
    ["density 1e6", { ...bare, properties: { cp_J_kgK: 3600, density_kg_m3: 1e6 } }, ["properties.density_kg_m3", "density must be between 50 and 3000 kg/m³"]],
    ["k 0", { ...bare, properties: { cp_J_kgK: 3600, k_W_mK: 0 } }, ["properties.k_W_mK", "thermal conductivity must be between 0.02 and 5 W/(m·K)"]],
    ["area 1e308", { ...bare, area_m2: 1e308 }, ["area_m2", "surface area must be between 0.0001 and 100 m²"]],
    ["initial 1000 °C", { ...bare, initial_C: 1000 }, ["initial_C", "initial temperature must be between -60 and 150 °C"]],
    ["mass as text", { ...bare, mass_kg: "450 g" }, ["mass_kg", "mass must be a number between 0.001 and 2000 kg"]],
  ])("productSchema refuses %s, stating the range", (_, body, expected) => {
    expect(issues(productSchema.safeParse(body))).toContainEqual(expected);
  });
  it.each([
    ["coolant mass 1e308", { ...pack, coolants: [{ ...gel, mass_kg: 1e308 }] }, ["coolants.0.mass_kg", "mass must be between 0 and 500 kg"]],
    ["coolant latent heat 1e12", { ...pack, coolants: [{ ...gel, latent_J_kg: 1e12 }] }, ["coolants.0.latent_J_kg", "latent heat must be between 0 and 1e6 J/kg"]],
    ["h_outside 1e308", { ...pack, h_outside_W_m2K: 1e308 }, ["h_outside_W_m2K", "outside heat-transfer coefficient must be between 0.01 and 2000 W/(m²·K)"]],
    ["layer k 1e308", { ...pack, layers: [{ name: "x", thickness_m: 0.01, k_W_mK: 1e308 }] }, ["layers.0.k_W_mK", "conductivity must be between 0.001 and 500 W/(m·K)"]],
    ["layer thickness 1e-300", { ...pack, layers: [{ name: "x", thickness_m: 1e-300, k_W_mK: 0.03 }] }, ["layers.0.thickness_m", "thickness must be between 0.00001 and 1 m"]],
  ])("packSchema refuses %s, stating the range", (_, body, expected) => {
    expect(issues(packSchema.safeParse(body))).toContainEqual(expected);
  });
  it("packSchema accepts dry ice (melt -78.5 °C, about 571 kJ/kg) as a coolant", () => {
    expect(packSchema.safeParse({ ...pack, coolants: [{ ...gel, melt_C: -78.5, initial_C: -78.5, latent_J_kg: 571e3 }] }).success).toBe(true);
  });
  it("limitSetSchema states the range of a threshold and an allowance", () => {
    expect(issues(limitSetSchema.safeParse({ name: "l", rules: [{ ...rule, above_C: 1e308 }] }))).toContainEqual(["rules.0.above_C", "above_C must be between -100 and 200 °C"]);
    expect(issues(limitSetSchema.safeParse({ name: "l", rules: [{ ...rule, max_cumulative_min: 1e9 }] }))).toContainEqual(["rules.0.max_cumulative_min", "max_cumulative_min must be between 0 and 525600 min"]);
  });
});

describe("definition schemas: counts are capped", () => {
  it(`packSchema allows ${MAX_LAYERS} layers and ${MAX_COOLANTS} coolants, and refuses one more of each`, () => {
    const layer = pack.layers[0]!;
    expect(packSchema.safeParse({ ...pack, layers: Array(MAX_LAYERS).fill(layer), coolants: Array(MAX_COOLANTS).fill(gel) }).success).toBe(true);
    expect(issues(packSchema.safeParse({ ...pack, layers: Array(MAX_LAYERS + 1).fill(layer) }))).toContainEqual(["layers", "at most 20 layers are allowed"]);
    expect(issues(packSchema.safeParse({ ...pack, coolants: Array(MAX_COOLANTS + 1).fill(gel) }))).toContainEqual(["coolants", "at most 20 coolants are allowed"]);
  });
  it(`limitSetSchema refuses more than ${MAX_RULES} rules`, () => {
    const rules = Array.from({ length: MAX_RULES + 1 }, (_, i) => ({ ...rule, id: `r${i}` }));
    expect(issues(limitSetSchema.safeParse({ name: "l", rules }))).toContainEqual(["rules", "at most 100 rules are allowed"]);
    expect(limitSetSchema.safeParse({ name: "l", rules: rules.slice(0, MAX_RULES) }).success).toBe(true);
  });
  it("profileSchema refuses too many segments in a list and repeats that expand beyond the cap", () => {
    const hold = { kind: "hold", C: 4, duration_min: 1 };
    expect(issues(profileSchema.safeParse({ name: "p", initial_C: 4, segments: Array(MAX_TOP_SEGMENTS + 1).fill(hold) }))).toContainEqual(["segments", "at most 5000 segments are allowed"]);
    // a repeat's own list keeps the smaller cap
    expect(issues(profileSchema.safeParse({ name: "p", initial_C: 4, segments: [{ kind: "repeat", count: 1, segments: Array(MAX_SEGMENTS + 1).fill(hold) }] }))).toContainEqual(["segments.0.segments", "at most 200 segments are allowed"]);
    // 1000 × 1000 holds of 0.1 min: 10⁶ segments (> 10⁵) although only 69 days long
    const nested = { kind: "repeat", count: 1000, segments: [{ kind: "repeat", count: 1000, segments: [{ ...hold, duration_min: 0.1 }] }] };
    expect(issues(profileSchema.safeParse({ name: "p", initial_C: 4, segments: [nested] }))).toContainEqual(["segments", `the repeats expand to 1,000,000 segments; at most ${MAX_EXPANDED_SEGMENTS.toLocaleString("en")} are allowed`]);
    // 1000 × 60 days at 60 s is 86.4 million samples (> 2 million)
    const long = { kind: "repeat", count: 1000, segments: [{ ...hold, duration_min: 86400 }] };
    expect(issues(profileSchema.safeParse({ name: "p", initial_C: 4, segments: [long] }))[0]![1]).toMatch(/^the profile lasts 60000\.0 days, more than 2,000,000 samples at 60 s$/);
  });
  it("uncertaintySpecSchema refuses a percentage above 100", () => {
    expect(issues(uncertaintySpecSchema.safeParse({ inputs: [{ path: "product.mass_kg", plusminus: 500, percent: true }] }))).toContainEqual(["inputs.0.plusminus", "plusminus in percent must be at most 100"]);
  });
});

describe("the shipped definitions still pass", () => {
  const demo = path.join(__dirname, "../../public/demo");
  it.each(readdirSync(demo).filter((f) => f.endsWith(".json")))("public/demo/%s parses", (file) => {
    const body = JSON.parse(readFileSync(path.join(demo, file), "utf8"));
    const schema = file.endsWith(".product.json") ? productSchema : file.endsWith(".pack.json") ? packSchema : file.endsWith(".limits.json") ? limitSetSchema : profileSchema;
    expect(issues(schema.safeParse(body))).toEqual([]);
  });
});

describe("tryRunReview", () => {
  const series = { t_s: Float64Array.from({ length: 13 }, (_, i) => 1.78e9 + 600 * i), air_C: new Float64Array(13).fill(10) };
  const limits = limitSetSchema.parse({ name: "l", rules: [rule] });
  it("tryRunReview returns the engine's refusal instead of throwing for a product that bypassed the schema", () => {
    // mass 1e308 kg and h·A tiny: tau = m·cp/(h·A) overflows to Infinity, which the lumped update refuses
    const product = { ...bare, mass_kg: 1e308, h_W_m2K: 1e-300 } as Product;
    const r = tryRunReview({ series, product, limits, options: { model: "lumped" } });
    expect(r).toEqual({ ok: false, message: "the engine could not compute this review: tau_s must be positive and finite" });
  });
  it("tryRunReview returns the computation for a plausible product", () => {
    const r = tryRunReview({ series, product: productSchema.parse(bare), limits, options: { model: "lumped" } });
    expect(r.ok).toBe(true);
  });
});
