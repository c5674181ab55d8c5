import { cancelRun } from "@/lib/services/runs";
import { guardRoute } from "@/app/guard";

export const dynamic = "force-dynamic";

/** Cancels a running run; nothing is stored for it and the audit log records the cancellation. */
export const POST = guardRoute("review:run", async (_req: Request, ctx: { params: Promise<{ id: string }> }, actor) => {
  const { id } = await ctx.params;
  const res = await cancelRun(id, actor);
  if (res.ok) return Response.json(res.run);
  if (res.reason === "not-found") return Response.json({ error: "no such run" }, { status: 404 });
  return Response.json({ error: `the run has already ended (${res.run!.status})`, run: res.run }, { status: 409 });
});
