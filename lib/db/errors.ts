/**
 * True when a storage error means the disk (or the database's size limit) is full: SQLite's SQLITE_FULL, or
 * PostgreSQL's disk_full (SQLSTATE 53100, "No space left on device"), as Prisma reports it (`code`, or the
 * driver adapter's `originalCode`) or as the driver words it, anywhere in the cause chain.
 */
export function isDiskFull(e: unknown): boolean {
  for (let x: unknown = e, depth = 0; x && typeof x === "object" && depth < 6; depth++) {
    const { code, originalCode, message, originalMessage } = x as { code?: unknown; originalCode?: unknown; message?: unknown; originalMessage?: unknown };
    if (code === "SQLITE_FULL" || code === "53100" || originalCode === "53100") return true;
    for (const m of [message, originalMessage]) if (typeof m === "string" && /database or disk is full|No space left on device/.test(m)) return true;
    const o = x as { cause?: unknown; meta?: { driverAdapterError?: unknown } };
    x = o.cause ?? o.meta?.driverAdapterError;
  }
  return false;
}
