import pg from "pg";
import { pgConnection } from "./pgAdapter";

/**
 * Creates the database the URL names when the server does not have it yet (as SQLite creates its file),
 * through the server's `postgres` database; the role needs CREATEDB, else the server's refusal is reported.
 */
export async function createDatabaseIfMissing(url: string): Promise<void> {
  const conn = pgConnection(url);
  const probe = new pg.Client(conn);
  try {
    await probe.connect();
    return;
  } catch (e) {
    if ((e as { code?: string }).code !== "3D000") throw e; // 3D000: invalid_catalog_name, no such database
  } finally {
    await probe.end().catch(() => undefined);
  }
  const admin = new pg.Client({ ...conn, database: "postgres" });
  await admin.connect();
  try {
    await admin.query(`CREATE DATABASE "${String(conn.database).replace(/"/g, '""')}"`);
  } catch (e) {
    if ((e as { code?: string }).code !== "42P04") throw new Error(`the database ${conn.database} does not exist and cannot be created: ${(e as Error).message}`); // 42P04: created meanwhile
  } finally {
    await admin.end();
  }
}

