import { getTraceOriginal } from "@/lib/db/traces";
import { logOriginalDownload } from "@/lib/db/audit";
import { sha256Hex } from "@/lib/trace/hash";
import { guardRoute } from "@/app/guard";

export const dynamic = "force-dynamic";

/** A file name safe inside a Content-Disposition header, with the UTF-8 form beside it (RFC 6266). */
function disposition(fileName: string): string {
  const ascii = fileName.replace(/[^\x20-\x7e]|["\\]/g, "_");
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(fileName)}`;
}

/**
 * The original logger file exactly as uploaded. The SHA-256 of the bytes served is sent in a header and
 * recorded in the audit log; when it differs from the recorded one the file is still served (it is the
 * evidence) and the header says so.
 */
export const GET = guardRoute("read", async (_req: Request, { params }: { params: Promise<{ id: string }> }, actor) => {
  const { id } = await params;
  const original = await getTraceOriginal(id);
  if (!original) return new Response("no such trace", { status: 404 });
  const sha256 = sha256Hex(original.bytes);
  await logOriginalDownload(id, sha256, actor);
  return new Response(Buffer.from(original.bytes), {
    headers: {
      "content-type": "application/octet-stream",
      "content-disposition": disposition(original.fileName),
      "content-length": String(original.bytes.byteLength),
      "x-corelag-sha256": sha256,
      "x-corelag-recorded-sha256": original.sha256,
      ...(sha256 !== original.sha256 ? { "x-corelag-warning": "the stored bytes no longer match their recorded SHA-256" } : {}),
    },
  });
});
