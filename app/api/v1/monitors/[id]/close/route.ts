import { closeMonitor } from "@/lib/services/monitors";
import { problemResponse } from "../../problem";
import { guardRoute } from "@/app/guard";

export const dynamic = "force-dynamic";

/** POST /api/v1/monitors/{id}/close: the readings become a stored trace and a normal review. */
export const POST = guardRoute("monitor:edit", async (_req: Request, ctx: { params: Promise<{ id: string }> }, actor) => {
  const { id } = await ctx.params;
  const out = await closeMonitor(id, actor);
  if (out.ok) return Response.json({ trace_id: out.traceId, review_id: out.reviewId });
  return problemResponse(out.status === 404 ? "not-found" : out.status === 409 ? "conflict" : "invalid-request", out.message);
});
