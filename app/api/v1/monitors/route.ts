import { createMonitorService, ensureSweeper } from "@/lib/services/monitors";
import { problemResponse } from "./problem";
import { guardRoute } from "@/app/guard";

export const dynamic = "force-dynamic";

/**
 * POST /api/v1/monitors {"name", "product_id", "pack_id"?, "limits_id", "shipment_id"?, "serial"?,
 * "alert": {"lead_min", "webhooks"?, "emails"?}} → 201 {"id", "device_token"} (the token is shown once).
 */
export const POST = guardRoute("monitor:edit", async (req: Request, _ctx: unknown, actor) => {
  if (!/^application\/json\b/i.test(req.headers.get("content-type") ?? "")) return problemResponse("unsupported-media-type", "send the monitor as application/json");
  let body: unknown;
  try {
    body = await req.json();
  } catch {
    return problemResponse("invalid-request", "the body is not valid JSON", { field: "body" });
  }
  const out = await createMonitorService(body, actor);
  if (!out.ok) return problemResponse("invalid-request", out.message, { field: out.field });
  ensureSweeper();
  return Response.json({ id: out.id, device_token: out.device_token }, { status: 201, headers: { Location: `/api/v1/monitors/${out.id}` } });
});
