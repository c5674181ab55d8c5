import { z } from "zod";
import { importOptionsSchema, importTraceFile, TraceImportError } from "../trace";
import { createTrace } from "../db/traces";
import { isDiskFull } from "../db/errors";
import { StorageBusyError } from "../db/busy";
import type { Actor } from "../access/actor";

export const uploadSchema = z.object({
  name: z.string().trim().max(160, { message: "the name is longer than 160 characters" }).optional(),
  fileName: z
    .string({ error: "the file has no name" })
    .trim()
    .min(1, { message: "the file name is empty or only spaces; rename the file" })
    .max(260, { message: "the file name is longer than 260 characters; rename the file" }),
  options: importOptionsSchema,
});

export type StoreTraceOutcome =
  | { ok: true; traceId: string }
  /** diskFull: the import was fine but the server could not store it (HTTP 507); busy: the database stayed busy (HTTP 503, try again); field: the part of the request at fault */
  | { ok: false; message: string; diskFull?: true; busy?: true; field?: "fileName" | "name" | "options"; row?: number; column?: string };

/**
 * Imports a logger file and stores it, or refuses it as a whole: a file that cannot be imported
 * writes nothing (no trace, no audit entry), and the message names the first problem. A full disk
 * is reported as such; the failed write leaves nothing behind and the storage usable.
 */
export async function importAndStoreTrace(bytes: Uint8Array, input: z.input<typeof uploadSchema>, actor: Actor): Promise<StoreTraceOutcome> {
  const parsed = uploadSchema.safeParse(input);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    const field = String(issue.path[0]) as "fileName" | "name" | "options";
    const what = field === "options" ? `import setting '${issue.path.slice(1).join(".")}': ` : "";
    return { ok: false, message: `${what}${issue.message}. Nothing was stored.`, field };
  }
  const req = parsed.data;
  let imported;
  try {
    imported = await importTraceFile(bytes, req.options);
  } catch (e) {
    if (e instanceof TraceImportError) {
      return { ok: false, message: `${req.fileName}: ${e.message}. Nothing was stored.`, ...(e.row !== undefined ? { row: e.row } : {}), ...(e.column !== undefined ? { column: e.column } : {}) };
    }
    throw e;
  }
  try {
    const traceId = await createTrace({ name: req.name || req.fileName, fileName: req.fileName, bytes, imported, actor });
    return { ok: true, traceId };
  } catch (e) {
    if (isDiskFull(e)) {
      return { ok: false, diskFull: true, message: `${req.fileName}: the server's disk is full, so the trace could not be stored. Nothing was stored; free some space (or ask the administrator to) and upload it again.` };
    }
    if (e instanceof StorageBusyError) return { ok: false, busy: true, message: `${req.fileName}: ${e.message}` };
    throw e;
  }
}
