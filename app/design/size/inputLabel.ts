import type { Pack, Product } from "@/lib/thermal/definitions";

/** Words and units for the numeric fields of a product or pack, by field name. */
const FIELDS: Record<string, [string, string]> = {
  mass_kg: ["mass", "kg"],
  cp_J_kgK: ["specific heat", "J/(kg·K)"],
  k_W_mK: ["conductivity", "W/(m·K)"],
  density_kg_m3: ["density", "kg/m³"],
  initial_C: ["initial temperature", "°C"],
  freezing_point_C: ["freezing point", "°C"],
  melt_C: ["melting point", "°C"],
  area_m2: ["area", "m²"],
  h_W_m2K: ["surface heat-transfer coefficient", "W/(m²·K)"],
  h_outside_W_m2K: ["outside heat-transfer coefficient", "W/(m²·K)"],
  h_inside_W_m2K: ["inside heat-transfer coefficient", "W/(m²·K)"],
  emissivity: ["emissivity", ""],
  thickness_m: ["thickness", "m"],
  radius_m: ["radius", "m"],
  length_m: ["length", "m"],
  width_m: ["width", "m"],
  x_m: ["x", "m"],
  y_m: ["y", "m"],
  z_m: ["z", "m"],
  latent_J_kg: ["latent heat", "J/kg"],
  cp_solid_J_kgK: ["solid specific heat", "J/(kg·K)"],
  cp_liquid_J_kgK: ["liquid specific heat", "J/(kg·K)"],
};

/**
 * An uncertain input's path in words: "pack.layers.0.k_W_mK" → "EPS wall conductivity, W/(m·K)",
 * "product.composition.water" → "product water mass fraction". Unknown fields keep their path.
 */
export function inputLabel(path: string, product: Product, pack?: Pack): string {
  const parts = path.split(".");
  const field = parts[parts.length - 1]!;
  let owner = parts[0] === "product" ? "product" : "pack";
  if (parts[1] === "layers" && pack) owner = pack.layers[Number(parts[2])]?.name ?? `layer ${Number(parts[2]) + 1}`;
  if (parts[1] === "coolants" && pack) owner = pack.coolants[Number(parts[2])]?.name ?? `coolant ${Number(parts[2]) + 1}`;
  if (parts[1] === "shape") owner = `product ${product.shape?.kind ?? "shape"}`;
  if (parts[1] === "composition") return `${owner} ${field} mass fraction`;
  const words = FIELDS[field];
  return words ? `${owner} ${words[0]}${words[1] ? `, ${words[1]}` : ""}` : path;
}
