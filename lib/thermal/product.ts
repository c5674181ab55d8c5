import { z } from "zod";

const positive = (what: string) => z.number({ error: `${what} must be a number` }).finite().positive({ message: `${what} must be greater than zero` });
const temperature_C = z
  .number({ error: "must be a temperature in °C" })
  .finite()
  .min(-60, { message: "must be at least -60 °C" })
  .max(150, { message: "must be at most 150 °C" });

/**
 * A bare product, modelled as one lumped body: heat flows from the air through one surface film.
 * Density and conductivity are optional; with both, the Biot number can be checked.
 */
export const bareProductSchema = z.object({
  name: z.string().trim().min(1, { message: "name is required" }).max(120),
  mass_kg: positive("mass"),
  properties: z.object({
    cp_J_kgK: positive("specific heat"),
    density_kg_m3: positive("density").optional(),
    k_W_mK: positive("thermal conductivity").optional(),
  }),
  /** outer surface area through which heat reaches the product, m² */
  area_m2: positive("surface area"),
  /** surface heat-transfer coefficient (convection plus radiation), W/(m²·K) */
  h_W_m2K: positive("heat-transfer coefficient"),
  /** product temperature at the first sample, °C */
  initial_C: temperature_C,
});
export type BareProduct = z.infer<typeof bareProductSchema>;
