// Batch upload of logger files onto a shipment (issue 15): many files, or one .zip (unzipped with fflate,
// within size limits), previewed together, matched to the shipment's logger entries (serial in the
// metadata lines, else a file-name pattern), then stored as the user confirmed. A refused file is listed
// with its row and column and stores nothing; it does not stop the others.
import { unzipSync } from "fflate";
import { z } from "zod";
import { importOptionsSchema, importTraceFile, TraceImportError, type ImportOptions, type TraceImport } from "../trace";
import { matchFiles, serialFromMetadata, type FileMatch } from "../shipment/matching";
import { createTrace } from "../db/traces";
import { attachTraces, createLogger, getShipment, loggersBySerial } from "../db/shipments";
import { isDiskFull } from "../db/errors";
import type { Actor } from "../access/actor";

/** At most this many files in one batch (a truck, a container: not a warehouse). */
export const MAX_BATCH_FILES = 200;
/** Unzipped size limits: one file, and the whole archive (a zip bomb is refused before it is inflated). */
export const MAX_ZIP_ENTRY_BYTES = 50 * 1024 * 1024;
export const MAX_ZIP_TOTAL_BYTES = 200 * 1024 * 1024;

export interface UploadedFile {
  name: string;
  bytes: Uint8Array;
}

export class BatchError extends Error {}

/**
 * The files of a batch: the files themselves, or the entries of one .zip (folders, hidden and __MACOSX
 * entries skipped). The archive's declared sizes are checked before anything is inflated, and the
 * inflated sizes again after.
 */
export function expandUploads(files: readonly UploadedFile[]): UploadedFile[] {
  const zips = files.filter((f) => /\.zip$/i.test(f.name));
  if (zips.length === 0) {
    if (files.length > MAX_BATCH_FILES) throw new BatchError(`${files.length} files: at most ${MAX_BATCH_FILES} files in one batch`);
    return [...files];
  }
  if (files.length > 1) throw new BatchError(`drop either one .zip or logger files, not both (${zips.map((z) => z.name).join(", ")} with ${files.length - zips.length} other file(s))`);
  const zip = zips[0]!;
  let declared = 0;
  let count = 0;
  let out: Record<string, Uint8Array>;
  try {
    out = unzipSync(zip.bytes, {
      filter: (f) => {
        if (f.name.endsWith("/") || /(^|\/)(__MACOSX|\.)/.test(f.name)) return false;
        count++;
        if (count > MAX_BATCH_FILES) throw new BatchError(`${zip.name}: more than ${MAX_BATCH_FILES} files in the archive`);
        if (f.originalSize > MAX_ZIP_ENTRY_BYTES) throw new BatchError(`${zip.name}: ${f.name} unpacks to ${(f.originalSize / 1048576).toFixed(0)} MB; at most ${MAX_ZIP_ENTRY_BYTES / 1048576} MB per file`);
        declared += f.originalSize;
        if (declared > MAX_ZIP_TOTAL_BYTES) throw new BatchError(`${zip.name}: the archive unpacks to more than ${MAX_ZIP_TOTAL_BYTES / 1048576} MB`);
        return true;
      },
    });
  } catch (e) {
    if (e instanceof BatchError) throw e;
    throw new BatchError(`${zip.name}: not a readable .zip archive (${(e as Error).message})`);
  }
  const entries = Object.entries(out).map(([name, bytes]) => ({ name: name.split("/").pop()!, path: name, bytes }));
  const total = entries.reduce((s, e) => s + e.bytes.length, 0);
  if (total > MAX_ZIP_TOTAL_BYTES || entries.some((e) => e.bytes.length > MAX_ZIP_ENTRY_BYTES)) throw new BatchError(`${zip.name}: the archive unpacks to more than its sizes declare`);
  if (entries.length === 0) throw new BatchError(`${zip.name}: the archive holds no files`);
  const seen = new Set<string>();
  for (const e of entries) {
    if (seen.has(e.name)) throw new BatchError(`${zip.name}: two files are named ${e.name} (in different folders); rename one`);
    seen.add(e.name);
  }
  return entries.map(({ name, bytes }) => ({ name, bytes }));
}

