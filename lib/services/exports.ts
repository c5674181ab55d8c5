import { getReview } from "../db/reviews";
import { getTrace } from "../db/traces";
import { logExport } from "../db/audit";
import { canonicalJson, findingsCsv, seriesCsv } from "../review";
import { bridgeGaps } from "../trace/series";
import { sha256Hex } from "../trace/hash";
import { verifyReviewRecord } from "./verify";
import type { Actor } from "../access/actor";

export const REVIEW_EXPORT_FORMATS = ["series.csv", "findings.csv", "review.json"] as const;
export type ReviewExportFormat = (typeof REVIEW_EXPORT_FORMATS)[number];

export type ReviewExport = { ok: true; body: string; contentType: string; fileName: string } | { ok: false; status: 404; message: string };

/** Builds one export of a stored review and records it (format and SHA-256 of the body) in the audit log. */
export async function exportReview(id: string, format: string, actor: Actor): Promise<ReviewExport> {
  if (!(REVIEW_EXPORT_FORMATS as readonly string[]).includes(format)) return { ok: false, status: 404, message: `unknown export '${format}' (use ${REVIEW_EXPORT_FORMATS.join(", ")})` };
  const review = await getReview(id);
  if (!review) return { ok: false, status: 404, message: "no such review" };
  let body: string;
  let contentType = "text/csv; charset=utf-8";
  if (format === "series.csv") {
    const trace = (await getTrace(review.traceId))!;
    body = seriesCsv(trace.series.t_s, [
      { name: "air_C", values: bridgeGaps(trace.series) },
      { name: "core_C", values: review.core_C },
      { name: "surface_C", values: review.surface_C },
      { name: "mean_C", values: review.mean_C },
      { name: "coolant_C", values: review.coolant_C },
    ]);
  } else if (format === "findings.csv") {
    body = findingsCsv(
      {
        id: review.id, title: review.title, traceSha256: review.trace.sha256, resultSha256: review.resultSha256,
        decision: review.decision, signComment: review.signComment, signMeaning: review.signMeaning, signedBy: review.signedBy, signedAt: review.signedAt,
      },
      review.result,
    );
  } else {
    // this review and its inputs checked against the signed chain as exported (before this export's own entry)
    const check = await verifyReviewRecord({ reviewId: review.id, traceId: review.traceId, productId: review.productId, packId: review.packId, limitsId: review.limitsId }, { full: true });
    const record = {
      id: review.id,
      title: review.title,
      created_at: review.createdAt.toISOString(),
      status: review.status,
      sign_off: review.status === "signed" ? { by: review.signedBy, at: review.signedAt?.toISOString(), decision: review.decision, comment: review.signComment, meaning: review.signMeaning } : null,
      record_check: {
        verified: check.ok,
        checked_at: check.checked_at,
        chain_head: check.head ? { seq: check.head.seq, hash: check.head.hash, at: check.head.at } : null,
        key_fingerprint: check.head?.key_fingerprint ?? check.key.chain,
        findings: check.findings.map((f) => ({ kind: f.kind, message: f.message, ...(f.row ? { row: f.row } : {}), ...(f.entry ? { entry: f.entry } : {}) })),
      },
      corrects: review.correctsId,
      trace: { id: review.trace.id, file: review.trace.fileName, sha256: review.trace.sha256, samples: review.trace.sampleCount, import_settings: review.trace.importSettings },
      product: { id: review.product.id, lineage: review.product.lineage, version: review.product.version, sha256: review.product.sha256, definition: review.product.body },
      pack: review.pack ? { id: review.pack.id, lineage: review.pack.lineage, version: review.pack.version, sha256: review.pack.sha256, definition: review.pack.body } : null,
      limits: { id: review.limits.id, lineage: review.limits.lineage, version: review.limits.version, sha256: review.limits.sha256, definition: review.limits.body },
      options: review.options,
      engine_version: review.engineVersion,
      result_sha256: review.resultSha256,
      result: review.result,
    };
    body = JSON.stringify(JSON.parse(canonicalJson(record)), null, 2) + "\n";
    contentType = "application/json; charset=utf-8";
  }
  await logExport(id, format, sha256Hex(body), actor);
  return { ok: true, body, contentType, fileName: `review-${id}-${format}` };
}
