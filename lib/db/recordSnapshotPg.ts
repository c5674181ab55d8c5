// verify's reader for PostgreSQL: one read-only REPEATABLE READ transaction (a consistent snapshot while
// the app keeps writing), rows streamed table by table through the pg driver, not Prisma. PostgreSQL
// enforces foreign keys itself and has no file-level integrity check to run from a client; page-level
// checks are the server's business (pg_amcheck). Never throws: every problem is a finding.
import pg from "pg";
import type { Finding, SignatureRecord } from "../review/records";
import { pgConnection } from "./pgAdapter";
import { chainPartCondition, TRACE_COLUMNS_BUT_ORIGINAL, emptySnapshot, toDefinition, toEntry, toReview, toShipmentRow, toTrace, type Raw, type SnapshotOptions, type SnapshotRead } from "./recordSnapshot";
import { SHIPMENT_TABLES, type ShipmentTable } from "../review/content";

const TIMESTAMP = 1114; // timestamp without time zone: Prisma stores UTC
const parsers = {
  getTypeParser: ((oid: number, format?: string) =>
    oid === TIMESTAMP ? (v: string) => new Date(`${v.replace(" ", "T")}Z`) : pg.types.getTypeParser(oid, format as "text")) as typeof pg.types.getTypeParser,
};

export async function readPgSnapshot(url: string, opts: SnapshotOptions): Promise<SnapshotRead> {
  const storage: Finding[] = [];
  const snapshot = emptySnapshot();
  if (opts.scope) snapshot.scope = opts.scope;
  let client: pg.Client;
  try {
    client = new pg.Client({ ...pgConnection(url), types: parsers });
    await client.connect();
  } catch (e) {
    storage.push({ kind: "storage-damaged", message: `the PostgreSQL database cannot be opened (${(e as Error).message})` });
    return { snapshot, storage };
  }
  try {
    await client.query("BEGIN ISOLATION LEVEL REPEATABLE READ READ ONLY");
    const read = async <T>(table: string, sql: string, map: (r: Raw) => T, into: T[], params: unknown[] = []) => {
      try {
        for (const r of (await client.query(sql, params)).rows as Raw[]) {
          try {
            into.push(map(r));
          } catch (e) {
            storage.push({ kind: "table-unreadable", table, message: `${table}: a row cannot be read (${(e as Error).message})` });
          }
        }
      } catch (e) {
        snapshot.incompleteTables.push(table);
        storage.push({ kind: "table-unreadable", table, message: `${table}: reading stopped after ${into.length} rows (${(e as Error).message})` });
        await client.query("ROLLBACK").catch(() => undefined);
        await client.query("BEGIN ISOLATION LEVEL REPEATABLE READ READ ONLY").catch(() => undefined);
      }
    };
    // JSON columns are read as text and parsed like the SQLite reader does, so both compare the same values.
    const entryCols = `"seq", "at", "action", "entity", "entityId", "actor", "details"::text AS "details", "prevHash", "hash"`;
    const toSignature = (r: Raw) => ({ seq: Number(r.seq), keyFingerprint: String(r.keyFingerprint), signature: String(r.signature) }) as SignatureRecord;
    const ids = opts.scope ? [...opts.scope] : null;
    if (opts.chain) {
      // the same part of the chain as the SQLite reader (chainPartCondition), with PostgreSQL's placeholders
      const c = chainPartCondition(opts.chain, ids);
      let n = 0;
      const sql = c.sql.replace(/\?/g, () => `$${++n}`);
      await read("AuditEntry", `SELECT ${entryCols} FROM "AuditEntry" WHERE ${sql} ORDER BY "seq"`, toEntry, snapshot.entries, c.params);
      await read("AuditSignature", `SELECT * FROM "AuditSignature" WHERE "seq" IN (SELECT "seq" FROM "AuditEntry" WHERE ${sql}) OR "seq" >= $1 ORDER BY "seq"`, toSignature, snapshot.signatures, c.params);
      snapshot.partial = { fromSeq: opts.chain.fromSeq };
    } else {
      await read("AuditEntry", `SELECT ${entryCols} FROM "AuditEntry" ORDER BY "seq"`, toEntry, snapshot.entries);
      await read("AuditSignature", `SELECT * FROM "AuditSignature" ORDER BY "seq"`, toSignature, snapshot.signatures);
    }
    const where = ids ? ` WHERE "id" = ANY($1::text[])` : "";
    const params = ids ? [ids] : [];
    // a light check leaves the original bytes in the database: the stored SHA-256 stands for them
    const withOriginal = opts.originals !== false;
    await read("Trace", `SELECT ${withOriginal ? "*" : TRACE_COLUMNS_BUT_ORIGINAL}, "importSettings"::text AS "importSettings", "warnings"::text AS "warnings" FROM "Trace"${where}`, (r) => toTrace(r, withOriginal), snapshot.traces, params);
    await read("Definition", `SELECT *, "body"::text AS "body" FROM "Definition"${where}`, toDefinition, snapshot.definitions, params);
    await read("Review", `SELECT *, "options"::text AS "options", "result"::text AS "result" FROM "Review"${where}`, toReview, snapshot.reviews, params);
    // the shipment tables (issue 15), JSON columns as text like the SQLite reader
    snapshot.shipmentRows = [];
    for (const table of Object.keys(SHIPMENT_TABLES) as ShipmentTable[]) {
      const casts = (SHIPMENT_TABLES[table].json as readonly string[]).map((c) => `, "${c}"::text AS "${c}"`).join("");
      await read(table, `SELECT *${casts} FROM "${table}"${where}`, (r) => toShipmentRow(table, r), snapshot.shipmentRows, params);
    }
    await client.query("COMMIT");
  } finally {
    await client.end().catch(() => undefined);
  }
  return { snapshot, storage };
}
