import { guardRoute } from "@/app/guard";
import { readBounded, TRACE_BODY_LIMIT_BYTES, TRACE_FILE_LIMIT_BYTES } from "@/lib/api/body";
import { ApiProblem, problem } from "@/lib/api/problem";
import { importOptionsFromQuery } from "@/lib/api/traceQuery";
import { importTraceFromApi } from "@/lib/services/api";
import { api } from "../_lib/apiRoute";
import { answered } from "../_lib/params";

export const dynamic = "force-dynamic";

/**
 * A logger file as the raw body, or as the multipart field `file`; the import options are query
 * parameters (checked before the body is read). The body is read as it streams and refused past the
 * limit (413); a refused file stores nothing (422 naming row and column).
 */
export const POST = guardRoute("trace:import", api(async (req, { actor }) => {
  const q = importOptionsFromQuery(new URL(req.url).searchParams);
  if (!q.ok) throw new ApiProblem(q.problem);
  const type = (req.headers.get("content-type") ?? "").toLowerCase();
  const body = await readBounded(req.body, TRACE_BODY_LIMIT_BYTES);
  let bytes: Uint8Array = body;
  let fileName = q.fileName ?? "upload.csv";
  if (type.startsWith("multipart/form-data")) {
    let form: FormData;
    try {
      form = await new Response(body, { headers: { "content-type": req.headers.get("content-type")! } }).formData();
    } catch {
      throw new ApiProblem(problem("invalid-request", "the multipart body could not be read", { field: "file" }));
    }
    const file = form.get("file");
    if (!(file instanceof File)) throw new ApiProblem(problem("invalid-request", "the multipart body has no file field named 'file'", { field: "file" }));
    bytes = new Uint8Array(await file.arrayBuffer());
    fileName = q.fileName ?? (file.name || fileName);
  }
  if (bytes.byteLength > TRACE_FILE_LIMIT_BYTES) throw new ApiProblem(problem("too-large", `the file is over ${TRACE_FILE_LIMIT_BYTES / 1048576} MB. Nothing was stored.`, { field: "file" }));
  if (bytes.byteLength === 0) throw new ApiProblem(problem("invalid-request", "the file is empty. Nothing was stored.", { field: "file" }));
  const created = answered(await importTraceFromApi(bytes, { fileName, name: q.name, options: q.options }, actor));
  return Response.json(created, { status: 201, headers: { location: `/api/v1/traces/${created.id}` } });
}));
