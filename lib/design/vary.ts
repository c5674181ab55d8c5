import type { Pack, Product } from "../thermal/definitions";

/** The design variable of a sizing run: a layer's thickness, a coolant's mass, or the product's initial temperature. */
export type DesignVariable =
  | { kind: "layer"; index: number; field: "thickness_m" }
  | { kind: "coolant"; index: number; field: "mass_kg" }
  | { kind: "product"; field: "initial_C" };

/** "layer:N:thickness_m" | "coolant:N:mass_kg" | "product:initial_C", N counting from 1 as the editors list them. */
export function parseVariable(text: string): DesignVariable | null {
  let m = /^layer:(\d+):thickness_m$/.exec(text);
  if (m) return { kind: "layer", index: Number(m[1]) - 1, field: "thickness_m" };
  m = /^coolant:(\d+):mass_kg$/.exec(text);
  if (m) return { kind: "coolant", index: Number(m[1]) - 1, field: "mass_kg" };
  if (text === "product:initial_C") return { kind: "product", field: "initial_C" };
  return null;
}

export function describeVariable(v: DesignVariable): string {
  return v.kind === "product" ? "product:initial_C" : `${v.kind}:${v.index + 1}:${v.field}`;
}

/** Precision of the search for each kind of variable: 0.1 mm, 10 g, 0.01 K. */
export function precisionOf(v: DesignVariable): number {
  return v.kind === "layer" ? 1e-4 : v.kind === "coolant" ? 0.01 : 0.01;
}

/** True when a larger value helps (thicker, more coolant); false when a smaller one does (a colder start). */
export function largerIsBetter(v: DesignVariable): boolean {
  return v.kind !== "product";
}

/** Copies of the definitions with the variable set to x. */
export function withValue(product: Product, pack: Pack | undefined, v: DesignVariable, x: number): { product: Product; pack: Pack | undefined } {
  if (v.kind === "product") return { product: { ...product, initial_C: x }, pack };
  if (!pack) throw new Error(`${describeVariable(v)} needs a pack`);
  if (v.kind === "layer") {
    if (!pack.layers[v.index]) throw new Error(`the pack has no layer ${v.index + 1}`);
    return { product, pack: { ...pack, layers: pack.layers.map((l, i) => (i === v.index ? { ...l, thickness_m: x } : l)) } };
  }
  if (!pack.coolants[v.index]) throw new Error(`the pack has no coolant ${v.index + 1}`);
  return { product, pack: { ...pack, coolants: pack.coolants.map((c, i) => (i === v.index ? { ...c, mass_kg: x } : c)) } };
}

/** The variable's value as the definitions give it (SI): what a study runs at unless told otherwise. */
export function valueOf(product: Product, pack: Pack | undefined, v: DesignVariable): number {
  if (v.kind === "product") return product.initial_C;
  if (!pack) throw new Error(`${describeVariable(v)} needs a pack`);
  if (v.kind === "layer") {
    const layer = pack.layers[v.index];
    if (!layer) throw new Error(`the pack has no layer ${v.index + 1}`);
    return layer.thickness_m;
  }
  const coolant = pack.coolants[v.index];
  if (!coolant) throw new Error(`the pack has no coolant ${v.index + 1}`);
  return coolant.mass_kg;
}

/** How a design variable reads to the user: its name in their words, the display unit and its factor from SI. */
export interface VariableDisplay {
  /** "EPS wall thickness", "gel pack mass", "product initial temperature" */
  name: string;
  unit: "mm" | "g" | "°C";
  /** display value = SI value × factor */
  factor: number;
  /** decimals that show the search precision in the display unit (0.1 mm, 10 g, 0.01 K) */
  decimals: number;
  /** "EPS wall thickness, mm": an axis label */
  label: string;
}

export function displayOf(v: DesignVariable, pack: Pack | undefined): VariableDisplay {
  const make = (name: string, unit: VariableDisplay["unit"], factor: number, decimals: number): VariableDisplay => ({ name, unit, factor, decimals, label: `${name}, ${unit}` });
  if (v.kind === "layer") return make(`${pack?.layers[v.index]?.name ?? `layer ${v.index + 1}`} thickness`, "mm", 1000, 1);
  if (v.kind === "coolant") return make(`${pack?.coolants[v.index]?.name ?? `coolant ${v.index + 1}`} mass`, "g", 1000, 0);
  return make("product initial temperature", "°C", 1, 2);
}

/** "EPS wall thickness 33.7 mm": which design value a study ran at, in the user's words and unit. */
export function designValueText(x: number, d: VariableDisplay): string {
  return `${d.name} ${formatVariable(x, d)}`;
}

/** "33.7 mm": an SI value of the variable in the user's unit, to the search precision. */
export function formatVariable(x: number, d: VariableDisplay): string {
  return `${(x * d.factor).toFixed(d.decimals)} ${d.unit}`;
}

