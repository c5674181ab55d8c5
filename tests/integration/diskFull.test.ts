import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { TEST_ACTOR } from "../helpers/accounts";

// A full disk during an upload (SQLITE_FULL), on a real SQLite file whose size is capped with
// PRAGMA max_page_count (a per-connection limit: it acts on the app's one connection). Issue #9: after
// a disk-full error every later upload hung until the server was restarted, even with space freed.
const dir = mkdtempSync(path.join(tmpdir(), "corelag-full-"));
const url = `file:${path.join(dir, "full.db")}`;
process.env.DATABASE_URL = url;

type Db = typeof import("@/lib/db/client")["db"];
let db: Db;
let importAndStoreTrace: typeof import("@/lib/services/traces")["importAndStoreTrace"];

const rows = (n: number) => Array.from({ length: n }, (_, i) => `${new Date(Date.UTC(2026, 0, 1) + i * 60_000).toISOString()},${(3 + (i % 10) / 10).toFixed(1)}`);
const csv = (n: number) => new TextEncoder().encode(`Time,Air\n${rows(n).join("\n")}\n`);
/** Fails instead of waiting forever: the defect was a hang. */
const within = <T>(ms: number, p: Promise<T>) => Promise.race([p, new Promise<never>((_, reject) => setTimeout(() => reject(new Error(`still waiting after ${ms} ms`)), ms))]);

async function capPages(extra: number | null): Promise<void> {
  const used = Number((await db.$queryRawUnsafe<Array<{ page_count: bigint }>>("PRAGMA page_count"))[0]!.page_count);
  await db.$queryRawUnsafe(`PRAGMA max_page_count = ${extra === null ? 1_073_741_823 : used + extra}`);
}

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
  db = (await import("@/lib/db/client")).db;
  importAndStoreTrace = (await import("@/lib/services/traces")).importAndStoreTrace;
});

afterAll(async () => {
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

describe("a full disk leaves the storage usable", () => {
  it("after SQLite rolls a transaction back itself on SQLITE_FULL, the next upload completes", async () => {
    // A one-row insert into a table without indexes needs no statement journal, so on SQLITE_FULL
    // SQLite rolls back the whole transaction, and Prisma's own ROLLBACK then finds none to end:
    // what a real full disk does to the trace insert. Before the fix the connection's lock was never
    // released and the upload below waited forever.
    await db.$executeRawUnsafe("CREATE TABLE scratch (b BLOB)");
    await capPages(2);
    await expect(db.$transaction(async (tx) => tx.$executeRawUnsafe("INSERT INTO scratch VALUES (zeroblob(200000))"))).rejects.toMatchObject({ code: "SQLITE_FULL" });
    await capPages(null); // space freed
    const res = await within(10_000, importAndStoreTrace(csv(50), { fileName: "after.csv", options: {} }, TEST_ACTOR));
    expect(res.ok).toBe(true);
  });

  it("an upload that fills the disk is refused as such, stores nothing, and the next one is stored", async () => {
    const traces = await db.trace.count(), entries = await db.auditEntry.count();
    await capPages(2);
    const res = await within(10_000, importAndStoreTrace(csv(20_000), { fileName: "big.csv", options: {} }, TEST_ACTOR));
    expect(res).toEqual({
      ok: false,
      diskFull: true,
      message: "big.csv: the server's disk is full, so the trace could not be stored. Nothing was stored; free some space (or ask the administrator to) and upload it again.",
    });
    expect(await db.trace.count()).toBe(traces);
    expect(await db.auditEntry.count()).toBe(entries);
    await capPages(null);
    const again = await within(10_000, importAndStoreTrace(csv(20_000), { fileName: "big.csv", options: {} }, TEST_ACTOR));
    expect(again.ok).toBe(true);
    expect(await db.trace.count()).toBe(traces + 1);
  });
});
