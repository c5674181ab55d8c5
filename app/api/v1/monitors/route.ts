import { guardRoute } from "@/app/guard";
import { readJsonBody } from "@/lib/api/body";
import { ApiProblem, problem } from "@/lib/api/problem";
import { monitorCreateRequestSchema } from "@/lib/api/schemas";
import { createMonitorService, ensureSweeper } from "@/lib/services/monitors";
import { api } from "../_lib/apiRoute";
import { bodyOf } from "../_lib/params";

export const dynamic = "force-dynamic";

/**
 * POST /api/v1/monitors {"name", "product_id", "pack_id"?, "limits_id", "shipment_id"?, "serial"?,
 * "alert": {"lead_min", "webhooks"?, "emails"?}} → 201 {"id", "device_token"}: the token has the `device`
 * scope, is bound to this monitor and belongs to the caller (a token's owner); it is shown once.
 */
export const POST = guardRoute("monitor:edit", api(async (req, { actor }) => {
  const body = bodyOf(await readJsonBody(req), monitorCreateRequestSchema);
  const out = await createMonitorService(body, actor);
  if (!out.ok) throw new ApiProblem(problem("invalid-request", out.message, { field: out.field }));
  ensureSweeper();
  return Response.json({ id: out.id, device_token: out.device_token }, { status: 201, headers: { location: `/api/v1/monitors/${out.id}` } });
}));
