import { guardRoute } from "@/app/guard";
import { ApiProblem, problem } from "@/lib/api/problem";
import { closeMonitor } from "@/lib/services/monitors";
import { api } from "../../../_lib/apiRoute";

export const dynamic = "force-dynamic";

/** POST /api/v1/monitors/{id}/close: the readings become a stored trace and a normal review. */
export const POST = guardRoute("monitor:edit", api<{ id: string }>(async (_req, { params, actor }) => {
  const out = await closeMonitor(params.id, actor);
  if (out.ok) return Response.json({ trace_id: out.traceId, review_id: out.reviewId });
  const kind = out.status === 404 ? "not-found" : out.status === 409 ? "conflict" : "invalid-request";
  throw new ApiProblem(problem(kind, out.message, out.status === 404 ? { field: "id" } : {}));
}));
