import { guardRoute } from "@/app/guard";
import { traceOriginalForApi } from "@/lib/services/api";
import { api } from "../../../_lib/apiRoute";
import { answered } from "../../../_lib/params";

export const dynamic = "force-dynamic";

/** A file name safe inside a Content-Disposition header, with the UTF-8 form beside it (RFC 6266). */
function disposition(fileName: string): string {
  const ascii = fileName.replace(/[^\x20-\x7e]|["\\]/g, "_");
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(fileName)}`;
}

/** The stored bytes exactly; the SHA-256 of what is served is in a header and in the audit entry. */
export const GET = guardRoute("read", api<{ id: string }>(async (_req, { params, actor }) => {
  const o = answered(await traceOriginalForApi(params.id, actor));
  return new Response(Buffer.from(o.bytes), {
    headers: {
      "content-type": "application/octet-stream",
      "content-disposition": disposition(o.fileName),
      "content-length": String(o.bytes.byteLength),
      "x-corelag-sha256": o.sha256,
      "x-corelag-recorded-sha256": o.recordedSha256,
    },
  });
}));
