import type { BareProduct } from "./product";

export interface Screening {
  /** lumped time constant tau = R_total·C_total, s */
  tau_s: number;
  /** total resistance from air to product, K/W */
  r_total_K_W: number;
  /** heat capacity m·cp, J/K */
  c_total_J_K: number;
  /** characteristic length V/A, m; null when the product's density is not known */
  lc_m: number | null;
  /** Biot number h_eff·Lc/k; null when density or conductivity is not known */
  biot: number | null;
  /** model used and why */
  model: "lumped";
  reason: string;
}

/** The lumped-capacitance criterion Bi < 0.1 (Incropera et al., Fundamentals of Heat and Mass Transfer, §5.1–5.2; a rule of thumb). */
export const LUMPED_BIOT_LIMIT = 0.1;

export function screenBareProduct(product: BareProduct): Screening {
  const r_total_K_W = 1 / (product.h_W_m2K * product.area_m2);
  const c_total_J_K = product.mass_kg * product.properties.cp_J_kgK;
  const tau_s = r_total_K_W * c_total_J_K;
  const { density_kg_m3, k_W_mK } = product.properties;
  const lc_m = density_kg_m3 ? product.mass_kg / density_kg_m3 / product.area_m2 : null;
  const biot = lc_m !== null && k_W_mK ? (product.h_W_m2K * lc_m) / k_W_mK : null;
  let reason: string;
  if (biot === null) {
    reason =
      "Biot number not checked (density and conductivity are needed): the lumped model assumes one temperature stands for the whole product, so the predicted core may lead the true core";
  } else if (biot < LUMPED_BIOT_LIMIT) {
    reason = `Bi = ${biot.toPrecision(2)} < ${LUMPED_BIOT_LIMIT}: internal gradients are small, one temperature stands for the whole product`;
  } else {
    reason = `Bi = ${biot.toPrecision(2)} ≥ ${LUMPED_BIOT_LIMIT}: the lumped model is outside its usual range and the core will lag more than predicted; a conduction model is needed for a reliable core estimate`;
  }
  return { tau_s, r_total_K_W, c_total_J_K, lc_m, biot, model: "lumped", reason };
}

/** A duration in readable units: "45 s", "12.5 min", "3 h 20 min", "2 d 4 h". */
export function readableDuration(seconds: number): string {
  if (!Number.isFinite(seconds)) return String(seconds);
  if (seconds < 90) return `${Number(seconds.toPrecision(3))} s`;
  const min = seconds / 60;
  if (min < 90) return `${Number(min.toPrecision(3))} min`;
  const totalMin = Math.round(min);
  const h = Math.floor(totalMin / 60);
  if (h < 48) return `${h} h ${totalMin - h * 60} min`;
  const totalH = Math.round(min / 60);
  const d = Math.floor(totalH / 24);
  return `${d} d ${totalH - d * 24} h`;
}
