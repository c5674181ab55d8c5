import { guardRoute } from "@/app/guard";
import { readBounded } from "@/lib/api/body";
import { ApiProblem, problem } from "@/lib/api/problem";
import { readingsQuerySchema } from "@/lib/api/schemas";
import { deviceBindingRefusal, ensureSweeper, postReadings } from "@/lib/services/monitors";
import { api } from "../../../_lib/apiRoute";
import { queryOf } from "../../../_lib/params";

export const dynamic = "force-dynamic";

/** Readings per request are capped in lib/live/body.ts; 10 000 JSON readings are well under 2 MB. */
const MAX_BYTES = 2 * 1024 * 1024;

/**
 * POST /api/v1/monitors/{id}/readings with an API token (a device token bound to this monitor, or a write
 * token whose owner may post readings): {"readings": [{"t", "air_C", "probe_C"?}]} or text/csv with the header
 * t,air_C[,probe_C]. ?partial=true keeps the good readings of a batch with refused ones; without it nothing is
 * stored. The audit entry of the batch names the token.
 */
export const POST = guardRoute("monitor:post-readings", api<{ id: string }>(async (req, { params, actor }) => {
  const bound = deviceBindingRefusal(actor, params.id);
  if (bound) throw new ApiProblem(problem("forbidden", bound));
  const { partial } = queryOf(req, readingsQuerySchema);
  const type = req.headers.get("content-type") ?? "";
  if (!/^(application\/json|text\/csv)\b/i.test(type)) {
    throw new ApiProblem(problem("unsupported-media-type", `send application/json ({"readings": [...]}) or text/csv (t,air_C[,probe_C]); got ${type ? `'${type}'` : "no content type"}`));
  }
  const bytes = await readBounded(req.body, MAX_BYTES);
  const out = await postReadings(params.id, bytes, type, partial, actor);
  ensureSweeper();
  if (out.ok) return Response.json(out.body, { status: out.status });
  if (out.status === 404) throw new ApiProblem(problem("not-found", `there is no monitor with id '${params.id}'`, { field: "id" }));
  if (out.status === 409) throw new ApiProblem(problem("conflict", out.detail));
  if (out.refused) throw new ApiProblem({ ...problem("invalid-readings", out.detail), refused: out.refused });
  throw new ApiProblem(problem("invalid-request", out.detail, { field: "body" }));
}));
