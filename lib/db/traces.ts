import { db } from "./client";
import { appendAudit } from "./audit";
import { bytesToFloat64, float64ToBytes } from "./bytes";
import { resolvePage, searchText, type PageRequest, type Paged } from "./page";
import { idsContaining } from "./textSearch";
import { traceContentHash } from "../review/content";
import { sha256Hex, type TraceImport, type TraceSeries, type ResolvedImportSettings } from "../trace";
import type { Actor } from "../access/actor";

export interface StoredTraceMeta {
  id: string;
  name: string;
  fileName: string;
  sha256: string;
  sampleCount: number;
  startAt: Date;
  endAt: Date;
  warnings: string[];
  importSettings: ResolvedImportSettings;
  createdAt: Date;
  hasProbe: boolean;
}

/** Stores the original bytes, their hash, the resolved import settings and the parsed series, in one write. */
export async function createTrace(args: { name: string; fileName: string; bytes: Uint8Array; imported: TraceImport; actor: Actor }): Promise<string> {
  const { series, settings, warnings } = args.imported;
  const n = series.t_s.length;
  const sha256 = sha256Hex(args.bytes);
  return db.$transaction(async (tx) => {
    const row = await tx.trace.create({
      data: {
        name: args.name,
        fileName: args.fileName,
        sha256,
        original: new Uint8Array(args.bytes),
        importSettings: settings as unknown as object,
        timesS: float64ToBytes(series.t_s),
        airC: float64ToBytes(series.air_C),
        probeC: series.probe_C ? float64ToBytes(series.probe_C) : null,
        sampleCount: n,
        startAt: new Date(series.t_s[0]! * 1000),
        endAt: new Date(series.t_s[n - 1]! * 1000),
        warnings,
      },
    });
    await appendAudit(tx, {
      action: "import",
      entity: "trace",
      entityId: row.id,
      actor: args.actor,
      details: { fileName: args.fileName, sha256, samples: n, settings: settings as unknown as object, warnings: warnings.length },
      contentSha256: traceContentHash(row),
    });
    return row.id;
  });
}

const metaSelect = {
  id: true, name: true, fileName: true, sha256: true, sampleCount: true, startAt: true, endAt: true,
  warnings: true, importSettings: true, createdAt: true,
} as const;

function toMeta(row: { warnings: unknown; importSettings: unknown } & Omit<StoredTraceMeta, "warnings" | "importSettings" | "hasProbe">): StoredTraceMeta {
  const importSettings = row.importSettings as ResolvedImportSettings;
  return { ...row, warnings: row.warnings as string[], importSettings, hasProbe: importSettings.productColumn !== undefined };
}

/** Every trace's metadata, newest first (for the choosers on the review and design forms). */
export async function listTraces(): Promise<StoredTraceMeta[]> {
  const rows = await db.trace.findMany({ select: metaSelect, orderBy: { createdAt: "desc" } });
  return rows.map(toMeta);
}

export interface TraceListRow extends StoredTraceMeta {
  reviewCount: number;
}

async function traceSearchWhere(q: string | undefined) {
  const t = searchText(q);
  if (!t) return undefined;
  const hex = /^[0-9a-fA-F]{4,64}$/.test(t) ? t.toLowerCase() : null;
  return { OR: [{ id: { in: await idsContaining("Trace", t) } }, ...(hex ? [{ sha256: { startsWith: hex } }] : []), { id: t }] };
}

/**
 * One page of traces, newest first, with a text search over the name and the file name (literal text,
 * case-insensitive for ASCII letters), the start of the SHA-256 and the exact id.
 */
export async function searchTraces(filter: { q?: string } & PageRequest = {}): Promise<Paged<TraceListRow>> {
  const where = await traceSearchWhere(filter.q);
  const total = await db.trace.count({ where });
  const p = resolvePage(filter, total);
  const rows = await db.trace.findMany({
    where,
    select: { ...metaSelect, _count: { select: { reviews: true } } },
    orderBy: [{ createdAt: "desc" }, { id: "asc" }],
    skip: p.skip,
    take: p.pageSize,
  });
  return { rows: rows.map(({ _count, ...r }) => ({ ...toMeta(r), reviewCount: _count.reviews })), total, page: p.page, pageSize: p.pageSize, pages: p.pages };
}

/** Uploaded traces that no review has used yet, newest first: the first `take` and how many in all. */
export async function unreviewedTraces(take = 5): Promise<{ rows: Array<{ id: string; name: string; createdAt: Date }>; total: number }> {
  const where = { reviews: { none: {} } };
  const [rows, total] = await Promise.all([
    db.trace.findMany({ where, select: { id: true, name: true, createdAt: true }, orderBy: { createdAt: "desc" }, take }),
    db.trace.count({ where }),
  ]);
  return { rows, total };
}

/** Stored traces whose original bytes have this SHA-256 (the same file uploaded before), oldest first. */
export async function tracesWithSha256(sha256: string, exceptId?: string): Promise<Array<{ id: string; name: string; fileName: string; createdAt: Date }>> {
  return db.trace.findMany({
    where: { sha256: sha256.toLowerCase(), ...(exceptId ? { id: { not: exceptId } } : {}) },
    select: { id: true, name: true, fileName: true, createdAt: true },
    orderBy: { createdAt: "asc" },
  });
}

/** The metadata and parsed series of one trace. The original bytes are not loaded: see `getTraceOriginal`. */
export async function getTrace(id: string): Promise<{ meta: StoredTraceMeta; series: TraceSeries } | null> {
  const row = await db.trace.findUnique({ where: { id }, select: { ...metaSelect, timesS: true, airC: true, probeC: true } });
  if (!row) return null;
  return {
    meta: toMeta(row),
    series: { t_s: bytesToFloat64(row.timesS), air_C: bytesToFloat64(row.airC), ...(row.probeC ? { probe_C: bytesToFloat64(row.probeC) } : {}) },
  };
}

/** The exact bytes as uploaded, with the recorded SHA-256: only for download and verification. */
export async function getTraceOriginal(id: string): Promise<{ id: string; fileName: string; sha256: string; bytes: Uint8Array } | null> {
  const row = await db.trace.findUnique({ where: { id }, select: { id: true, fileName: true, sha256: true, original: true } });
  return row ? { id: row.id, fileName: row.fileName, sha256: row.sha256, bytes: row.original } : null;
}
