// Request bodies read as they stream in and abandoned as soon as they pass the limit: a body sent without
// a Content-Length (chunked) must not be read whole before it is refused. Web-standard streams only.
import { ApiProblem, problem } from "./problem";

const MB = 1024 * 1024;
/** A definition, a review request or a sign-off is a few kB; 1 MB leaves room for a long limit set or profile. */
export const JSON_BODY_LIMIT_BYTES = 1 * MB;
/** An uploaded logger file: the same 200 MB as the upload form, plus room for a multipart envelope. */
export const TRACE_FILE_LIMIT_BYTES = 200 * MB;
export const TRACE_BODY_LIMIT_BYTES = 201 * MB;

const tooLarge = (limit: number) =>
  new ApiProblem(problem("too-large", `the body is over ${limit / MB} MB; at most ${limit / MB} MB can be sent here. Nothing was stored.`));

/** The whole body, or null as soon as more than `limit` bytes arrived (the rest is not read). */
export async function boundedBody(body: ReadableStream<Uint8Array> | null, limit: number): Promise<Uint8Array<ArrayBuffer> | null> {
  if (!body) return new Uint8Array(new ArrayBuffer(0));
  const reader = body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limit) {
      await reader.cancel();
      return null;
    }
    chunks.push(value);
  }
  const out = new Uint8Array(new ArrayBuffer(total));
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

/** The whole body, or an ApiProblem 413 once more than `limit` bytes arrived. */
export async function readBounded(body: ReadableStream<Uint8Array> | null, limit: number): Promise<Uint8Array<ArrayBuffer>> {
  const out = await boundedBody(body, limit);
  if (!out) throw tooLarge(limit);
  return out;
}

/** A JSON body: 415 for another content type, 413 over the limit, 422 when it is not JSON. */
export async function readJsonBody(req: Request, limit = JSON_BODY_LIMIT_BYTES): Promise<unknown> {
  const type = (req.headers.get("content-type") ?? "").split(";")[0]!.trim().toLowerCase();
  if (type !== "application/json" && !type.endsWith("+json")) {
    throw new ApiProblem(problem("unsupported-media-type", `send the body as application/json (got ${type ? `'${type}'` : "no content type"})`));
  }
  const bytes = await readBounded(req.body, limit);
  try {
    return JSON.parse(new TextDecoder("utf-8", { fatal: true }).decode(bytes));
  } catch (e) {
    throw new ApiProblem(problem("invalid-request", `the body is not valid JSON (${(e as Error).message})`, { field: "body" }));
  }
}
