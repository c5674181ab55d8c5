// The parameters of a stored definition (product, pack, limit set) as rows a person can read: a label,
// the value as stored, and its unit, taken from the SI suffix of the field name (mass_kg → kg).
// Used by the printed report and the read-only definition page.

export interface ParameterRow {
  /** the field's path in the stored JSON, e.g. "layers.1.thickness_m" (arrays count from 1) */
  path: string;
  /** words: "layer 1 (EPS wall): thickness" */
  label: string;
  /** the value as stored (numbers untouched; the display rounds) */
  value: string | number | boolean;
  unit: string;
}

/** Unit suffixes, longest first so that `_J_kgK` wins over `_K`. */
const UNITS: ReadonlyArray<[string, string]> = [
  ["_per_C_sqrt_h", "1/(°C·√h)"],
  ["_per_C", "1/°C"],
  ["_kJ_mol", "kJ/mol"],
  ["_log10_increase", "log10"],
  ["_log10", "log10 CFU/g"],
  ["_percent", "%"],
  ["_days", "days"],
  ["_W_m2K", "W/m²·K"],
  ["_J_kgK", "J/kg·K"],
  ["_kg_m3", "kg/m³"],
  ["_W_mK", "W/m·K"],
  ["_J_kg", "J/kg"],
  ["_m2", "m²"],
  ["_m3", "m³"],
  ["_kg", "kg"],
  ["_min", "min"],
  ["_m", "m"],
  ["_C", "°C"],
  ["_K", "K"],
  ["_s", "s"],
  ["_h", "h"],
];

/** Labels of growth and shelf-life fields whose base would read as another field's ("initial_log10" is not a temperature). */
const FIELD_LABELS: Record<string, string> = {
  initial_log10: "initial count",
  max_log10: "maximum population",
  max_log10_increase: "at most, log10 increase",
  max_consumed_percent: "at most, shelf life consumed",
  lag_h: "lag time",
  shelf_life_days: "shelf life at the reference",
  reference_C: "reference temperature",
  storage_C: "storage temperature",
  tmin_C: "Tmin",
  tmax_C: "Tmax",
  b_per_C_sqrt_h: "b (square-root model)",
  c_per_C: "c (extended model)",
  ea_kJ_mol: "activation energy Ea",
};

/** Labels for the fields whose name alone reads poorly. */
const LABELS: Record<string, string> = {
  cp: "specific heat cp",
  k: "conductivity k",
  h: "surface coefficient h",
  h_outside: "outside film coefficient h",
  h_inside: "inside film coefficient h",
  initial: "initial temperature",
  melt: "melt point",
  latent: "latent heat",
  cp_solid: "specific heat, solid",
  cp_liquid: "specific heat, liquid",
  freezing_point: "initial freezing point",
  sensor_accuracy: "sensor accuracy (guard band)",
  above: "above",
  below: "below",
  max_cumulative: "at most, in all",
  max_continuous: "at most, at a stretch",
  max_peak: "never beyond",
  tau_ci95: "tau, 95 % interval",
};

export function unitOf(key: string): { base: string; unit: string } {
  for (const [suffix, unit] of UNITS) if (key.endsWith(suffix) && key.length > suffix.length) return { base: key.slice(0, -suffix.length), unit };
  return { base: key, unit: "" };
}

const words = (base: string) => LABELS[base] ?? base.replace(/_/g, " ");
const singular = (key: string) => (key.endsWith("s") ? key.slice(0, -1) : key);

/**
 * Flattens a definition body into rows, in the order the body lists its fields. Array items are
 * named by position from 1 and by their own `name` or `id` when they have one ("layer 1 (EPS wall)").
 * The definition's `name` itself is left out (the caller shows it as the heading).
 */
export function definitionParameters(body: unknown): ParameterRow[] {
  const rows: ParameterRow[] = [];
  const walk = (v: unknown, path: string[], label: string[], unit: string) => {
    if (v === null || v === undefined) return;
    if (Array.isArray(v)) {
      if (v.every((x) => typeof x === "number")) {
        rows.push({ path: path.join("."), label: label.join(": "), value: v.join(" to "), unit });
        return;
      }
      v.forEach((item, i) => {
        const own = item && typeof item === "object" ? ((item as Record<string, unknown>).name ?? (item as Record<string, unknown>).id) : undefined;
        const head = `${singular(label[label.length - 1] ?? "item")} ${i + 1}${typeof own === "string" ? ` (${own})` : ""}`;
        walk(item, [...path, String(i + 1)], [...label.slice(0, -1), head], "");
      });
      return;
    }
    if (typeof v === "object") {
      for (const [k, x] of Object.entries(v as Record<string, unknown>)) {
        if ((k === "name" || k === "id") && path.length > 0 && /^\d+$/.test(path[path.length - 1]!)) continue; // already in the item's heading
        if (k === "name" && path.length === 0) continue;
        const { base, unit: u } = unitOf(k);
        walk(x, [...path, k], [...label, FIELD_LABELS[k] ?? words(base)], u);
      }
      return;
    }
    if (typeof v === "number" || typeof v === "string" || typeof v === "boolean") rows.push({ path: path.join("."), label: label.join(": "), value: v, unit });
  };
  walk(body, [], [], "");
  return rows;
}

/** A number for reading: at most 6 significant digits, no trailing zeros (stored values stay exact). */
export function readableNumber(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  if (x === 0) return "0";
  const a = Math.abs(x);
  if (a >= 1e-4 && a < 1e9) return String(Number(x.toPrecision(6)));
  return x.toPrecision(6).replace(/\.?0+e/, "e");
}

type RuleWords = { kind?: string; channel?: string; model?: string; above_C?: number; below_C?: number; max_cumulative_min?: number; max_continuous_min?: number; max_peak_C?: number; max_log10_increase?: number; max_consumed_percent?: number };

/**
 * What a threshold rule allows beyond its threshold, in words: "at most 180 min in all, at most 120 min at a
 * stretch", "never beyond 8 °C", or "no time allowed" (a rule with no allowance allows no time beyond).
 */
export function ruleAllowance(r: RuleWords): string {
  const parts: string[] = [];
  if (r.max_cumulative_min !== undefined) parts.push(`at most ${r.max_cumulative_min} min in all`);
  if (r.max_continuous_min !== undefined) parts.push(`at most ${r.max_continuous_min} min at a stretch`);
  if (r.max_peak_C !== undefined) parts.push(`never beyond ${r.max_peak_C} °C`);
  if (parts.length === 0) parts.push("no time allowed");
  return parts.join(", ");
}

/** A limit rule in words: "core above 5 °C, at most 120 min in all". */
export function describeRule(r: RuleWords): string {
  if (r.kind === "growth") return `growth of model ${r.model} on the ${r.channel ?? "core"}, at most ${r.max_log10_increase} log10 increase`;
  if (r.kind === "shelf_life") return `shelf life${r.model ? ` (model ${r.model})` : ""} on the ${r.channel ?? "core"}, at most ${r.max_consumed_percent} % consumed`;
  return `${r.channel} ${r.above_C !== undefined ? `above ${r.above_C}` : `below ${r.below_C}`} °C, ${ruleAllowance(r)}`;
}
