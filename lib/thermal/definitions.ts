import { z } from "zod";
import { capped, quantity, strictObject } from "../quantity";
import { consequenceModelSchema, MAX_CONSEQUENCES } from "../consequence/definitions";
import { growthRate } from "../consequence/rates";

// Product and pack definitions: the JSON that the UI, the API and the CLI share. SI units in every name.
// Every physical quantity has a plausible range (README.md, "Plausible ranges"): wide enough for any
// chilled or frozen food in transport, narrow enough that the engine never sees 1e308 kg or 1e-300 m.
// Unknown fields are refused by name, so a mistyped "mass_g" is not silently ignored.

/** Product dimensions: 0.5 mm (a leaf, a thin slice) to 3 m (a pallet load). */
const dimension = (what: string) => quantity(what, "m", 0.0005, 3);
/** Heat-transfer coefficients: 0.01 (an effective coefficient behind insulation) to 2000 W/(m²·K) (hydrocooling). */
const filmCoefficient = (what: string) => quantity(what, "W/(m²·K)", 0.01, 2000);
const fraction = (what: string) => quantity(what, "", 0, 1);
/** Food temperatures: -60 °C (deep-frozen storage) to 150 °C (cooking). */
const celsius = (what: string) => quantity(what, "°C", -60, 150);
/** Coolant temperatures: -90 °C (dry ice sublimes at -78.5 °C) to 100 °C. */
const coolantCelsius = (what: string) => quantity(what, "°C", -90, 100);

export const MAX_LAYERS = 20;
export const MAX_COOLANTS = 20;

export const shapeSchema = z.discriminatedUnion(
  "kind",
  [
    strictObject({ kind: z.literal("sphere"), radius_m: dimension("radius") }),
    strictObject({ kind: z.literal("cylinder"), radius_m: dimension("radius"), length_m: dimension("length") }),
    strictObject({ kind: z.literal("slab"), thickness_m: dimension("thickness"), width_m: dimension("width"), length_m: dimension("length") }),
    strictObject({ kind: z.literal("box"), x_m: dimension("x"), y_m: dimension("y"), z_m: dimension("z") }),
  ],
  { error: "shape.kind must be one of sphere, cylinder, slab, box" },
);
export type Shape = z.infer<typeof shapeSchema>;

export const propertiesSchema = strictObject({
  /** 50 (leafy produce, bulk) to 3000 kg/m³ */
  density_kg_m3: quantity("density", "kg/m³", 50, 3000).optional(),
  /** 500 (dry foods) to 6000 J/(kg·K) (water is 4186) */
  cp_J_kgK: quantity("specific heat", "J/(kg·K)", 500, 6000),
  /** 0.02 (dry, porous foods) to 5 W/(m·K) (ice is 2.2) */
  k_W_mK: quantity("thermal conductivity", "W/(m·K)", 0.02, 5).optional(),
});

/** Mass fractions (Choi and Okos, 1986); they must sum to 1 within 0.5 %. */
export const compositionSchema = strictObject({
    water: fraction("water"),
    protein: fraction("protein").default(0),
    fat: fraction("fat").default(0),
    carbohydrate: fraction("carbohydrate").default(0),
    fiber: fraction("fiber").default(0),
    ash: fraction("ash").default(0),
  }).refine((c) => Math.abs(c.water + c.protein + c.fat + c.carbohydrate + c.fiber + c.ash - 1) <= 0.005, {
    message: "mass fractions must sum to 1 (within 0.5 %)",
  });
export type Composition = z.infer<typeof compositionSchema>;

/**
 * Heat of respiration of fresh produce, W/kg: a constant, or the correlation of Becker and Fricke (1996),
 * W = (10.7·f/3600)·(9t/5 + 32)^g with t in °C and commodity coefficients f, g (as reproduced in ASHRAE
 * Handbook—Refrigeration, "Thermal Properties of Foods"; form recalled from memory of that chapter).
 * Ranges: W_kg 0…2 W/kg (produce respires below about 0.5 W/kg even warm); f 0…0.1 and g 0…5
 * (the tabulated coefficients lie far inside).
 */
