// Reads everything `verify` compares, straight from the database (read-only, without Prisma), so a
// damaged or tampered database gives findings instead of a crash: the SQLite file with better-sqlite3, or
// PostgreSQL with pg (recordSnapshotPg.ts). Both return the same RecordSnapshot; the comparison
// (lib/review/records.ts) knows no database.
import Database from "better-sqlite3";
import { existsSync } from "node:fs";
import type { AuditEntryRecord } from "../review/audit";
import { SHIPMENT_TABLES, type DefinitionRowContent, type ReviewRowContent, type ShipmentTable, type TraceRowContent } from "../review/content";
import type { Finding, RecordSnapshot, SignatureRecord } from "../review/records";
import { databaseFile, databaseKind, databaseUrl } from "./env";
import { readPgSnapshot } from "./recordSnapshotPg";

export type Raw = Record<string, unknown>;

export const MAX_STORAGE_FINDINGS = 100;

/** JSON text as a value; text that does not parse stays as a marked string, so its hash differs. */
function json(v: unknown): unknown {
  if (typeof v !== "string") return v ?? null;
  try {
    return JSON.parse(v);
  } catch {
    return { unparsable: v };
  }
}
const bytes = (v: unknown): Uint8Array => (v instanceof Uint8Array ? v : new TextEncoder().encode(String(v ?? "")));
const blob = (v: unknown): Uint8Array | null => (v === null || v === undefined ? null : bytes(v));
const str = (v: unknown): string => (v === null || v === undefined ? "" : String(v));
const strOrNull = (v: unknown): string | null => (v === null || v === undefined ? null : String(v));
const when = (v: unknown): Date | string => (typeof v === "number" ? new Date(v) : v instanceof Date ? v : str(v));

export function toEntry(r: Raw): AuditEntryRecord {
  const at = new Date(when(r.at));
  return { seq: Number(r.seq), at, action: str(r.action), entity: str(r.entity), entityId: str(r.entityId), actor: str(r.actor), details: json(r.details), prevHash: str(r.prevHash), hash: str(r.hash) };
}
/** Every column toTrace reads but the original bytes: a light check names them so the bytes are never fetched. */
export const TRACE_COLUMNS_BUT_ORIGINAL = `"id", "name", "fileName", "sha256", "importSettings", "timesS", "airC", "probeC", "sampleCount", "startAt", "endAt", "warnings", "createdAt"`;

/** A trace row as content; without `withOriginal` (a light check) the original bytes are not read and stay null. */
export function toTrace(r: Raw, withOriginal = true): TraceRowContent {
  return {
    id: str(r.id), name: str(r.name), fileName: str(r.fileName), sha256: str(r.sha256), original: withOriginal ? bytes(r.original) : null, importSettings: json(r.importSettings),
    timesS: bytes(r.timesS), airC: bytes(r.airC), probeC: blob(r.probeC), sampleCount: Number(r.sampleCount), startAt: when(r.startAt), endAt: when(r.endAt),
    warnings: json(r.warnings), createdAt: when(r.createdAt),
  };
}
export function toDefinition(r: Raw): DefinitionRowContent {
  return { id: str(r.id), kind: str(r.kind), lineage: str(r.lineage), version: Number(r.version), name: str(r.name), body: json(r.body), sha256: str(r.sha256), createdAt: when(r.createdAt) };
}
export function toReview(r: Raw): ReviewRowContent {
  return {
    id: str(r.id), title: str(r.title), traceId: str(r.traceId), productId: str(r.productId), packId: strOrNull(r.packId), limitsId: str(r.limitsId),
    options: json(r.options), engineVersion: str(r.engineVersion), result: json(r.result), coreC: bytes(r.coreC), surfaceC: blob(r.surfaceC), meanC: blob(r.meanC),
    coolantC: blob(r.coolantC), resultSha256: str(r.resultSha256), outcome: str(r.outcome), status: str(r.status), signedBy: strOrNull(r.signedBy),
    signedAt: r.signedAt === null || r.signedAt === undefined ? null : when(r.signedAt), decision: strOrNull(r.decision), signComment: strOrNull(r.signComment),
    signMeaning: strOrNull(r.signMeaning), correctsId: strOrNull(r.correctsId), createdAt: when(r.createdAt),
  };
}

