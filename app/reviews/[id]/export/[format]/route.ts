import { exportReview } from "@/lib/services/exports";
import { guardRoute } from "@/app/guard";

export const dynamic = "force-dynamic";

/** Downloads of a review: the predicted series, the findings, or the whole record. Each export is audited. */
export const GET = guardRoute("read", async (_req: Request, { params }: { params: Promise<{ id: string; format: string }> }, actor) => {
  const { id, format } = await params;
  const out = await exportReview(id, format, actor);
  if (!out.ok) return new Response(out.message, { status: out.status });
  return new Response(out.body, { headers: { "content-type": out.contentType, "content-disposition": `attachment; filename="${out.fileName}"` } });
});
