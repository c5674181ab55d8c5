import pg from "pg";
import { pgConnection } from "./pgAdapter";
import { redactUrl } from "./env";

/**
 * Why a PostgreSQL URL does not name a Corelag database (unreachable, or without the tables), or null
 * when it does. The record commands never create a database; this refuses a mistyped URL in one line.
 */
export async function postgresDatabaseProblem(url: string): Promise<string | null> {
  const client = new pg.Client({ ...pgConnection(url), connectionTimeoutMillis: 10_000 });
  try {
    await client.connect();
    const r = await client.query<{ t: string | null }>(`SELECT to_regclass('"AuditEntry"')::text AS t`);
    return r.rows[0]?.t ? null : `DATABASE_URL: ${redactUrl(url)} has no Corelag tables; check the database name (verify never creates one)`;
  } catch (e) {
    return `DATABASE_URL: cannot reach the PostgreSQL database ${redactUrl(url)} (${(e as Error).message})`;
  } finally {
    await client.end().catch(() => undefined);
  }
}
