// Busy databases: what counts as "try again", the bounded retry, and the one error a user sees when the
// retries run out. Nobody is shown SQLITE_BUSY, a PostgreSQL serialization failure or a unique-constraint
// message about the audit chain: those mean another writer got there first, and the write is retried whole.

/** The database stayed busy through every retry; nothing of the write was stored. */
export class StorageBusyError extends Error {
  constructor(attempts: number, cause: unknown) {
    super(`the database is busy with other writes (tried ${attempts} times over a few seconds); nothing was stored: try again in a moment`, { cause });
    this.name = "StorageBusyError";
  }
}

/** PostgreSQL SQLSTATEs that mean "another transaction was in the way": serialization failure, deadlock, lock not available. */
const PG_RETRYABLE = new Set(["40001", "40P01", "55P03"]);

function causes(e: unknown): Array<Record<string, unknown>> {
  const out: Array<Record<string, unknown>> = [];
  for (let x: unknown = e, depth = 0; x && typeof x === "object" && depth < 6; depth++) {
    out.push(x as Record<string, unknown>);
    const o = x as { cause?: unknown; meta?: { driverAdapterError?: unknown } };
    x = o.cause ?? o.meta?.driverAdapterError;
  }
  return out;
}

/**
 * True when a write failed only because another writer held the database or wrote the same audit
 * position first: SQLITE_BUSY/LOCKED, PostgreSQL serialization failures and deadlocks, Prisma's write
 * conflict (P2034) and transaction-start timeout (P2028), and a unique violation on the audit chain.
 */
export function isBusy(e: unknown): boolean {
  for (const c of causes(e)) {
    const code = typeof c.code === "string" ? c.code : typeof c.originalCode === "string" ? c.originalCode : "";
    const message = typeof c.message === "string" ? c.message : typeof c.originalMessage === "string" ? c.originalMessage : "";
    if (/^SQLITE_(BUSY|LOCKED)/.test(code) || /database is (locked|busy)/i.test(message)) return true;
    if (PG_RETRYABLE.has(code)) return true;
    if (code === "P2034" || (code === "P2028" && /unable to start a transaction/i.test(message))) return true;
    if (code === "P2002" && /AuditEntry|AuditSignature/.test(JSON.stringify(c.meta ?? {}) + message)) return true;
    if (c.kind === "UniqueConstraintViolation" && /AuditEntry|AuditSignature|seq|hash/.test(JSON.stringify(c.constraint ?? {}))) return true;
    if (c.kind === "TransactionWriteConflict") return true;
  }
  return false;
}

export const BUSY_ATTEMPTS = 6;

/** Runs `fn` (a whole transaction) again when the database was busy, up to BUSY_ATTEMPTS times with growing pauses. */
export async function retryBusy<T>(fn: () => Promise<T>, attempts = BUSY_ATTEMPTS): Promise<T> {
  for (let i = 1; ; i++) {
    try {
      return await fn();
    } catch (e) {
      if (!isBusy(e)) throw e;
      if (i >= attempts) throw new StorageBusyError(attempts, e);
      // 50, 100, 200, 400, 800 ms, each with up to half again at random so that retries do not collide
      const pause = 50 * 2 ** (i - 1);
      await new Promise((r) => setTimeout(r, pause + Math.random() * pause * 0.5));
    }
  }
}
