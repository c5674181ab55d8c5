import { z } from "zod";

// Product and pack definitions: the JSON that the UI, the API and the CLI share. SI units in every name.

const pos = (what: string) =>
  z.number({ error: `${what} must be a number` }).finite().positive({ message: `${what} must be greater than zero` });
const fraction = (what: string) =>
  z.number({ error: `${what} must be a number` }).finite().min(0, { message: `${what} cannot be negative` }).max(1, { message: `${what} cannot exceed 1` });
const celsius = (what: string) =>
  z.number({ error: `${what} must be a temperature in °C` }).finite().min(-60, { message: `${what} must be at least -60 °C` }).max(150, { message: `${what} must be at most 150 °C` });

export const shapeSchema = z.discriminatedUnion(
  "kind",
  [
    z.object({ kind: z.literal("sphere"), radius_m: pos("radius") }),
    z.object({ kind: z.literal("cylinder"), radius_m: pos("radius"), length_m: pos("length") }),
    z.object({ kind: z.literal("slab"), thickness_m: pos("thickness"), width_m: pos("width"), length_m: pos("length") }),
    z.object({ kind: z.literal("box"), x_m: pos("x"), y_m: pos("y"), z_m: pos("z") }),
  ],
  { error: "shape.kind must be one of sphere, cylinder, slab, box" },
);
export type Shape = z.infer<typeof shapeSchema>;

export const propertiesSchema = z.object({
  density_kg_m3: pos("density").optional(),
  cp_J_kgK: pos("specific heat"),
  k_W_mK: pos("thermal conductivity").optional(),
});

/** Mass fractions (Choi and Okos, 1986); they must sum to 1 within 0.5 %. */
export const compositionSchema = z
  .object({
    water: fraction("water"),
    protein: fraction("protein").default(0),
    fat: fraction("fat").default(0),
    carbohydrate: fraction("carbohydrate").default(0),
    fiber: fraction("fiber").default(0),
    ash: fraction("ash").default(0),
  })
  .refine((c) => Math.abs(c.water + c.protein + c.fat + c.carbohydrate + c.fiber + c.ash - 1) <= 0.005, {
    message: "mass fractions must sum to 1 (within 0.5 %)",
  });
export type Composition = z.infer<typeof compositionSchema>;

/**
 * A product. Either `shape` (with `properties` including density, or `composition`) or the bare
 * lumped form of the first release (`mass_kg`, `properties.cp_J_kgK`, `area_m2`, `h_W_m2K`).
 */
export const productSchema = z
  .object({
    name: z.string().trim().min(1, { message: "name is required" }).max(120),
    shape: shapeSchema.optional(),
    mass_kg: pos("mass").optional(),
    properties: propertiesSchema.optional(),
    composition: compositionSchema.optional(),
    /** initial freezing point, °C; with a composition, enables the frozen-state properties */
    freezing_point_C: celsius("freezing point").optional(),
    initial_C: celsius("initial temperature"),
    /** bare form: outer surface area, m² (taken from the shape when absent) */
    area_m2: pos("surface area").optional(),
    /** bare form: surface heat-transfer coefficient, W/(m²·K), used when no pack is given */
    h_W_m2K: pos("heat-transfer coefficient").optional(),
  })
  .superRefine((p, ctx) => {
    if (!p.properties && !p.composition) {
      ctx.addIssue({ code: "custom", path: ["properties"], message: "give either properties or composition" });
    }
    if (!p.shape && p.area_m2 === undefined) {
      ctx.addIssue({ code: "custom", path: ["shape"], message: "give a shape, or area_m2 for a bare lumped product" });
    }
    if (!p.shape && p.mass_kg === undefined) {
      ctx.addIssue({ code: "custom", path: ["mass_kg"], message: "mass_kg is required when no shape is given" });
    }
    if (p.shape && p.mass_kg === undefined && !p.composition && p.properties?.density_kg_m3 === undefined) {
      ctx.addIssue({ code: "custom", path: ["properties", "density_kg_m3"], message: "give density (or mass_kg) so the mass can be found from the shape" });
    }
    if (p.freezing_point_C !== undefined && p.freezing_point_C > 0.0) {
      ctx.addIssue({ code: "custom", path: ["freezing_point_C"], message: "an initial freezing point above 0 °C is not physical for a food" });
    }
  });
export type Product = z.infer<typeof productSchema>;

export const layerSchema = z.object({
  name: z.string().trim().min(1, { message: "layer name is required" }).max(80),
  thickness_m: pos("thickness").max(1, { message: "thickness must be at most 1 m" }),
  k_W_mK: pos("conductivity"),
});

export const coolantSchema = z
  .object({
    name: z.string().trim().min(1, { message: "coolant name is required" }).max(80),
    mass_kg: z.number({ error: "mass must be a number" }).finite().min(0, { message: "mass cannot be negative" }),
    melt_C: celsius("melt temperature"),
    latent_J_kg: z.number({ error: "latent heat must be a number" }).finite().min(0, { message: "latent heat cannot be negative" }),
    cp_solid_J_kgK: pos("solid specific heat"),
    cp_liquid_J_kgK: pos("liquid specific heat"),
    initial_C: celsius("initial temperature"),
  });
export type Coolant = z.infer<typeof coolantSchema>;

export const packSchema = z
  .object({
    name: z.string().trim().min(1, { message: "name is required" }).max(120),
    h_outside_W_m2K: pos("outside heat-transfer coefficient"),
    h_inside_W_m2K: pos("inside heat-transfer coefficient").optional(),
    emissivity: fraction("emissivity").optional(),
    layers: z.array(layerSchema).default([]),
    /** area the layers are spread over, m²; plane walls are assumed when given */
    area_m2: pos("area").optional(),
    coolants: z.array(coolantSchema).default([]),
    /** where an effective pack came from (a calibration), kept with the definition */
    provenance: z
      .object({
        method: z.literal("calibration"),
        trace_sha256: z.string(),
        product_id: z.string(),
        tau_s: z.number(),
        tau_ci95_s: z.tuple([z.number(), z.number()]),
        rmse_K: z.number(),
        fitted_at: z.string(),
        engine_version: z.string(),
      })
      .optional(),
  })
  .superRefine((p, ctx) => {
    if (p.coolants.some((c) => c.mass_kg > 0) && p.h_inside_W_m2K === undefined) {
      ctx.addIssue({
        code: "custom",
        path: ["h_inside_W_m2K"],
        message: "h_inside_W_m2K is required with coolants: heat passes between coolant and product through the inner air",
      });
    }
  });
export type Pack = z.infer<typeof packSchema>;

/** Model choice: "auto" picks lumped when Bi < 0.1, 1-D conduction otherwise. */
export const modelChoiceSchema = z.enum(["auto", "lumped", "conduction"], { error: "model must be auto, lumped or conduction" });
export type ModelChoice = z.infer<typeof modelChoiceSchema>;
