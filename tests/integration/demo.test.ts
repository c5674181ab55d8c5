import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";

// The demo scenario loaded into a fresh SQLite file, as `npm start` does on first run.
const dir = mkdtempSync(path.join(tmpdir(), "corelag-demo-"));
const url = `file:${path.join(dir, "demo.db")}`;
process.env.DATABASE_URL = url;

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
});

afterAll(async () => {
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

describe("demo loader", () => {
  it("loadDemoIfEmpty loads one signed, historic review and one open review, and only once", async () => {
    const { loadDemoIfEmpty } = await import("@/lib/services/demo");
    const { listReviews, getReview } = await import("@/lib/db/reviews");
    expect(await loadDemoIfEmpty()).toBe("loaded");
    expect(await loadDemoIfEmpty()).toBe("skipped");
    const reviews = await listReviews();
    expect(reviews.map((r) => r.status).sort()).toEqual(["open", "signed"]);
    const signed = (await getReview(reviews.find((r) => r.status === "signed")!.id))!;
    // the 9 June run has door openings only: every rule passes, and the reviewer accepted it
    expect([signed.outcome, signed.decision, signed.signedBy]).toEqual(["accept", "accept", "Mara Quellen (QA, invented)"]);
    expect(signed.signComment).toMatch(/core estimate stayed below 5 °C/);
    expect(signed.trace.startAt.toISOString()).toBe("2026-06-09T03:00:00.000Z");
    const open = reviews.find((r) => r.status === "open")!;
    expect(open.title).toBe("Route 7, 16 June: tote 3 after the dock delay (demo)");
  });

  it("the demo's signed review reproduces when re-checked, and the probe test shows as never reviewed", async () => {
    const { listReviews } = await import("@/lib/db/reviews");
    const { recheckReview } = await import("@/lib/services/recheck");
    const { unreviewedTraces } = await import("@/lib/db/traces");
    const signed = (await listReviews({ status: "signed" }))[0]!;
    expect(await recheckReview(signed.id)).toMatchObject({ ok: true, check: { reproduced: true } });
    expect((await unreviewedTraces()).rows.map((t) => t.name)).toEqual(["Probe test, tray with simulant (demo)"]);
  });
});
