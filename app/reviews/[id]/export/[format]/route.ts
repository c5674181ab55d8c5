import { getReview } from "@/lib/db/reviews";
import { getTrace } from "@/lib/db/traces";
import { logExport } from "@/lib/db/audit";
import { canonicalJson, findingsCsv, seriesCsv } from "@/lib/review";
import { bridgeGaps } from "@/lib/trace/series";
import { sha256Hex } from "@/lib/trace/hash";

export const dynamic = "force-dynamic";

const FORMATS = ["series.csv", "findings.csv", "review.json"] as const;

/** Downloads of a review: the predicted series, the findings, or the whole record. Each export is audited. */
export async function GET(_req: Request, { params }: { params: Promise<{ id: string; format: string }> }) {
  const { id, format } = await params;
  if (!(FORMATS as readonly string[]).includes(format)) return new Response(`unknown export '${format}' (use ${FORMATS.join(", ")})`, { status: 404 });
  const review = await getReview(id);
  if (!review) return new Response("no such review", { status: 404 });
  let body: string;
  let type: string;
  if (format === "series.csv") {
    const trace = (await getTrace(review.traceId))!;
    body = seriesCsv(trace.series.t_s, [
      { name: "air_C", values: bridgeGaps(trace.series) },
      { name: "core_C", values: review.core_C },
      { name: "surface_C", values: review.surface_C },
      { name: "mean_C", values: review.mean_C },
      { name: "coolant_C", values: review.coolant_C },
    ]);
    type = "text/csv; charset=utf-8";
  } else if (format === "findings.csv") {
    body = findingsCsv(
      { id: review.id, title: review.title, traceSha256: review.trace.sha256, resultSha256: review.resultSha256, decision: review.decision, signedBy: review.signedBy },
      review.result,
    );
    type = "text/csv; charset=utf-8";
  } else {
    const record = {
      id: review.id,
      title: review.title,
      created_at: review.createdAt.toISOString(),
      status: review.status,
      sign_off: review.status === "signed" ? { by: review.signedBy, at: review.signedAt?.toISOString(), decision: review.decision, comment: review.signComment } : null,
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
    type = "application/json; charset=utf-8";
  }
  await logExport(id, format, sha256Hex(body));
  return new Response(body, {
    headers: { "content-type": type, "content-disposition": `attachment; filename="review-${id}-${format}"` },
  });
}
