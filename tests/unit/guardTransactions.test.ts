import { describe, it, expect } from "vitest";
import type { PrismaBetterSQLite3 } from "@prisma/adapter-better-sqlite3";
import { guardTransactions } from "@/lib/db/guardTransactions";

// The adapter's lock is released only by the transaction's commit() or rollback(); a fake adapter
// records which are called when COMMIT or ROLLBACK fails (the real SQLite case is in
// tests/integration/diskFull.test.ts).
function fakeFactory(fail: "COMMIT" | "ROLLBACK", inTransactionAfterFailure: boolean) {
  const calls: string[] = [];
  const connection = {
    inTransaction: true,
    exec: (sql: string) => { calls.push(`exec ${sql}`); connection.inTransaction = false; },
    prepare: (sql: string) => ({ run: () => void calls.push(`prepare ${sql}`) }),
  };
  const tx = {
    client: connection,
    executeRaw: async (q: { sql: string }) => {
      calls.push(q.sql);
      if (q.sql === fail) {
        connection.inTransaction = inTransactionAfterFailure;
        throw Object.assign(new Error(fail === "ROLLBACK" ? "cannot rollback - no transaction is active" : "database or disk is full"), { code: "SQLITE_FULL" });
      }
      return 0;
    },
    commit: async () => void calls.push("commit()"),
    rollback: async () => void calls.push("rollback()"),
  };
  const adapter = { client: connection, startTransaction: async () => tx };
  const factory = { connect: async () => adapter } as unknown as PrismaBetterSQLite3;
  return { factory, calls };
}

describe("guardTransactions", () => {
  it("guardTransactions treats a ROLLBACK of a transaction SQLite already ended as done", async () => {
    const { factory, calls } = fakeFactory("ROLLBACK", false);
    const tx = await (await guardTransactions(factory).connect()).startTransaction();
    await expect(tx.executeRaw({ sql: "ROLLBACK", args: [], argTypes: [] })).resolves.toBe(0);
    expect(calls).toEqual(["ROLLBACK"]); // Prisma calls rollback() next, which releases the lock
  });
  it("guardTransactions rolls back and releases the lock when COMMIT fails, then passes the error on", async () => {
    const { factory, calls } = fakeFactory("COMMIT", true);
    const tx = await (await guardTransactions(factory).connect()).startTransaction();
    await expect(tx.executeRaw({ sql: "COMMIT", args: [], argTypes: [] })).rejects.toThrow("database or disk is full");
    expect(calls).toEqual(["COMMIT", "exec ROLLBACK", "rollback()"]);
  });
  it("guardTransactions begins write transactions with BEGIN IMMEDIATE and leaves other statements alone", async () => {
    const { factory, calls } = fakeFactory("COMMIT", false);
    const adapter = (await guardTransactions(factory).connect()) as unknown as { client: { prepare(sql: string): { run(): unknown } } };
    adapter.client.prepare("BEGIN").run();
    adapter.client.prepare("SELECT 1").run();
    expect(calls).toEqual(["prepare BEGIN IMMEDIATE", "prepare SELECT 1"]);
  });
});

describe("isDiskFull", () => {
  it("isDiskFull finds SQLITE_FULL as Prisma's code, in a cause, or in the driver's words, and nothing else", async () => {
    const { isDiskFull } = await import("@/lib/db/errors");
    expect(isDiskFull(Object.assign(new Error("Invalid `tx.trace.create()` invocation"), { code: "SQLITE_FULL" }))).toBe(true);
    expect(isDiskFull(new Error("commit failed", { cause: new Error("database or disk is full") }))).toBe(true);
    expect(isDiskFull(Object.assign(new Error("UNIQUE constraint failed"), { code: "SQLITE_CONSTRAINT" }))).toBe(false);
    expect(isDiskFull("full")).toBe(false);
  });
});
