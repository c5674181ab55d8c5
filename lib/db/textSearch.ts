import { db, dbKind } from "./client";

/**
 * Text search without LIKE: SQLite's LIKE treats `%` and `_` typed into a search box as wildcards, and
 * Prisma's `contains` cannot escape them. `instr(lower(column), lower(text))` matches the text
 * literally (lower() folds ASCII letters only, as LIKE does). PostgreSQL: `strpos(lower(column), lower(text))`,
 * the same literal match (its lower() also folds non-ASCII letters).
 */

/** A literal, case-folded "column contains parameter n" in this database's SQL. */
function contains(column: string, n: number): string {
  return dbKind() === "postgres" ? `strpos(lower("${column}"), lower($${n})) > 0` : `instr(lower("${column}"), lower(?)) > 0`;
}

/** At most this many matching objects per table, newest first; a search is for finding, not counting. */
export const SEARCH_MATCH_CAP = 5000;

type Table = "Trace" | "Definition" | "Review";
const COLUMNS: Record<Table, readonly string[]> = {
  Trace: ["name", "fileName"],
  Definition: ["name"],
  Review: ["title", "signedBy"],
};

/** Ids of the rows whose searched columns contain the text (table and columns are fixed here, never user input). */
export async function idsContaining(table: Table, text: string, columns: readonly string[] = COLUMNS[table]): Promise<string[]> {
  const where = columns.map((c, i) => contains(c, i + 1)).join(" OR ");
  const rows = await db.$queryRawUnsafe<Array<{ id: string }>>(`SELECT "id" FROM "${table}" WHERE ${where} ORDER BY "createdAt" DESC LIMIT ${SEARCH_MATCH_CAP}`, ...columns.map(() => text));
  return rows.map((r) => r.id);
}

/** The distinct actors of the audit log whose name contains the text. */
export async function actorsContaining(text: string): Promise<string[]> {
  const rows = await db.$queryRawUnsafe<Array<{ actor: string }>>(`SELECT DISTINCT "actor" FROM "AuditEntry" WHERE ${contains("actor", 1)} LIMIT ${SEARCH_MATCH_CAP}`, text);
  return rows.map((r) => r.actor);
}

/** Text that is safe as a LIKE prefix (letters and digits only), for id and hash prefixes. */
export const plainPrefix = (t: string): string | null => (/^[A-Za-z0-9]+$/.test(t) ? t : null);
