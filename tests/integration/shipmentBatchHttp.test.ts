// The batch upload route over real HTTP against `next start` (issue 15): a .zip with a good and a refused
// file, previewed (nothing stored) then stored as confirmed; bad requests refused by name with nothing stored.
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { zipSync } from "fflate";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startServer, type RunningServer } from "../helpers/server";
import { loggerCsv, LIMITS, TRAY } from "../fixtures/shipment";
import { TEST_ACTOR, seedAccounts, signedInFetch } from "../helpers/accounts";

/** Every request as the signed-in test reviewer (issue 13: pages and routes need a session). */
const fetch = signedInFetch("reviewer");

const dir = mkdtempSync(path.join(tmpdir(), "corelag-batch-http-"));
const url = `file:${path.join(dir, "batch.db")}`;
process.env.DATABASE_URL = url;
let server: RunningServer;
let shipmentId = "";
let entries: string[] = [];

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
  seedAccounts(url);
  const { createDefinition } = await import("@/lib/db/definitions");
  const { createShipmentFromForm } = await import("@/lib/services/shipments");
  const { getShipment } = await import("@/lib/db/shipments");
  const limitsId = (await createDefinition("limits", LIMITS, TEST_ACTOR)).id;
  const productId = (await createDefinition("product", TRAY, TEST_ACTOR)).id;
  const r = await createShipmentFromForm({ reference: "HTTP-1", limitsId }, [
    { position: "front", serial: "SN-1001", products: [{ productId }] },
    { position: "rear", fileNamePattern: "rear*.csv", products: [{ productId }] },
  ], TEST_ACTOR);
  if (!r.ok) throw new Error(r.message);
  shipmentId = r.shipmentId;
  entries = (await getShipment(shipmentId))!.loggers.map((l) => l.id);
  server = await startServer({ DATABASE_URL: url });
}, 120_000);

afterAll(async () => {
  await server?.stop();
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

function form(files: Array<{ name: string; bytes: Uint8Array }>, request: unknown): FormData {
  const f = new FormData();
  for (const x of files) f.append("files", new Blob([new Uint8Array(x.bytes)]), x.name);
  f.append("request", JSON.stringify(request));
  return f;
}

const bad = loggerCsv(5).split("\n").map((l, i) => (i === 5 ? l.replace(/,3\.0$/, ",warm") : l)).join("\n");
const zip = zipSync({ "front.csv": new TextEncoder().encode(loggerCsv(1)), "rear-top.csv": new TextEncoder().encode(bad) });

describe("POST /api/shipments/[id]/batch", () => {
  it("previews a zip without storing, then stores the good file and names the refused one", async () => {
    const { db } = await import("@/lib/db/client");
    const files = [{ name: "load.zip", bytes: zip }];
    const p = await fetch(`${server.url}/api/shipments/${shipmentId}/batch?mode=preview`, { method: "POST", body: form(files, {}) });
    expect(p.status).toBe(200);
    const preview = (await p.json()) as { rows: Array<{ file: string; ok: boolean; serial: string | null; refusal?: { row: number; column: string }; match: { target: string | null; by: string | null } }> };
    expect(preview.rows.map((r) => [r.file, r.ok, r.match.by])).toEqual([["front.csv", true, "serial"], ["rear-top.csv", false, "file-name"]]);
    expect(preview.rows[1]!.refusal).toMatchObject({ row: 6, column: "Air (°C)" });
    expect(await db.trace.count()).toBe(0);

    const s = await fetch(`${server.url}/api/shipments/${shipmentId}/batch?mode=store`, {
      method: "POST",
      body: form(files, { matches: [{ file: "front.csv", shipmentLoggerId: entries[0] }, { file: "rear-top.csv", shipmentLoggerId: entries[1] }], register: [{ serial: "SN-1001", accuracyK: 0.25 }] }),
    });
    expect(s.status).toBe(200);
    const stored = (await s.json()) as { stored: Array<{ file: string }>; refused: Array<{ file: string; row: number }>; registered: string[] };
    expect(stored.stored.map((x) => x.file)).toEqual(["front.csv"]);
    expect(stored.refused).toEqual([expect.objectContaining({ file: "rear-top.csv", row: 6 })]);
    expect(stored.registered).toEqual(["SN-1001"]);
    expect(await db.trace.count()).toBe(1);
    expect((await db.logger.findUnique({ where: { serial: "SN-1001" } }))!.accuracyK).toBe(0.25);
  });

  it("refuses a bad mode, no files, a foreign logger entry and an unreadable zip, storing nothing", async () => {
    const { db } = await import("@/lib/db/client");
    const before = await db.trace.count();
    const post = (mode: string, body: FormData) => fetch(`${server.url}/api/shipments/${shipmentId}/batch?mode=${mode}`, { method: "POST", body });
    const r1 = await post("keep", form([{ name: "a.csv", bytes: new Uint8Array([1]) }], {}));
    expect(r1.status).toBe(400);
    expect((await r1.json()).error).toBe("mode must be preview or store");
    const r2 = await post("preview", form([], {}));
    expect((await r2.json()).error).toMatch(/drop at least one logger file/);
    const r3 = await post("store", form([{ name: "front.csv", bytes: new TextEncoder().encode(loggerCsv(1)) }], { matches: [{ file: "front.csv", shipmentLoggerId: "not-an-entry" }] }));
    expect(r3.status).toBe(422);
    expect((await r3.json()).error).toMatch(/front\.csv: logger entry not-an-entry is not part of this shipment/);
    const r4 = await post("preview", form([{ name: "x.zip", bytes: new Uint8Array([80, 75, 3, 4, 0]) }], {}));
    expect(r4.status).toBe(422);
    expect((await r4.json()).error).toMatch(/x\.zip: not a readable \.zip archive/);
    expect(await db.trace.count()).toBe(before);
  });
});
