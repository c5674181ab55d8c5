import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";

const dir = mkdtempSync(path.join(tmpdir(), "corelag-wal-"));
const url = `file:${path.join(dir, "settings.db")}`;
process.env.DATABASE_URL = url;

afterAll(async () => {
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

describe("the storage client", () => {
  it("opens SQLite in WAL mode with a 10 s busy timeout, set where the client is created", async () => {
    const { migrateDatabase } = await import("@/lib/db/migrate");
    migrateDatabase(url);
    const { db } = await import("@/lib/db/client");
    expect(await db.$queryRawUnsafe("PRAGMA journal_mode")).toEqual([{ journal_mode: "wal" }]);
    expect(await db.$queryRawUnsafe("PRAGMA busy_timeout")).toEqual([{ timeout: 10000n }]);
  });
});
