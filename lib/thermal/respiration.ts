import type { Respiration } from "./definitions";

/**
 * Heat of respiration, W per kg of product, at t_C. Constant, or Becker and Fricke (1996),
 * "Transpiration and respiration of fruits and vegetables", in New Developments in Refrigeration for
 * Food Safety and Quality, IIR: W = (10.7·f/3600)·(9t/5 + 32)^g, t in °C, f and g per commodity
 * (as reproduced in ASHRAE Handbook—Refrigeration, "Thermal Properties of Foods"; recalled from memory).
 * The correlation is for fresh produce above its freezing point; it is taken as zero where 9t/5 + 32 ≤ 0
 * (below −17.8 °C), where the power is undefined.
 */
export function respirationHeat_W_kg(r: Respiration, t_C: number): number {
  if (r.model === "constant") return r.W_kg;
  const f = (9 * t_C) / 5 + 32;
  return f > 0 ? ((10.7 * r.f) / 3600) * f ** r.g : 0;
}

export function describeRespiration(r: Respiration): string {
  return r.model === "constant"
    ? `heat of respiration ${r.W_kg} W/kg (constant)`
    : `heat of respiration by Becker and Fricke (1996) with f = ${r.f}, g = ${r.g} (${respirationHeat_W_kg(r, 5).toPrecision(2)} W/kg at 5 °C)`;
}
