import { deviceTokenMatches, ensureSweeper, postReadings } from "@/lib/services/monitors";
import { problemResponse } from "../../problem";
import { publicRoute } from "@/app/guard";

export const dynamic = "force-dynamic";

/** Readings per request are capped in lib/live/body.ts; 10 000 JSON readings are well under 2 MB. */
const MAX_BYTES = 2 * 1024 * 1024;

/**
 * POST /api/v1/monitors/{id}/readings with the monitor's device token (Authorization: Bearer …):
 * {"readings": [{"t", "air_C", "probe_C"?}]} or text/csv with the header t,air_C[,probe_C].
 * ?partial=true keeps the good readings of a batch with refused ones; without it nothing is stored.
 */
export const POST = publicRoute("a logger gateway: authenticated by the monitor's own device token, checked first below", async (req: Request, ctx: { params: Promise<{ id: string }> }) => {
  const { id } = await ctx.params;
  if (!(await deviceTokenMatches(id, req.headers.get("authorization")))) {
    return problemResponse("unauthorized", "send this monitor's device token as Authorization: Bearer <token>");
  }
  const partialParam = new URL(req.url).searchParams.get("partial");
  if (partialParam !== null && partialParam !== "true" && partialParam !== "false") return problemResponse("invalid-request", "query parameter 'partial' must be true or false", { field: "partial" });
  const bytes = new Uint8Array(await req.arrayBuffer());
  if (bytes.length > MAX_BYTES) return problemResponse("invalid-request", `the body is ${bytes.length} bytes; at most ${MAX_BYTES} per request`, { field: "body" });
  const out = await postReadings(id, bytes, req.headers.get("content-type") ?? "", partialParam === "true", { kind: "system", what: `device:${id}` });
  ensureSweeper();
  if (out.ok) return Response.json(out.body, { status: out.status });
  if (out.status === 404) return problemResponse("not-found", out.detail, { field: "id" });
  if (out.status === 409) return problemResponse("conflict", out.detail);
  if (out.status === 400 && /^send application/.test(out.detail)) return problemResponse("unsupported-media-type", out.detail);
  if (out.refused) return problemResponse("invalid-readings", out.detail, { refused: out.refused });
  return problemResponse("invalid-request", out.detail, { field: "body" });
});
