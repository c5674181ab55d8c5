import { z } from "zod";
import { importOptionsSchema, importTraceFile, TraceImportError } from "../trace";
import { createTrace } from "../db/traces";

export const uploadSchema = z.object({
  name: z.string().trim().max(160).optional(),
  fileName: z.string().trim().min(1).max(260),
  options: importOptionsSchema,
});

export type StoreTraceOutcome = { ok: true; traceId: string } | { ok: false; message: string };

/**
 * Imports a logger file and stores it, or refuses it as a whole: a file that cannot be imported
 * writes nothing (no trace, no audit entry), and the message names the first problem.
 */
export async function importAndStoreTrace(bytes: Uint8Array, input: z.input<typeof uploadSchema>, actor = "web"): Promise<StoreTraceOutcome> {
  const req = uploadSchema.parse(input);
  let imported;
  try {
    imported = await importTraceFile(bytes, req.options);
  } catch (e) {
    if (e instanceof TraceImportError) return { ok: false, message: `${req.fileName}: ${e.message}. Nothing was stored.` };
    throw e;
  }
  const traceId = await createTrace({ name: req.name || req.fileName, fileName: req.fileName, bytes, imported, actor });
  return { ok: true, traceId };
}
