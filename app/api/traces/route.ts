import { importAndStoreTrace } from "@/lib/services/traces";
import { importOptionsSchema } from "@/lib/trace/settings";
import { guardRoute } from "@/app/guard";
import { boundedBody } from "@/lib/api/body";

export const dynamic = "force-dynamic";

const MAX_BYTES = 200 * 1024 * 1024;
/** The whole request: the file plus room for the form's other fields (keep equal to proxy.ts UPLOAD_BODY_LIMIT_BYTES). */
const MAX_BODY_BYTES = 201 * 1024 * 1024;

/**
 * Upload of a logger file (multipart: file, name, options as JSON). The browser has already shown a
 * preview with the same import code; the server repeats the import with the chosen options and is
 * the authority. 201 with the trace id, 422 with the message naming the first problem, or 507 when
 * the server's disk is full (nothing stored).
 */
export const POST = guardRoute("trace:import", async (req: Request, _ctx: unknown, actor) => {
  const body = await boundedBody(req.body, MAX_BODY_BYTES);
  if (!body) return Response.json({ error: `the upload is over ${MAX_BODY_BYTES / 1048576} MB; at most ${MAX_BODY_BYTES / 1048576} MB can be sent. Nothing was stored.` }, { status: 413 });
  let form: FormData;
  try {
    form = await new Response(body, { headers: { "content-type": req.headers.get("content-type") ?? "" } }).formData();
  } catch {
    return Response.json({ error: "the upload could not be read as a form" }, { status: 400 });
  }
  const file = form.get("file");
  if (!(file instanceof File)) return Response.json({ error: "choose a logger file", field: "file" }, { status: 422 });
  if (file.size === 0) return Response.json({ error: `${file.name}: the file is empty. Nothing was stored.`, field: "file" }, { status: 422 });
  if (file.size > MAX_BYTES) return Response.json({ error: `${file.name}: files over 200 MB are not accepted`, field: "file" }, { status: 422 });
  let rawOptions: unknown = {};
  try {
    rawOptions = JSON.parse(String(form.get("options") ?? "{}"));
  } catch {
    return Response.json({ error: "the import settings could not be read", field: "options" }, { status: 422 });
  }
  const options = importOptionsSchema.safeParse(rawOptions);
  if (!options.success) {
    const issue = options.error.issues[0]!;
    return Response.json({ error: `import setting '${issue.path.join(".")}': ${issue.message}`, field: "options" }, { status: 422 });
  }
  const name = form.get("name");
  const bytes = new Uint8Array(await file.arrayBuffer());
  const res = await importAndStoreTrace(bytes, { name: typeof name === "string" ? name : undefined, fileName: file.name, options: options.data }, actor);
  if (!res.ok) return Response.json({ error: res.message, ...(res.field ? { field: res.field } : {}) }, { status: res.diskFull ? 507 : res.busy ? 503 : 422, ...(res.busy ? { headers: { "retry-after": "2" } } : {}) });
  return Response.json({ id: res.traceId }, { status: 201 });
});
