import { runReviewRequestSchema } from "@/lib/services/reviews";
import { startReviewRun } from "@/lib/services/runs";
import { guardRoute } from "@/app/guard";

export const dynamic = "force-dynamic";

/**
 * Starts a review run in the background: the body is the review request (as the review form sends it,
 * in JSON). 202 with the run's state and where to follow it; 422 naming the field at fault.
 */
export const POST = guardRoute("review:run", async (req: Request, _ctx: unknown, actor) => {
  let body: unknown;
  try {
    body = await req.json();
  } catch {
    return Response.json({ error: "the body is not valid JSON" }, { status: 400 });
  }
  const parsed = runReviewRequestSchema.safeParse(body);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    return Response.json({ error: `${issue.path.join(".") || "body"}: ${issue.message}`, field: issue.path.join(".") }, { status: 422 });
  }
  const started = await startReviewRun(parsed.data, actor);
  if (!started.ok) return Response.json({ error: started.message, field: started.field }, { status: 422 });
  return Response.json({ ...started.run, status_url: `/api/runs/${started.run.id}` }, { status: 202 });
});
