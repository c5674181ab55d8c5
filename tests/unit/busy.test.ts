import { describe, expect, it } from "vitest";
import { isBusy, retryBusy, StorageBusyError } from "@/lib/db/busy";

// The bounded retry around every write transaction (lib/db/busy.ts).
describe("busy databases", () => {
  it("counts SQLite busy, PostgreSQL serialization failures and deadlocks, and audit-chain collisions as busy; nothing else", () => {
    expect(isBusy(Object.assign(new Error("database is locked"), { code: "SQLITE_BUSY" }))).toBe(true);
    expect(isBusy({ message: "x", cause: { code: "40001" } })).toBe(true);
    expect(isBusy({ code: "P2010", meta: { driverAdapterError: { cause: { originalCode: "40P01", kind: "postgres" } } } })).toBe(true);
    expect(isBusy({ code: "P2002", message: "Unique constraint failed on the fields: (`seq`)", meta: { modelName: "AuditEntry" } })).toBe(true);
    expect(isBusy({ code: "P2002", message: "Unique constraint failed", meta: { modelName: "Definition" } })).toBe(false);
    expect(isBusy(new Error("a stored trace cannot be changed"))).toBe(false);
    expect(isBusy(Object.assign(new Error("disk full"), { code: "SQLITE_FULL" }))).toBe(false);
  });

  it("retries a busy transaction whole and returns its result", async () => {
    let calls = 0;
    const r = await retryBusy(async () => {
      calls++;
      if (calls < 3) throw Object.assign(new Error("database is locked"), { code: "SQLITE_BUSY" });
      return "stored";
    });
    expect([r, calls]).toEqual(["stored", 3]);
  });

  it("gives up after the bounded number of attempts with one plain message, and passes other errors on at once", async () => {
    let calls = 0;
    const busy = retryBusy(async () => {
      calls++;
      throw Object.assign(new Error("SQLITE_BUSY: database is locked"), { code: "SQLITE_BUSY" });
    }, 3);
    await expect(busy).rejects.toBeInstanceOf(StorageBusyError);
    await expect(busy).rejects.toThrow(/^the database is busy with other writes \(tried 3 times over a few seconds\); nothing was stored: try again in a moment$/);
    expect(calls).toBe(3);
    let other = 0;
    await expect(retryBusy(async () => { other++; throw new Error("a review only changes from open to signed"); })).rejects.toThrow("a review only changes");
    expect(other).toBe(1);
  });
});
