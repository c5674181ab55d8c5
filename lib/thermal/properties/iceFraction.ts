// Ice fraction below the initial freezing point: Tchigeov's empirical equation (1979), as given in
// ASHRAE Handbook—Refrigeration, chapter "Thermal Properties of Foods" (the ice-fraction section):
//   x_ice = 1.105·x_wo / (1 + 0.7138 / ln(t_f − t + 1)),  t < t_f (°C),
// x_wo the total water mass fraction. Equation recalled from memory of that chapter; the constants
// are checked in the tests only for internal consistency (zero at t_f, below x_wo everywhere).

/** Mass fraction of ice at t_C for a food with water fraction x_wo and initial freezing point t_f_C. */
export function iceFraction(t_C: number, x_wo: number, t_f_C: number): number {
  if (t_C >= t_f_C) return 0;
  const x = (1.105 * x_wo) / (1 + 0.7138 / Math.log(t_f_C - t_C + 1));
  return Math.min(x, x_wo);
}

/** Latent heat of fusion of water at 0 °C, J/kg (333.6 kJ/kg; ASHRAE Handbook—Fundamentals, water properties). */
export const LATENT_FUSION_WATER_J_kg = 333_600;