export const batchOptionsSchema = z.object({
  /** settings for every file */
  all: importOptionsSchema.default({}),
  /** settings for one file, by name, on top of `all` */
  perFile: z.record(z.string(), importOptionsSchema).default({}),
});
export type BatchOptions = z.input<typeof batchOptionsSchema>;

export interface PreviewRow {
  file: string;
  bytes: number;
  ok: boolean;
  /** refused: the importer's message, with the row and column at fault */
  refusal?: { message: string; row: number | null; column: string | null };
  settings?: TraceImport["settings"];
  channels?: TraceImport["channels"];
  samples?: number;
  start?: string;
  end?: string;
  warnings?: string[];
  serial: string | null;
  /** the proposed logger entry (by serial, else by file name), or none */
  match: FileMatch;
  /** the serial is not in the logger register yet: its accuracy must be asked once */
  unregistered: boolean;
}

const iso = (t: number) => new Date(Math.round(t * 1000)).toISOString();

type ImportAttempt = { ok: true; imported: TraceImport } | { ok: false; message: string; row: number | null; column: string | null };

async function importOne(f: UploadedFile, options: ImportOptions): Promise<ImportAttempt> {
  try {
    return { ok: true, imported: await importTraceFile(f.bytes, options) };
  } catch (e) {
    if (e instanceof TraceImportError) return { ok: false, message: `${f.name}: ${e.message}`, row: e.row ?? null, column: e.column ?? null };
    throw e;
  }
}

function optionsFor(o: z.infer<typeof batchOptionsSchema>, file: string): ImportOptions {
  return { ...o.all, ...(o.perFile[file] ?? {}) };
}

/** Imports every file (nothing stored) and proposes the matching to the shipment's logger entries. */
export async function previewBatch(shipmentId: string, files: readonly UploadedFile[], options: BatchOptions = {}): Promise<{ rows: PreviewRow[] } | { error: string }> {
  const shipment = await getShipment(shipmentId);
  if (!shipment) return { error: "that shipment does not exist" };
  const o = batchOptionsSchema.parse(options);
  let expanded: UploadedFile[];
  try {
    expanded = expandUploads(files);
  } catch (e) {
    if (e instanceof BatchError) return { error: e.message };
    throw e;
  }
  const results: ImportAttempt[] = [];
  for (const f of expanded) results.push(await importOne(f, optionsFor(o, f.name)));
  const serials = results.map((r) => (r.ok ? serialFromMetadata(r.imported.preview.metadata) : null));
  const matches = matchFiles(expanded.map((f, i) => ({ name: f.name, serial: serials[i]! })), shipment.loggers.map((l) => ({ id: l.id, serial: l.serial, pattern: l.fileNamePattern })));
  const known = new Set((await loggersBySerial(serials.filter((s): s is string => !!s))).map((l) => l.serial));
  const rows = expanded.map((f, i): PreviewRow => {
    const r = results[i]!;
    const base = { file: f.name, bytes: f.bytes.length, serial: serials[i]!, match: matches[i]!, unregistered: !!serials[i] && !known.has(serials[i]!) };
    if (!r.ok) return { ...base, ok: false, refusal: { message: r.message, row: r.row, column: r.column } };
    const s = r.imported.series;
    return { ...base, ok: true, settings: r.imported.settings, channels: r.imported.channels, samples: s.t_s.length, start: iso(s.t_s[0]!), end: iso(s.t_s[s.t_s.length - 1]!), warnings: r.imported.warnings };
  });
  return { rows };
}

export const storeBatchSchema = z.object({
  options: batchOptionsSchema.default({ all: {}, perFile: {} }),
  /** the matching as the user confirmed it: file name → logger entry id (or null: not stored) */
  matches: z.array(z.object({ file: z.string().min(1), shipmentLoggerId: z.string().min(1).nullable() })).max(MAX_BATCH_FILES),
  /** serials found in the files and not yet registered: the accuracy asked once */
  register: z.array(z.object({
    serial: z.string().trim().min(1).max(120),
    description: z.string().trim().max(200).default(""),
    accuracyK: z.number({ error: "give the logger's stated accuracy in K" }).finite().min(0.01, { message: "accuracy must be between 0.01 and 10 K" }).max(10, { message: "accuracy must be between 0.01 and 10 K" }),
  })).max(MAX_BATCH_FILES).default([]),
});
export type StoreBatchRequest = z.input<typeof storeBatchSchema>;

