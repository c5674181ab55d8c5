import { getRun } from "@/lib/services/runs";
import { guardRoute } from "@/app/guard";

export const dynamic = "force-dynamic";

/** A background run's state: status, progress, and the stored review once done. */
export const GET = guardRoute("read", async (_req: Request, ctx: { params: Promise<{ id: string }> }) => {
  const { id } = await ctx.params;
  const run = await getRun(id);
  if (!run) return Response.json({ error: "no such run in this server (runs are forgotten an hour after they end, or when the server restarts)" }, { status: 404 });
  return Response.json(run);
});
