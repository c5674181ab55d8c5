import type { PrismaBetterSQLite3 } from "@prisma/adapter-better-sqlite3";

type Adapter = Awaited<ReturnType<PrismaBetterSQLite3["connect"]>>;
type Transaction = Awaited<ReturnType<Adapter["startTransaction"]>>;
/** The better-sqlite3 connection the adapter and its transactions hold (a public field of both). */
type WithConnection = { client: { inTransaction: boolean; exec(sql: string): unknown; prepare(sql: string): { run(): unknown } } };

/**
 * Keeps the one SQLite connection usable after a failed write.
 *
 * The adapter serialises transactions with a lock that only its transaction's commit() or rollback()
 * releases, and Prisma calls those only after its `COMMIT` or `ROLLBACK` statement succeeds. When
 * the disk is full (SQLITE_FULL), SQLite may already have rolled the transaction back itself, so
 * Prisma's `ROLLBACK` fails ("no transaction is active"); a `COMMIT` can fail the same way. The lock
 * was then never released and every later write waited for it forever: uploads hung until restart.
 *
 * Here a failed `ROLLBACK` whose transaction SQLite has already ended counts as done, and a failed
 * `COMMIT` rolls back what is left and releases the lock before its error goes on to the caller.
 */
export function guardTransactions(factory: PrismaBetterSQLite3): PrismaBetterSQLite3 {
  const connect = factory.connect.bind(factory);
  factory.connect = async () => {
    const adapter = await connect();
    beginImmediate((adapter as unknown as WithConnection).client);
    const start = adapter.startTransaction.bind(adapter);
    adapter.startTransaction = async (isolationLevel) => closeOnFailure(await start(isolationLevel));
    return adapter;
  };
  return factory;
}

function closeOnFailure(tx: Transaction): Transaction {
  const connection = (tx as unknown as WithConnection).client;
  const executeRaw = tx.executeRaw.bind(tx);
  tx.executeRaw = async (query) => {
    const sql = query.sql.trim().toUpperCase();
    if (sql !== "COMMIT" && sql !== "ROLLBACK") return executeRaw(query);
    try {
      return await executeRaw(query);
    } catch (e) {
      if (connection.inTransaction) connection.exec("ROLLBACK");
      // ROLLBACK: the transaction is over either way; Prisma now calls rollback(), which releases the lock.
      if (sql === "ROLLBACK") return 0;
      // COMMIT: Prisma will not call commit() or rollback() after this error; release the lock here.
      await tx.rollback();
      throw e;
    }
  };
  return tx;
}

/**
 * Write transactions take SQLite's write lock when they begin (`BEGIN IMMEDIATE`), not at their first
 * write: a transaction that reads the audit chain's head and then appends cannot be overtaken by another
 * process between the two, and a second writer (the CLI beside the server) waits for the lock (the busy
 * timeout) instead of failing mid-transaction with SQLITE_BUSY. The adapter issues a plain `BEGIN`; when
 * the lock is still held after the busy timeout, the transaction begins deferred and its first write
 * reports SQLITE_BUSY, which rolls it back through Prisma's usual path (releasing the adapter's lock) and
 * lets lib/db/busy.ts retry it whole.
 */
function beginImmediate(connection: WithConnection["client"]): void {
  const prepare = connection.prepare.bind(connection);
  connection.prepare = (sql: string) => {
    if (sql.trim().toUpperCase() !== "BEGIN") return prepare(sql);
    return {
      run: () => {
        try {
          return prepare("BEGIN IMMEDIATE").run();
        } catch (e) {
          if (!/SQLITE_BUSY|SQLITE_LOCKED/.test(String((e as { code?: unknown }).code))) throw e;
          return prepare("BEGIN").run();
        }
      },
    };
  };
}
