import { guardRoute } from "@/app/guard";
import { readJsonBody } from "@/lib/api/body";
import { reviewListQuerySchema, reviewRequestSchema } from "@/lib/api/schemas";
import { listReviewsForApi, runReviewFromApi } from "@/lib/services/api";
import { api } from "../_lib/apiRoute";
import { answered, bodyOf, queryOf } from "../_lib/params";

export const dynamic = "force-dynamic";

/**
 * Runs a review in the engine's worker pool: 201 with the stored review, or 202 with the run when it
 * takes longer than a few seconds, or at once with `Prefer: respond-async` (RFC 7240).
 */
export const POST = guardRoute("review:run", api(async (req, { actor }) => {
  const body = bodyOf(await readJsonBody(req), reviewRequestSchema);
  const async = /(^|[,\s])respond-async\b/i.test(req.headers.get("prefer") ?? "");
  const started = answered(await runReviewFromApi(body, actor, async ? 0 : undefined));
  if (started.kind === "stored") return Response.json(started.review, { status: 201, headers: { location: `/api/v1/reviews/${started.review.id}` } });
  const href = `/api/v1/runs/${started.run.run_id}`;
  return Response.json({ run_id: started.run.run_id, status: started.run.status, progress: started.run.progress, href }, { status: 202, headers: { location: href, ...(async ? { "preference-applied": "respond-async" } : {}) } });
}));

/** Stored reviews, newest first, one page at a time. */
export const GET = guardRoute("read", api(async (req) => Response.json(answered(await listReviewsForApi(queryOf(req, reviewListQuerySchema))))));
