// The shipment manifest of `corelag shipment review`: a reference, an optional lane, one limit set and the
// loggers of the load, each with its trace file and the products it stands for. Paths are relative to the
// manifest file; resolving them is the caller's job (the engine reads no files).
import { z } from "zod";
import { capped, strictObject } from "../quantity";

/** Loggers in one shipment and products per logger: a truck or container, not a warehouse. */
export const MAX_LOGGERS = 200;
export const MAX_PRODUCTS_PER_LOGGER = 50;

const file = (what: string) => z.string({ error: `${what} must be a file path` }).trim().min(1, { message: `${what} must be a file path` }).max(1000);

export const manifestProductSchema = strictObject({
  product: file("product"),
  pack: file("pack").optional(),
  /** this logger governs the product (else the worst of the loggers covering it does) */
  governing: z.boolean({ error: "governing must be true or false" }).optional(),
});

export const manifestLoggerSchema = strictObject({
  trace: file("trace"),
  position: z.string().trim().max(120).optional(),
  serial: z.string().trim().min(1).max(120).optional(),
  products: capped(manifestProductSchema, "products", MAX_PRODUCTS_PER_LOGGER, 1),
});

export const manifestSchema = strictObject({
  reference: z.string({ error: "reference is required" }).trim().min(1, { message: "reference is required" }).max(120),
  lane: z.string().trim().min(1).max(120).optional(),
  limits: file("limits"),
  loggers: capped(manifestLoggerSchema, "loggers", MAX_LOGGERS, 1),
}).superRefine((m, ctx) => {
  // At most one governing logger per product; the same product twice on one logger is a typing mistake.
  const governing = new Map<string, number>();
  m.loggers.forEach((l, i) => {
    const seen = new Set<string>();
    l.products.forEach((p, j) => {
      if (seen.has(p.product)) ctx.addIssue({ code: "custom", path: ["loggers", i, "products", j, "product"], message: `${p.product} is listed twice for this logger` });
      seen.add(p.product);
      if (p.governing) {
        const first = governing.get(p.product);
        if (first !== undefined) ctx.addIssue({ code: "custom", path: ["loggers", i, "products", j, "governing"], message: `${p.product} already has a governing logger (loggers.${first}); name one, or none to use the worst` });
        else governing.set(p.product, i);
      }
    });
  });
});
export type Manifest = z.infer<typeof manifestSchema>;