/** A shipment-table row as Prisma returns it: dates as instants, JSON parsed, REAL as numbers. */
export function toShipmentRow(table: ShipmentTable, r: Raw): { table: ShipmentTable; row: Record<string, unknown> & { id: string } } {
  const spec = SHIPMENT_TABLES[table];
  const row: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(r)) {
    if ((spec.dates as readonly string[]).includes(k)) row[k] = v === null || v === undefined ? null : when(v);
    else if ((spec.json as readonly string[]).includes(k)) row[k] = v === null || v === undefined ? null : json(v);
    else row[k] = v;
  }
  return { table, row: { ...row, id: str(r.id) } };
}

export interface SnapshotRead {
  snapshot: RecordSnapshot;
  /** damage and foreign-key holes found by the database's own checks, and tables that could not be read */
  storage: Finding[];
}

export const emptySnapshot = (): RecordSnapshot => ({ entries: [], signatures: [], traces: [], definitions: [], reviews: [], incompleteTables: [] });

export interface SnapshotOptions {
  /** a SQLite file other than DATABASE_URL's */
  file?: string;
  /** a database URL other than DATABASE_URL */
  url?: string;
  scope?: ReadonlySet<string>;
  storageChecks?: boolean;
  /** a light check: only this part of the chain (see ChainPart) */
  chain?: ChainPart;
  /** false: leave the traces' original bytes in the database (the stored SHA-256 stands for them) */
  originals?: boolean;
}

/**
 * Which part of the chain a light check reads: the entries from `fromSeq` on (the verified head and the
 * tail after it), plus entry 1 (names the chain), every key entry (the key in force), the scoped rows' own
 * entries and any other asked for in `seqs` (an anchor's).
 */
export interface ChainPart {
  fromSeq: number;
  seqs?: number[];
}

/** The WHERE condition of a light check's entries, with its parameters in order ("?" placeholders). */
export function chainPartCondition(part: ChainPart, ids: string[] | null): { sql: string; params: unknown[] } {
  const extra = part.seqs ?? [];
  const sql =
    `"seq" >= ? OR "seq" = 1 OR "action" = 'key'` +
    (ids ? ` OR "entityId" IN (${ids.map(() => "?").join(",") || "NULL"})` : "") +
    (extra.length ? ` OR "seq" IN (${extra.map(() => "?").join(",")})` : "");
  return { sql, params: [part.fromSeq, ...(ids ?? []), ...extra] };
}

/**
 * Everything verify needs. `scope` limits the rows read to these ids (a review and its inputs), for the
 * app's per-review check; the chain and signatures are always read whole. Never throws.
 */
export async function readRecordSnapshot(opts: SnapshotOptions = {}): Promise<SnapshotRead> {
  if (!opts.file) {
    let url: string;
    try {
      url = opts.url ?? databaseUrl();
    } catch (e) {
      return { snapshot: emptySnapshot(), storage: [{ kind: "storage-damaged", message: (e as Error).message }] };
    }
    if (databaseKind(url) === "postgres") return readPgSnapshot(url, opts);
    opts = { ...opts, file: databaseFile(url) };
  }
  return readSqliteSnapshot(opts);
}

