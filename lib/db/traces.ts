import { db } from "./client";
import { appendAudit } from "./audit";
import { bytesToFloat64, float64ToBytes } from "./bytes";
import { sha256Hex, type TraceImport, type TraceSeries, type ResolvedImportSettings } from "../trace";

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
export async function createTrace(args: { name: string; fileName: string; bytes: Uint8Array; imported: TraceImport; actor?: string }): Promise<string> {
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
      select: { id: true },
    });
    await appendAudit(tx, {
      action: "import",
      entity: "trace",
      entityId: row.id,
      actor: args.actor ?? "web",
      details: { fileName: args.fileName, sha256, samples: n, settings: settings as unknown as object, warnings: warnings.length },
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

export async function listTraces(): Promise<StoredTraceMeta[]> {
  const rows = await db.trace.findMany({ select: metaSelect, orderBy: { createdAt: "desc" } });
  return rows.map(toMeta);
}

export async function getTrace(id: string): Promise<{ meta: StoredTraceMeta; series: TraceSeries; original: Uint8Array } | null> {
  const row = await db.trace.findUnique({ where: { id }, select: { ...metaSelect, timesS: true, airC: true, probeC: true, original: true } });
  if (!row) return null;
  return {
    meta: toMeta(row),
    series: { t_s: bytesToFloat64(row.timesS), air_C: bytesToFloat64(row.airC), ...(row.probeC ? { probe_C: bytesToFloat64(row.probeC) } : {}) },
    original: row.original,
  };
}