export interface StoreBatchResult {
  stored: Array<{ file: string; traceId: string; shipmentLoggerId: string }>;
  refused: Array<{ file: string; message: string; row: number | null; column: string | null }>;
  skipped: Array<{ file: string; reason: string }>;
  registered: string[];
}

/**
 * Stores the confirmed batch: each matched good file as a trace (its own transaction with its audit
 * entry), every new serial in the register, then the matching, in one transaction. A refused file stores
 * nothing and is listed; the others go on.
 */
export async function storeBatch(shipmentId: string, files: readonly UploadedFile[], request: StoreBatchRequest, actor: Actor): Promise<{ ok: true; result: StoreBatchResult } | { ok: false; message: string }> {
  const parsed = storeBatchSchema.safeParse(request);
  if (!parsed.success) {
    const i = parsed.error.issues[0]!;
    return { ok: false, message: `${i.path.join(".")}: ${i.message}` };
  }
  const req = parsed.data;
  const shipment = await getShipment(shipmentId);
  if (!shipment) return { ok: false, message: "that shipment does not exist" };
  if (shipment.status === "signed") return { ok: false, message: "this shipment is signed off; its loggers cannot change" };
  let expanded: UploadedFile[];
  try {
    expanded = expandUploads(files);
  } catch (e) {
    if (e instanceof BatchError) return { ok: false, message: e.message };
    throw e;
  }
  const entryIds = new Set(shipment.loggers.map((l) => l.id));
  const target = new Map(req.matches.map((m) => [m.file, m.shipmentLoggerId]));
  const used = new Set<string>();
  for (const m of req.matches) {
    if (m.shipmentLoggerId === null) continue;
    if (!entryIds.has(m.shipmentLoggerId)) return { ok: false, message: `${m.file}: logger entry ${m.shipmentLoggerId} is not part of this shipment` };
    if (used.has(m.shipmentLoggerId)) return { ok: false, message: `${m.file}: two files are matched to the same logger entry; match each entry once` };
    used.add(m.shipmentLoggerId);
  }
  const result: StoreBatchResult = { stored: [], refused: [], skipped: [], registered: [] };
  const toRegister = new Map(req.register.map((r) => [r.serial, r]));
  const known = new Set((await loggersBySerial([...toRegister.keys()])).map((l) => l.serial));
  for (const f of expanded) {
    const entry = target.get(f.name);
    if (!entry) {
      result.skipped.push({ file: f.name, reason: "not matched to a logger entry: not stored" });
      continue;
    }
    const r = await importOne(f, optionsFor(req.options, f.name));
    if (!r.ok) {
      result.refused.push({ file: f.name, message: r.message, row: r.row, column: r.column });
      continue;
    }
    const serial = serialFromMetadata(r.imported.preview.metadata);
    if (serial && !known.has(serial)) {
      const reg = toRegister.get(serial);
      const already = (await loggersBySerial([serial])).length > 0;
      if (!already && !reg) {
        result.refused.push({ file: f.name, message: `${f.name}: logger ${serial} is not in the logger register: give its stated accuracy to register it`, row: null, column: null });
        continue;
      }
      if (!already && reg) {
        await createLogger({ serial, description: reg.description || `registered from ${f.name}`, accuracyK: reg.accuracyK }, actor);
        result.registered.push(serial);
      }
      known.add(serial);
    }
    try {
      const traceId = await createTrace({ name: f.name, fileName: f.name, bytes: f.bytes, imported: r.imported, actor });
      result.stored.push({ file: f.name, traceId, shipmentLoggerId: entry });
    } catch (e) {
      if (isDiskFull(e)) {
        result.refused.push({ file: f.name, message: `${f.name}: the server's disk is full; nothing was stored for this file`, row: null, column: null });
        continue;
      }
      throw e;
    }
  }
  if (result.stored.length > 0) await attachTraces(shipmentId, result.stored.map((s) => ({ shipmentLoggerId: s.shipmentLoggerId, traceId: s.traceId })), actor);
  return { ok: true, result };
}
