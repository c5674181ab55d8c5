import type { Product } from "./definitions";
import { shapeGeometry, type Geometry } from "./geometry";
import { compositionMaterial, constantMaterial, type Material } from "./properties/material";
import { estimateFreezingPoint } from "./properties/freezingPoint";

/** Where the initial freezing point came from. */
export interface FreezingInfo {
  freezing_point_C: number | null;
  source: "given" | "estimated" | "none" | "not needed";
  /** what the review must say (an estimate used, or water below 0 °C treated as liquid) */
  note: string | null;
}

/** A product with everything the models need worked out once: geometry, material, mass, area. */
export interface ResolvedProduct {
  product: Product;
  geometry: Geometry | null;
  material: Material;
  mass_kg: number;
  /** volume, m³ (from the shape, else mass/density when density is known) */
  volume_m3: number | null;
  area_m2: number;
  /** conductivity at the initial temperature, W/(m·K), when known */
  k_W_mK: number | null;
  freezing: FreezingInfo;
}

/**
 * Composition, when given, sets the properties (Choi–Okos, with freezing below freezing_point_C);
 * otherwise the given properties are used as constants. Mass defaults to density × volume.
 * A composition product that can go below 0 °C (its initial temperature, or `lowest_C`, the coldest
 * air it will meet) without a given freezing point gets an estimated one where a correlation applies;
 * where none does, the note says that water below 0 °C is treated as liquid.
 */
export function resolveProduct(product: Product, lowest_C: number = product.initial_C): ResolvedProduct {
  const geometry = product.shape ? shapeGeometry(product.shape) : null;
  let freezing: FreezingInfo = { freezing_point_C: product.freezing_point_C ?? null, source: product.freezing_point_C !== undefined ? "given" : "not needed", note: null };
  if (product.composition && product.freezing_point_C === undefined && Math.min(lowest_C, product.initial_C) < 0) {
    const est = estimateFreezingPoint(product.composition);
    freezing =
      "freezing_point_C" in est
        ? {
            freezing_point_C: est.freezing_point_C,
            source: "estimated",
            note: `initial freezing point estimated at ${est.freezing_point_C.toFixed(1)} °C (${est.correlation} correlation of ${est.source}); give freezing_point_C to use a measured value`,
          }
        : {
            freezing_point_C: null,
            source: "none",
            note: `the product can go below 0 °C but has no initial freezing point and none can be estimated (${est.reason}): its water is treated as liquid below 0 °C, so freezing and thawing plateaus are missing from this prediction; give freezing_point_C`,
          };
  }
  const material = product.composition
    ? compositionMaterial(product.composition, freezing.freezing_point_C ?? undefined, freezing.source === "estimated")
    : constantMaterial(product.properties!);
  const t0 = product.initial_C;
  const rho = product.composition ? material.density(t0) : product.properties?.density_kg_m3;
  const volume_m3 = geometry?.volume_m3 ?? (rho && product.mass_kg ? product.mass_kg / rho : null);
  const mass_kg = product.mass_kg ?? (rho! * geometry!.volume_m3);
  const area_m2 = product.area_m2 ?? geometry!.area_m2;
  const k = product.composition ? material.conductivity(t0) : product.properties?.k_W_mK;
  return { product, geometry, material, mass_kg, volume_m3, area_m2, k_W_mK: k ?? null, freezing };
}
