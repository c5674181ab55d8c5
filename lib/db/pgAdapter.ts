// The PostgreSQL driver adapter, configured the way Prisma 6.19.3 needs it (see /work/shared/TOOLCHAIN.md):
// - the catalog column types `name` (oid 19) and `"char"` (oid 18) are read as text: Prisma's adapter
//   otherwise fails to deserialise them;
// - the adapter gets the URL's parts, not `connectionString`, or its shadow database connects to the main one.
import pg from "pg";
import { PrismaPg } from "@prisma/adapter-pg";

pg.types.setTypeParser(19 as Parameters<typeof pg.types.setTypeParser>[0], (v: string) => v); // oid 19, the catalog's name
pg.types.setTypeParser(pg.types.builtins.CHAR, (v: string) => v); // oid 18, the catalog's "char"

/** Connection settings from a postgresql:// URL (user, password, host, port, database, and `?sslmode=require`). */
export function pgConnection(url: string): pg.PoolConfig {
  const u = new URL(url);
  if (!/^postgres(ql)?:$/.test(u.protocol)) throw new Error(`not a PostgreSQL URL: ${u.protocol}`);
  const database = decodeURIComponent(u.pathname.replace(/^\//, ""));
  if (!database) throw new Error("DATABASE_URL: a PostgreSQL URL must name the database, e.g. postgresql://user@host:5432/corelag");
  const sslmode = u.searchParams.get("sslmode");
  return {
    host: decodeURIComponent(u.hostname) || "127.0.0.1",
    port: u.port ? Number(u.port) : 5432,
    user: u.username ? decodeURIComponent(u.username) : undefined,
    password: u.password ? decodeURIComponent(u.password) : undefined,
    database,
    ...(sslmode && sslmode !== "disable" ? { ssl: { rejectUnauthorized: sslmode === "verify-full" } } : {}),
  };
}

export function pgAdapter(url: string, pool: Partial<pg.PoolConfig> = {}): PrismaPg {
  return new PrismaPg({ ...pgConnection(url), ...pool });
}

/**
 * A pg adapter for `prisma migrate diff` between two datamodels with no server at hand (the PostgreSQL
 * schema generator, scripts/pgSchema.ts): the schema engine asks only for the server version before
 * diffing, answered here as PostgreSQL 15; any other query fails, naming itself.
 */
export function offlinePgAdapter(): PrismaPg {
  const factory = new PrismaPg({ host: "127.0.0.1", port: 1, database: "offline" });
  const connect = factory.connect.bind(factory);
  factory.connect = async () => {
    const adapter = await connect();
    const refuse = async (q: { sql: string }): Promise<never> => {
      throw new Error(`offline PostgreSQL adapter: no server for ${q.sql.slice(0, 80)}`);
    };
    adapter.queryRaw = async (q) => {
      if (/version\(\)/.test(q.sql) && /server_version_num/.test(q.sql)) {
        // ColumnTypeEnum: Boolean 5, Text 7, Int32 0 (@prisma/driver-adapter-utils)
        return { columnNames: ["exists", "version", "numeric_version"], columnTypes: [5, 7, 0], rows: [[true, "PostgreSQL 15.0", 150000]] };
      }
      return refuse(q);
    };
    adapter.executeRaw = refuse;
    adapter.executeScript = async (sql: string) => refuse({ sql });
    return adapter;
  };
  return factory;
}