export const respirationSchema = z.discriminatedUnion(
  "model",
  [
    strictObject({ model: z.literal("constant"), W_kg: quantity("respiration W_kg", "W/kg", 0, 2) }),
    strictObject({ model: z.literal("becker-fricke"), f: quantity("respiration f", "", 0, 0.1, { exclusiveMin: true }), g: quantity("respiration g", "", 0, 5) }),
  ],
  { error: "respiration.model must be constant or becker-fricke" },
);
export type Respiration = z.infer<typeof respirationSchema>;

/**
 * A product. Either `shape` (with `properties` including density, or `composition`) or the bare
 * lumped form of the first release (`mass_kg`, `properties.cp_J_kgK`, `area_m2`, `h_W_m2K`).
 */
export const productSchema = strictObject({
    name: z.string().trim().min(1, { message: "name is required" }).max(120),
    shape: shapeSchema.optional(),
    /** 1 g to 2000 kg (a pallet load) */
    mass_kg: quantity("mass", "kg", 0.001, 2000).optional(),
    properties: propertiesSchema.optional(),
    composition: compositionSchema.optional(),
    /** initial freezing point, °C; with a composition, enables the frozen-state properties */
    freezing_point_C: celsius("freezing point").optional(),
    initial_C: celsius("initial temperature"),
    /** bare form: outer surface area, m² (taken from the shape when absent) */
    area_m2: quantity("surface area", "m²", 0.0001, 100).optional(),
    /** bare form: surface heat-transfer coefficient, W/(m²·K), used when no pack is given */
    h_W_m2K: filmCoefficient("heat-transfer coefficient").optional(),
    /** heat of respiration (fresh produce), W per kg of product */
    respiration: respirationSchema.optional(),
    /** growth and shelf-life models applied to the predicted history (lib/consequence) */
    consequences: capped(consequenceModelSchema, "consequence models", MAX_CONSEQUENCES).optional(),
  }).superRefine((p, ctx) => {
    const ids = new Set<string>();
    p.consequences?.forEach((m, i) => {
      if (ids.has(m.id)) ctx.addIssue({ code: "custom", path: ["consequences", i, "id"], message: `consequence id '${m.id}' is used twice` });
      ids.add(m.id);
      // lag_h becomes q0 through h0 = μmax·λ at the initial temperature: it needs growth there
      if (m.kind === "growth" && m.lag_h !== undefined && m.lag_h > 0 && growthRate(m).value(p.initial_C) === 0) {
        ctx.addIssue({ code: "custom", path: ["consequences", i, "lag_h"], message: `lag_h is read at the initial temperature (${p.initial_C} °C), where model '${m.id}' predicts no growth: give q0 instead` });
      }
    });
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

/**
 * A wall layer. With density and specific heat it stores heat (a node, not only a resistance).
 */
export const layerSchema = strictObject({
  name: z.string().trim().min(1, { message: "layer name is required" }).max(80),
  /** 10 µm (a film) to 1 m */
  thickness_m: quantity("thickness", "m", 0.00001, 1),
  /** 0.001 (vacuum panels are about 0.004) to 500 W/(m·K) (copper is about 400) */
  k_W_mK: quantity("conductivity", "W/(m·K)", 0.001, 500),
  /** 1 (aerogel blanket, foams are 15–40) to 9000 kg/m³ (copper); optional, with cp_J_kgK */
  density_kg_m3: quantity("layer density", "kg/m³", 1, 9000).optional(),
  /** 100 to 5000 J/(kg·K) (EPS about 1300, cardboard about 1400); optional, with density_kg_m3 */
  cp_J_kgK: quantity("layer specific heat", "J/(kg·K)", 100, 5000).optional(),
}).superRefine((l, ctx) => {
  if ((l.density_kg_m3 === undefined) !== (l.cp_J_kgK === undefined)) {
    ctx.addIssue({ code: "custom", path: [l.density_kg_m3 === undefined ? "density_kg_m3" : "cp_J_kgK"], message: "give both density_kg_m3 and cp_J_kgK for a layer that stores heat, or neither" });
  }
});

export const coolantSchema = strictObject({
    name: z.string().trim().min(1, { message: "coolant name is required" }).max(80),
    /** 0 (a placeholder) to 500 kg */
    mass_kg: quantity("mass", "kg", 0, 500),
    melt_C: coolantCelsius("melt temperature"),
    /** 0 to 1 MJ/kg (water 333.6 kJ/kg, dry ice sublimation about 571 kJ/kg) */
    latent_J_kg: quantity("latent heat", "J/kg", 0, 1e6),
    cp_solid_J_kgK: quantity("solid specific heat", "J/(kg·K)", 100, 10000),
    cp_liquid_J_kgK: quantity("liquid specific heat", "J/(kg·K)", 100, 10000),
    initial_C: coolantCelsius("initial temperature"),
    /** surface facing the inner air, 1 cm² to 10 m²; with it the coolant is its own node with its own film */
    area_m2: quantity("coolant area", "m²", 0.0001, 10).optional(),
    /** film coefficient on that surface, 0.01 to 2000 W/(m²·K); default the pack's inside film */
    h_W_m2K: filmCoefficient("coolant film coefficient").optional(),
    /** area in direct contact with the product, 1 cm² to 10 m², with the contact conductance 1 to 5000 W/(m²·K) */
    contact_area_m2: quantity("contact area", "m²", 0.0001, 10).optional(),
    h_contact_W_m2K: quantity("contact conductance", "W/(m²·K)", 1, 5000).optional(),
  }).superRefine((c, ctx) => {
    if (c.area_m2 === undefined && (c.h_W_m2K !== undefined || c.contact_area_m2 !== undefined)) {
      ctx.addIssue({ code: "custom", path: ["area_m2"], message: "area_m2 is required for a coolant film or contact: without it the coolant sits at the inner-air temperature" });
    }
    if ((c.contact_area_m2 === undefined) !== (c.h_contact_W_m2K === undefined)) {
      ctx.addIssue({ code: "custom", path: [c.contact_area_m2 === undefined ? "contact_area_m2" : "h_contact_W_m2K"], message: "give both contact_area_m2 and h_contact_W_m2K, or neither" });
    }
  });
export type Coolant = z.infer<typeof coolantSchema>;

export const packSchema = strictObject({
    name: z.string().trim().min(1, { message: "name is required" }).max(120),
    h_outside_W_m2K: filmCoefficient("outside heat-transfer coefficient"),
    h_inside_W_m2K: filmCoefficient("inside heat-transfer coefficient").optional(),
    emissivity: fraction("emissivity").optional(),
    layers: capped(layerSchema, "layers", MAX_LAYERS).default([]),
    /** area the layers are spread over, m²; plane walls are assumed when given */
    area_m2: quantity("area", "m²", 0.0001, 100).optional(),
    coolants: capped(coolantSchema, "coolants", MAX_COOLANTS).default([]),
    /** where an effective pack came from (a calibration), kept with the definition */
    provenance: strictObject({
        method: z.literal("calibration"),
        trace_sha256: z.string().max(64),
        product_id: z.string().max(100),
        tau_s: z.number().finite(),
        tau_ci95_s: z.tuple([z.number(), z.number()]),
        rmse_K: z.number().finite(),
        fitted_at: z.string().max(40),
        engine_version: z.string().max(40),
      }).optional(),
  }).superRefine((p, ctx) => {
    if (p.coolants.some((c) => c.mass_kg > 0) && p.h_inside_W_m2K === undefined) {
      ctx.addIssue({
        code: "custom",
        path: ["h_inside_W_m2K"],
        message: "h_inside_W_m2K is required with coolants: heat passes between coolant and product through the inner air",
      });
    }
  });
export type Pack = z.infer<typeof packSchema>;

/**
 * Model choice: "auto" picks lumped when Bi < 0.1 over the whole temperature range and the product does
 * not cross its freezing range, conduction otherwise. "conduction" is 3-D for boxes, r–z for
 * cylinders, 1-D for slabs (across the thickness) and spheres; "conduction-1d" is the 1-D shortcut (slab across its thickness, long
 * cylinder, sphere of equal V/A for a box), kept by name.
 */
export const modelChoiceSchema = z.enum(["auto", "lumped", "conduction", "conduction-1d"], { error: "model must be auto, lumped, conduction or conduction-1d" });
export type ModelChoice = z.infer<typeof modelChoiceSchema>;
