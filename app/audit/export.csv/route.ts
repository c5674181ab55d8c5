import { auditBatches } from "@/lib/db/auditQueries";
import { auditCsvHeader, auditCsvRow } from "@/lib/review/auditCsv";
import { auditFilter, parseAuditParams, unknownFilterMessage } from "../filters";
import { displayZone } from "@/app/displayZone";
import { guardRoute } from "@/app/guard";

export const dynamic = "force-dynamic";

/**
 * The audit log (or the entries matching the page's filters) as CSV, streamed in batches so that a
 * long log is never held in memory at once.
 */
export const GET = guardRoute("read", async (req: Request) => {
  const url = new URL(req.url);
  const p = parseAuditParams(Object.fromEntries(url.searchParams));
  // an unknown kind or action is refused, not read as "every entry"
  if (p.unknown.length > 0) return new Response(unknownFilterMessage(p.unknown), { status: 400, headers: { "content-type": "text/plain; charset=utf-8" } });
  // Links in the file use the host the browser asked for (Next's req.url names its own bind address).
  const host = req.headers.get("x-forwarded-host") ?? req.headers.get("host");
  const proto = req.headers.get("x-forwarded-proto") ?? url.protocol.replace(":", "");
  const origin = host ? `${proto}://${host}` : url.origin;
  const enc = new TextEncoder();
  const batches = auditBatches(auditFilter(p, await displayZone()));
  const stream = new ReadableStream<Uint8Array>({
    start(c) {
      c.enqueue(enc.encode(auditCsvHeader() + "\r\n"));
    },
    async pull(c) {
      const next = await batches.next();
      if (next.done) return c.close();
      c.enqueue(enc.encode(next.value.map((e) => auditCsvRow(e, origin) + "\r\n").join("")));
    },
  });
  const stamp = new Date().toISOString().slice(0, 19).replace(/[-:]/g, "").replace("T", "-");
  return new Response(stream, { headers: { "content-type": "text/csv; charset=utf-8", "content-disposition": `attachment; filename="corelag-audit-${stamp}.csv"` } });
});
