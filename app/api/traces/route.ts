import { importAndStoreTrace } from "@/lib/services/traces";
import { importOptionsSchema } from "@/lib/trace/settings";

export const dynamic = "force-dynamic";

const MAX_BYTES = 200 * 1024 * 1024;

/**
 * Upload of a logger file (multipart: file, name, options as JSON). The browser has already shown a
 * preview with the same import code; the server repeats the import with the chosen options and is
 * the authority. 201 with the trace id, 422 with the message naming the first problem, or 507 when
 * the server's disk is full (nothing stored).
 */
export async function POST(req: Request) {
  let form: FormData;
  try {
    form = await req.formData();
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
  const res = await importAndStoreTrace(bytes, { name: typeof name === "string" ? name : undefined, fileName: file.name, options: options.data });
  if (!res.ok) return Response.json({ error: res.message, ...(res.field ? { field: res.field } : {}) }, { status: res.diskFull ? 507 : 422 });
  return Response.json({ id: res.traceId }, { status: 201 });
}
