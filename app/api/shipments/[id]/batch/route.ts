import { z } from "zod";
import { boundedBody } from "@/lib/api/body";
import { batchOptionsSchema, previewBatch, storeBatch, storeBatchSchema, type UploadedFile } from "@/lib/services/batch";
import { guardRoute } from "@/app/guard";

export const dynamic = "force-dynamic";

/** The whole batch (files or one .zip, plus the settings); keep equal to proxy.ts UPLOAD_BODY_LIMIT_BYTES. */
const MAX_BODY_BYTES = 201 * 1024 * 1024;

const modeSchema = z.enum(["preview", "store"], { error: "mode must be preview or store" });

/**
 * Batch upload onto a shipment (multipart: `files` (many, or one .zip) and `request` as JSON).
 * ?mode=preview imports every file and proposes the matching, storing nothing (200 with the rows);
 * ?mode=store stores the confirmed matching (200 with stored, refused and skipped files; 422 on a bad request).
 */
export const POST = guardRoute("trace:import", async (req: Request, ctx: { params: Promise<{ id: string }> }, actor) => {
  const { id } = await ctx.params;
  const mode = modeSchema.safeParse(new URL(req.url).searchParams.get("mode"));
  if (!mode.success) return Response.json({ error: mode.error.issues[0]!.message }, { status: 400 });
  const body = await boundedBody(req.body, MAX_BODY_BYTES);
  if (!body) return Response.json({ error: `the batch is over ${MAX_BODY_BYTES / 1048576} MB; send fewer files at once. Nothing was stored.` }, { status: 413 });
  let form: FormData;
  try {
    form = await new Response(body, { headers: { "content-type": req.headers.get("content-type") ?? "" } }).formData();
  } catch {
    return Response.json({ error: "the request is not a multipart form with files" }, { status: 400 });
  }
  const files: UploadedFile[] = [];
  for (const f of form.getAll("files")) {
    if (typeof f === "string") return Response.json({ error: "files: each part must be a file" }, { status: 400 });
    files.push({ name: f.name, bytes: new Uint8Array(await f.arrayBuffer()) });
  }
  if (files.length === 0) return Response.json({ error: "files: drop at least one logger file or a .zip" }, { status: 400 });
  let request: unknown;
  try {
    request = JSON.parse(String(form.get("request") ?? "{}"));
  } catch (e) {
    return Response.json({ error: `request: not valid JSON (${(e as Error).message})` }, { status: 400 });
  }
  if (mode.data === "preview") {
    const options = batchOptionsSchema.safeParse((request as { options?: unknown }).options ?? {});
    if (!options.success) return Response.json({ error: `import setting '${options.error.issues[0]!.path.join(".")}': ${options.error.issues[0]!.message}` }, { status: 422 });
    const r = await previewBatch(id, files, options.data);
    if ("error" in r) return Response.json({ error: r.error }, { status: 422 });
    return Response.json(r);
  }
  const parsed = storeBatchSchema.safeParse(request);
  if (!parsed.success) return Response.json({ error: `${parsed.error.issues[0]!.path.join(".")}: ${parsed.error.issues[0]!.message}` }, { status: 422 });
  const r = await storeBatch(id, files, parsed.data, actor);
  if (!r.ok) return Response.json({ error: r.message }, { status: 422 });
  return Response.json(r.result);
});
