import { ensureSweeper, monitorView, stateJson } from "@/lib/services/monitors";
import { problemResponse } from "../problem";
import { guardRoute } from "@/app/guard";

export const dynamic = "force-dynamic";

/** GET /api/v1/monitors/{id}: the state after the readings so far, the rules' running status, the forecast, staleness. */
export const GET = guardRoute("read", async (_req: Request, ctx: { params: Promise<{ id: string }> }) => {
  const { id } = await ctx.params;
  const v = await monitorView(id);
  if (!v) return problemResponse("not-found", `no monitor ${id}`, { field: "id" });
  ensureSweeper();
  return Response.json(stateJson(v));
});
