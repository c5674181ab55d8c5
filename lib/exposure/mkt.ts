/** ΔH/R for the default activation energy 83.144 kJ/mol (USP general chapter <1079.2>/<659>, ICH Q1A): 10,000 K. */
export const DEFAULT_ACTIVATION_kJ_mol = 83.144;
/**
 * Gas constant as the USP storage chapter writes it, 8.3144 J/(mol·K), so that the default ΔH/R is
 * exactly 10,000 K as published (CODATA's 8.314462618 would move MKT by under 0.002 K).
 */
export const GAS_CONSTANT_J_molK = 8.3144;

/**
 * Mean kinetic temperature of a piecewise-linear series, °C:
 *   T_MKT = (ΔH/R) / −ln( Σ wi·exp(−ΔH/(R·Ti)) / Σ wi ),  T in kelvin,
 * where each reading's weight wi is the time it stands for: half of each adjoining interval, and a full
 * interval for the first and last readings. Equally spaced readings thus reduce exactly to the published
 * unweighted mean; irregular sampling is weighted by time rather than by count.
 */
export function meanKineticTemperature_C(t_s: Float64Array, value_C: Float64Array, activation_kJ_mol = DEFAULT_ACTIVATION_kJ_mol): number {
  const n = t_s.length;
  if (n === 0) return Number.NaN;
  if (n === 1) return value_C[0]!;
  const dHoverR = (activation_kJ_mol * 1000) / GAS_CONSTANT_J_molK;
  let num = 0;
  let den = 0;
  for (let i = 0; i < n; i++) {
    const left = i > 0 ? t_s[i]! - t_s[i - 1]! : t_s[1]! - t_s[0]!;
    const right = i < n - 1 ? t_s[i + 1]! - t_s[i]! : t_s[n - 1]! - t_s[n - 2]!;
    const w = (left + right) / 2;
    num += w * Math.exp(-dHoverR / (value_C[i]! + 273.15));
    den += w;
  }
  return dHoverR / -Math.log(num / den) - 273.15;
}