function readSqliteSnapshot(opts: SnapshotOptions): SnapshotRead {
  const storage: Finding[] = [];
  const snapshot = emptySnapshot();
  if (opts.scope) snapshot.scope = opts.scope;
  let file: string;
  try {
    file = opts.file ?? databaseFile();
  } catch (e) {
    storage.push({ kind: "storage-damaged", message: (e as Error).message });
    return { snapshot, storage };
  }
  if (!existsSync(file)) {
    storage.push({ kind: "storage-damaged", message: `${file}: the database file does not exist` });
    return { snapshot, storage };
  }
  let conn: Database.Database;
  try {
    conn = new Database(file, { readonly: true, fileMustExist: true });
  } catch (e) {
    storage.push({ kind: "storage-damaged", message: `${file}: cannot be opened (${(e as Error).message})` });
    return { snapshot, storage };
  }
  try {
    if (opts.storageChecks !== false) {
      try {
        const lines = conn.prepare("PRAGMA integrity_check").pluck().all() as string[];
        for (const line of lines.filter((l) => l !== "ok").slice(0, MAX_STORAGE_FINDINGS)) storage.push({ kind: "storage-damaged", message: `integrity check: ${line}` });
      } catch (e) {
        storage.push({ kind: "storage-damaged", message: `integrity check could not run: ${(e as Error).message}` });
      }
      try {
        const holes = conn.prepare("PRAGMA foreign_key_check").all() as { table: string; rowid: number; parent: string; fkid: number }[];
        for (const h of holes.slice(0, MAX_STORAGE_FINDINGS)) {
          let row: string | undefined;
          try {
            row = str(conn.prepare(`SELECT "id" FROM "${h.table}" WHERE rowid = ?`).pluck().get(h.rowid));
          } catch {
            row = undefined;
          }
          storage.push({ kind: "foreign-key-hole", table: h.table, ...(row ? { row } : {}), message: `${h.table} ${row ?? `rowid ${h.rowid}`} refers to a ${h.parent} row that does not exist` });
        }
      } catch (e) {
        storage.push({ kind: "storage-damaged", message: `foreign-key check could not run: ${(e as Error).message}` });
      }
    }
    const read = <T>(table: string, sql: string, map: (r: Raw) => T, into: T[], params: unknown[] = []) => {
      try {
        for (const r of conn.prepare(sql).iterate(...params) as IterableIterator<Raw>) {
          try {
            into.push(map(r));
          } catch (e) {
            storage.push({ kind: "table-unreadable", table, message: `${table}: a row cannot be read (${(e as Error).message})` });
          }
        }
      } catch (e) {
        snapshot.incompleteTables.push(table);
        storage.push({ kind: "table-unreadable", table, message: `${table}: reading stopped after ${into.length} rows (${(e as Error).message})` });
      }
    };
    const toSignature = (r: Raw) => ({ seq: Number(r.seq), keyFingerprint: str(r.keyFingerprint), signature: str(r.signature) }) as SignatureRecord;
    const ids = opts.scope ? [...opts.scope] : null;
    if (opts.chain) {
      const c = chainPartCondition(opts.chain, ids);
      read("AuditEntry", `SELECT * FROM "AuditEntry" WHERE ${c.sql} ORDER BY "seq"`, toEntry, snapshot.entries, c.params);
      read("AuditSignature", `SELECT * FROM "AuditSignature" WHERE "seq" >= ? OR "seq" IN (SELECT "seq" FROM "AuditEntry" WHERE ${c.sql}) ORDER BY "seq"`, toSignature, snapshot.signatures, [opts.chain.fromSeq, ...c.params]);
      snapshot.partial = { fromSeq: opts.chain.fromSeq };
    } else {
      read("AuditEntry", `SELECT * FROM "AuditEntry" ORDER BY "seq"`, toEntry, snapshot.entries);
      read("AuditSignature", `SELECT * FROM "AuditSignature" ORDER BY "seq"`, toSignature, snapshot.signatures);
    }
    const where = ids ? ` WHERE "id" IN (${ids.map(() => "?").join(",") || "NULL"})` : "";
    // a light check leaves the original bytes (up to 200 MB) in the database: the stored SHA-256 stands for them
    const withOriginal = opts.originals !== false;
    read("Trace", `SELECT ${withOriginal ? "*" : TRACE_COLUMNS_BUT_ORIGINAL} FROM "Trace"${where}`, (r) => toTrace(r, withOriginal), snapshot.traces, ids ?? []);
    read("Definition", `SELECT * FROM "Definition"${where}`, toDefinition, snapshot.definitions, ids ?? []);
    read("Review", `SELECT * FROM "Review"${where}`, toReview, snapshot.reviews, ids ?? []);
    // the shipment tables (absent from a database older than migration 20261202100000_shipments)
    let tables = new Set<string>();
    try {
      tables = new Set(conn.prepare(`SELECT name FROM sqlite_master WHERE type = 'table'`).pluck().all() as string[]);
    } catch (e) {
      storage.push({ kind: "table-unreadable", table: "sqlite_master", message: `the list of tables cannot be read (${(e as Error).message}); the shipment tables were not checked` });
    }
    snapshot.shipmentRows = [];
    for (const table of Object.keys(SHIPMENT_TABLES) as ShipmentTable[]) {
      if (!tables.has(table)) continue;
      read(table, `SELECT * FROM "${table}"${where}`, (r) => toShipmentRow(table, r), snapshot.shipmentRows, ids ?? []);
    }
  } finally {
    conn.close();
  }
  return { snapshot, storage };
}
