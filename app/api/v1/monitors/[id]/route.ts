import { guardRoute } from "@/app/guard";
import { ApiProblem, problem } from "@/lib/api/problem";
import { ensureSweeper, monitorView, stateJson } from "@/lib/services/monitors";
import { api } from "../../_lib/apiRoute";

export const dynamic = "force-dynamic";

/** GET /api/v1/monitors/{id}: the state after the readings so far, the rules' running status, the forecast, staleness. */
export const GET = guardRoute("read", api<{ id: string }>(async (_req, { params }) => {
  const v = await monitorView(params.id);
  if (!v) throw new ApiProblem(problem("not-found", `there is no monitor with id '${params.id}'`, { field: "id" }));
  ensureSweeper();
  return Response.json(stateJson(v));
}));
