import { z } from "zod";
import { bareProductSchema, type BareProduct } from "../thermal/product";
import { limitSetSchema, type LimitSet } from "../exposure/limits";
import { runReview, ENGINE_VERSION, resultHash } from "../review";
import { getTrace } from "../db/traces";
import { getDefinition } from "../db/definitions";
import { createReview } from "../db/reviews";

export const runReviewRequestSchema = z.object({
  title: z.string().trim().min(1, { message: "give the review a title" }).max(160),
  traceId: z.string().min(1, { message: "choose a trace" }),
  productId: z.string().min(1, { message: "choose a product" }),
  limitsId: z.string().min(1, { message: "choose a limit set" }),
});
export type RunReviewRequest = z.infer<typeof runReviewRequestSchema>;

export type RunReviewOutcome = { ok: true; reviewId: string } | { ok: false; field: keyof RunReviewRequest | "form"; message: string };

/** Loads the exact stored inputs, runs the engine and stores the review pointing at those versions. */
export async function runAndStoreReview(req: RunReviewRequest): Promise<RunReviewOutcome> {
  const trace = await getTrace(req.traceId);
  if (!trace) return { ok: false, field: "traceId", message: "that trace does not exist" };
  const productDef = await getDefinition<BareProduct>(req.productId);
  if (!productDef || productDef.kind !== "product") return { ok: false, field: "productId", message: "that product does not exist" };
  const limitsDef = await getDefinition<LimitSet>(req.limitsId);
  if (!limitsDef || limitsDef.kind !== "limits") return { ok: false, field: "limitsId", message: "that limit set does not exist" };
  // Stored bodies were validated when saved; parse again so an engine never sees an unchecked value.
  const product = bareProductSchema.parse(productDef.body);
  const limits = limitSetSchema.parse(limitsDef.body);
  const missing = limits.rules.find((r) => r.channel !== "air" && r.channel !== "core");
  if (missing) {
    return { ok: false, field: "limitsId", message: `rule '${missing.id}' is on the '${missing.channel}' channel; this review has only air and core` };
  }
  const { result, core_C } = runReview({ series: trace.series, product, limits });
  const reviewId = await createReview({
    title: req.title,
    traceId: trace.meta.id,
    productId: productDef.id,
    limitsId: limitsDef.id,
    options: { model: "lumped" },
    engineVersion: ENGINE_VERSION,
    result,
    core_C,
    resultSha256: resultHash(result, core_C),
  });
  return { ok: true, reviewId };
}
