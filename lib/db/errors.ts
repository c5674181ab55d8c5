/**
 * True when a storage error means the disk (or the database's size limit) is full: SQLite's
 * SQLITE_FULL, as Prisma reports it (`code`) or as the driver words it, anywhere in the cause chain.
 */
export function isDiskFull(e: unknown): boolean {
  for (let x: unknown = e, depth = 0; x && typeof x === "object" && depth < 5; x = (x as { cause?: unknown }).cause, depth++) {
    const { code, message } = x as { code?: unknown; message?: unknown };
    if (code === "SQLITE_FULL" || (typeof message === "string" && /database or disk is full/.test(message))) return true;
  }
  return false;
}
