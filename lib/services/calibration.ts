import { z } from "zod";
import { storedRefusal } from "./storedRefusal";
import type { CalibrationResult } from "../design/calibrate";
import { calibrateInPool } from "./enginePool";
import { packSchema, productSchema, type Pack, type Product } from "../thermal/definitions";
import { bridgeGaps } from "../trace/series";
import { getTrace } from "../db/traces";
import { createDefinition, getDefinition, reviseDefinition, type StoredDefinition } from "../db/definitions";
import { ENGINE_VERSION } from "../review/runReview";
import type { Actor } from "../access/actor";

export const calibrationRequestSchema = z.object({
  traceId: z.string().min(1, { message: "choose a trace with a product probe" }),
  productId: z.string().optional(),
  packId: z.string().optional(),
  fitInitial: z.boolean().default(false),
  fitOffset: z.boolean().default(false),
  mismatchFactor: z.number().finite().gt(1, { message: "the factor must be greater than 1" }).default(2),
});
export type CalibrationRequest = z.input<typeof calibrationRequestSchema>;

export type CalibrationOutcome =
  | { ok: true; result: CalibrationResult; t_s: Float64Array; air_C: Float64Array; probe_C: Float64Array; traceSha256: string; product?: StoredDefinition<Product>; pack?: StoredDefinition<Pack> }
  | { ok: false; message: string };

export async function runCalibration(request: CalibrationRequest): Promise<CalibrationOutcome> {
  const req = calibrationRequestSchema.parse(request);
  const trace = await getTrace(req.traceId);
  if (!trace) return { ok: false, message: "that trace does not exist" };
  if (!trace.series.probe_C) return { ok: false, message: "this trace has no product-probe channel; import it with one" };
  const product = req.productId ? await getDefinition<Product>(req.productId) : null;
  const pack = req.packId ? await getDefinition<Pack>(req.packId) : null;
  if (pack && !product) return { ok: false, message: "choose the product too when comparing with a pack" };
  const pParsed = product ? productSchema.safeParse(product.body) : undefined;
  if (pParsed && !pParsed.success) return { ok: false, message: storedRefusal("product", product!, pParsed.error) };
  const kParsed = pack ? packSchema.safeParse(pack.body) : undefined;
  if (kParsed && !kParsed.success) return { ok: false, message: storedRefusal("pack", pack!, kParsed.error) };
  const p = pParsed?.data;
  const k = kParsed?.data;
  if (p && !k && p.h_W_m2K === undefined) return { ok: false, message: "this product has no surface coefficient of its own: choose its pack" };
  const air = bridgeGaps(trace.series);
  // The fit runs in the engine's worker pool, off the request thread, like review runs.
  const fit = await calibrateInPool({
    t_s: trace.series.t_s,
    air_C: air,
    probe_C: trace.series.probe_C,
    options: { fitInitial: req.fitInitial, fitOffset: req.fitOffset, mismatchFactor: req.mismatchFactor },
    definitions: p ? { product: p, pack: k } : undefined,
  });
  if (!fit.ok) return fit;
  return { ok: true, result: fit.result, t_s: trace.series.t_s, air_C: air, probe_C: trace.series.probe_C, traceSha256: trace.meta.sha256, product: product ?? undefined, pack: pack ?? undefined };
}

/**
 * Saves a calibration as an "effective" pack: one outside film whose coefficient gives the fitted
 * R_total for this product's area, no layers, and the calibration's provenance. When the calibration
 * was compared with a pack, the effective pack is a new version of that pack (the old version stays
 * for the reviews that used it); otherwise it is a new pack. Later reviews can use it.
 */
export async function saveEffectivePack(request: CalibrationRequest & { name: string }, actor: Actor): Promise<{ ok: true; packId: string } | { ok: false; message: string }> {
  const out = await runCalibration(request);
  if (!out.ok) return out;
  if (!out.product || out.result.h_eff_W_m2K === undefined) return { ok: false, message: "choose the product: the effective coefficient is referred to its surface" };
  const parsed = packSchema.safeParse({
    name: request.name,
    h_outside_W_m2K: out.result.h_eff_W_m2K,
    layers: [],
    coolants: [],
    provenance: {
      method: "calibration",
      trace_sha256: out.traceSha256,
      product_id: out.product.id,
      tau_s: out.result.tau_s,
      tau_ci95_s: out.result.tau_ci95_s,
      rmse_K: out.result.rmse_K,
      fitted_at: new Date().toISOString(),
      engine_version: ENGINE_VERSION,
    },
  });
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    return { ok: false, message: `the fitted pack cannot be saved: field '${issue.path.join(".")}': ${issue.message}` };
  }
  const body = parsed.data;
  const saved = out.pack ? await reviseDefinition(out.pack.lineage, body, actor) : await createDefinition("pack", body, actor);
  return { ok: true, packId: saved.id };
}
