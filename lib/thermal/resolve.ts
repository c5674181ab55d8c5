import type { Product } from "./definitions";
import { shapeGeometry, type Geometry } from "./geometry";
import { compositionMaterial, constantMaterial, type Material } from "./properties/material";

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
}

/**
 * Composition, when given, sets the properties (Choi–Okos, with freezing below freezing_point_C);
 * otherwise the given properties are used as constants. Mass defaults to density × volume.
 */
export function resolveProduct(product: Product): ResolvedProduct {
  const geometry = product.shape ? shapeGeometry(product.shape) : null;
  const material = product.composition
    ? compositionMaterial(product.composition, product.freezing_point_C)
    : constantMaterial(product.properties!);
  const t0 = product.initial_C;
  const rho = product.composition ? material.density(t0) : product.properties?.density_kg_m3;
  const volume_m3 = geometry?.volume_m3 ?? (rho && product.mass_kg ? product.mass_kg / rho : null);
  const mass_kg = product.mass_kg ?? (rho! * geometry!.volume_m3);
  const area_m2 = product.area_m2 ?? geometry!.area_m2;
  const k = product.composition ? material.conductivity(t0) : product.properties?.k_W_mK;
  return { product, geometry, material, mass_kg, volume_m3, area_m2, k_W_mK: k ?? null };
}
