// Shipments through the real services on a real SQLite file (issue 15): batch import of a folder and of a
// zip with good and refused files, matching by serial and by file name, the logger register's accuracy
// in the guard band, an overdue calibration capping the outcome, the shipment review in the engine pool,
// and the one sign-off. Data: the invented 8-logger load of tests/fixtures/shipment.ts.
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync, mkdirSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { zipSync } from "fflate";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { loggerCsv, LIMITS, TRAY, CUP } from "../fixtures/shipment";
import { testDatabaseUrl } from "../helpers/database";
import { TEST_ACTOR } from "../helpers/accounts";
import type { Actor } from "../../lib/access/actor";

const dir = mkdtempSync(path.join(tmpdir(), "corelag-ship-int-"));
const url = testDatabaseUrl(dir, "ship.db");
process.env.DATABASE_URL = url;

const ids = { limits: "", tray: "", cup: "" };

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(url);
  const { createDefinition } = await import("@/lib/db/definitions");
  ids.limits = (await createDefinition("limits", LIMITS, TEST_ACTOR)).id;
  ids.tray = (await createDefinition("product", TRAY, TEST_ACTOR)).id;
  ids.cup = (await createDefinition("product", CUP, TEST_ACTOR)).id;
  // on PostgreSQL a shipment run is a job in the database's queue: this process takes jobs as a server would
  const { startRunWorkers } = await import("@/lib/services/runs");
  await startRunWorkers();
});

afterAll(async () => {
  const { dbKind } = await import("@/lib/db/client");
  if (dbKind() === "postgres") await (await import("@/lib/db/jobQueue")).stopJobQueue();
  const { closeEnginePool } = await import("@/lib/services/enginePool");
  await closeEnginePool();
  const { db } = await import("@/lib/db/client");
  await db.$disconnect();
  rmSync(dir, { recursive: true, force: true });
});

/** A folder of logger files: two with registered-style serials, one matched by its name, one refused. */
function writeFolder(folder: string): void {
  mkdirSync(folder, { recursive: true });
  writeFileSync(path.join(folder, "a.csv"), loggerCsv(1)); // serial SN-1001
  writeFileSync(path.join(folder, "b.csv"), loggerCsv(2)); // serial SN-1002
  writeFileSync(path.join(folder, "truck-middle-top.csv"), loggerCsv(3, { serial: "SN-9999" })); // a serial no entry names
  // row 6 holds a reading that is not a number: refused, naming row and column
  const bad = loggerCsv(5).split("\n");
  bad[5] = bad[5]!.replace(/,3\.0$/, ",warm");
  writeFileSync(path.join(folder, "rear-top.csv"), bad.join("\n"));
}

async function newShipment(reference: string): Promise<string> {
  const { createShipmentFromForm } = await import("@/lib/services/shipments");
  const r = await createShipmentFromForm(
    { reference, newLaneName: "North depot → City store", newLaneOrigin: "North depot", newLaneDestination: "City store", limitsId: ids.limits, actualDepartureAt: "2026-06-16T04:00:00Z" },
    [
      { position: "front top", serial: "SN-1001", products: [{ productId: ids.tray }, { productId: ids.cup }] },
      { position: "front bottom", serial: "SN-1002", products: [{ productId: ids.tray }, { productId: ids.cup, governing: true }] },
      { position: "middle top", fileNamePattern: "*middle-top*.csv", products: [{ productId: ids.tray }] },
      { position: "rear top", fileNamePattern: "rear-*.csv", products: [{ productId: ids.tray }] },
    ],
    TEST_ACTOR,
  );
  if (!r.ok) throw new Error(r.message);
  return r.shipmentId;
}

const filesOf = (folder: string) => readdirSync(folder).sort().map((name) => ({ name, bytes: new Uint8Array(readFileSync(path.join(folder, name))) }));

describe("batch import onto a shipment", () => {
  it("a folder: preview with matching by serial and by file name; good files stored, the refused one named and stored nothing", async () => {
    const { previewBatch, storeBatch } = await import("@/lib/services/batch");
    const { getShipment } = await import("@/lib/db/shipments");
    const { db } = await import("@/lib/db/client");
    const shipmentId = await newShipment("FOLDER-1");
    const shipment = (await getShipment(shipmentId))!;
    const entry = (pos: string) => shipment.loggers.find((l) => l.position === pos)!.id;
    const folder = path.join(dir, "folder");
    writeFolder(folder);
    const files = filesOf(folder);

    const preview = await previewBatch(shipmentId, files);
    if ("error" in preview) throw new Error(preview.error);
    const row = (f: string) => preview.rows.find((r) => r.file === f)!;
    expect(row("a.csv")).toMatchObject({ ok: true, serial: "SN-1001", samples: 361, start: "2026-06-16T04:00:00.000Z", end: "2026-06-16T16:00:00.000Z", match: { target: entry("front top"), by: "serial" }, unregistered: true });
    expect(row("b.csv").match).toEqual({ file: "b.csv", target: entry("front bottom"), by: "serial" });
    expect(row("truck-middle-top.csv").match).toEqual({ file: "truck-middle-top.csv", target: entry("middle top"), by: "file-name" });
    expect(row("rear-top.csv")).toMatchObject({ ok: false, match: { target: entry("rear top"), by: "file-name" } });
    // the fifth data row: metadata lines 1–3 and the header on line 4, so the file's line 6
    expect(row("rear-top.csv").refusal).toMatchObject({ row: 6, column: "Air (°C)" });
    expect(row("a.csv").channels!.map((c) => c.role)).toEqual(["air"]);

    const tracesBefore = await db.trace.count();
    const auditBefore = await db.auditEntry.count();
    const stored = await storeBatch(shipmentId, files, {
      matches: preview.rows.map((r) => ({ file: r.file, shipmentLoggerId: r.match.target })),
      register: [{ serial: "SN-1001", accuracyK: 0.2 }, { serial: "SN-1002", accuracyK: 0.2 }, { serial: "SN-9999", accuracyK: 0.5 }],
    }, TEST_ACTOR);
    if (!stored.ok) throw new Error(stored.message);
    expect(stored.result.stored.map((s) => s.file).sort()).toEqual(["a.csv", "b.csv", "truck-middle-top.csv"]);
    expect(stored.result.refused).toEqual([expect.objectContaining({ file: "rear-top.csv", row: 6, column: "Air (°C)" })]);
    expect(stored.result.registered.sort()).toEqual(["SN-1001", "SN-1002", "SN-9999"]);
    expect(await db.trace.count()).toBe(tracesBefore + 3);
    expect(await db.trace.count({ where: { fileName: "rear-top.csv" } })).toBe(0);
    // nothing in the audit log names the refused file
    const entries = await db.auditEntry.findMany({ where: { seq: { gt: auditBefore } } });
    expect(entries.some((e) => JSON.stringify(e.details).includes("rear-top.csv"))).toBe(false);
    const after = (await getShipment(shipmentId))!;
    expect(after.loggers.map((l) => l.traceId !== null)).toEqual([true, true, true, false]);
  });

  it("a zip: the same, unzipped with size limits; a file matched by name is stored", async () => {
    const { previewBatch, storeBatch, expandUploads, BatchError } = await import("@/lib/services/batch");
    const { db } = await import("@/lib/db/client");
    const shipmentId = await newShipment("ZIP-1");
    const folder = path.join(dir, "folder");
    const good = loggerCsv(5, { serial: "SN-1005" });
    const zip = zipSync({
      "load/a.csv": new TextEncoder().encode(loggerCsv(1)),
      "load/b.csv": new TextEncoder().encode(loggerCsv(2)),
      "load/bad/truck-middle-top.csv": new Uint8Array(readFileSync(path.join(folder, "rear-top.csv"))), // refused, matched by name
      "load/rear-2.csv": new TextEncoder().encode(good),
      "__MACOSX/load/._a.csv": new Uint8Array([0, 1, 2]),
    });
    const files = [{ name: "load.zip", bytes: zip }];
    expect(expandUploads(files).map((f) => f.name).sort()).toEqual(["a.csv", "b.csv", "rear-2.csv", "truck-middle-top.csv"]);
    expect(() => expandUploads([{ name: "x.zip", bytes: new Uint8Array([1, 2, 3]) }])).toThrow(BatchError);
    const preview = await previewBatch(shipmentId, files);
    if ("error" in preview) throw new Error(preview.error);
    // SN-1001 and SN-1002 are registered by now (first test); SN-1005 is not
    expect(preview.rows.find((r) => r.file === "a.csv")!.unregistered).toBe(false);
    expect(preview.rows.find((r) => r.file === "rear-2.csv")).toMatchObject({ ok: true, serial: "SN-1005", unregistered: true, match: { by: "file-name" } });
    const before = await db.trace.count();
    // without the accuracy of the new serial, its file is refused (asked once), the others are stored
    const first = await storeBatch(shipmentId, files, { matches: preview.rows.map((r) => ({ file: r.file, shipmentLoggerId: r.match.target })) }, TEST_ACTOR);
    if (!first.ok) throw new Error(first.message);
    expect(first.result.refused.map((r) => r.file).sort()).toEqual(["rear-2.csv", "truck-middle-top.csv"]);
    expect(first.result.refused.find((r) => r.file === "rear-2.csv")!.message).toMatch(/SN-1005 is not in the logger register/);
    expect(await db.trace.count()).toBe(before + 2);
  });

  it("a setting fixed for one file applies to that file only; one fixed for all applies to every file", async () => {
    const { previewBatch } = await import("@/lib/services/batch");
    const shipmentId = await newShipment("SETTINGS-1");
    // no unit in the header: °C unless told; the second file is in °F
    const csv = (v: string) => `Time,Air\n2026-06-16T04:00:00Z,${v}\n2026-06-16T04:02:00Z,${v}\n2026-06-16T04:04:00Z,${v}\n`;
    const files = [{ name: "c.csv", bytes: new TextEncoder().encode(csv("3.0")) }, { name: "f.csv", bytes: new TextEncoder().encode(csv("37.4")) }];
    const one = await previewBatch(shipmentId, files, { perFile: { "f.csv": { unit: "F" } } });
    if ("error" in one) throw new Error(one.error);
    expect(one.rows.map((r) => r.settings!.airUnit)).toEqual(["C", "F"]);
    const all = await previewBatch(shipmentId, files, { all: { timeZone: "Europe/Lisbon" }, perFile: { "f.csv": { unit: "F" } } });
    if ("error" in all) throw new Error(all.error);
    expect(all.rows.map((r) => [r.settings!.timeZone, r.settings!.airUnit])).toEqual([["Europe/Lisbon", "C"], ["Europe/Lisbon", "F"]]);
  });

  it("refuses a zip that would unpack beyond the limit before inflating it", async () => {
    const { expandUploads, MAX_ZIP_ENTRY_BYTES } = await import("@/lib/services/batch");
    // 51 MB of zeros compresses to about 50 kB
    const zip = zipSync({ "big.csv": new Uint8Array(MAX_ZIP_ENTRY_BYTES + 1024 * 1024) });
    expect(() => expandUploads([{ name: "bomb.zip", bytes: zip }])).toThrow(/unpacks to 51 MB; at most 50 MB per file/);
  });
});

async function waitRun(id: string) {
  const { waitForRun } = await import("@/lib/services/runs");
  const r = await waitForRun(id, 120_000);
  if (r?.status !== "done") throw new Error(`run ${r?.status}: ${r?.message}`);
  return r;
}

describe("logger register in a shipment review", () => {
  it("the register's accuracy is the guard band; an overdue calibration makes the outcome at best hold; one sign-off signs all", async () => {
    const { createShipmentFromForm, registerLogger, startShipmentReview, signOffShipment } = await import("@/lib/services/shipments");
    const { storeBatch } = await import("@/lib/services/batch");
    const { getShipment } = await import("@/lib/db/shipments");
    const { getReview } = await import("@/lib/db/reviews");
    // logger 6: 30 min at 6 °C, far inside every limit: accept, unless the calibration is overdue
    expect((await registerLogger({ serial: "SN-1006", description: "rear bottom", accuracyK: 0.4, lastCalibrationAt: "2025-05-01T00:00Z", nextCalibrationAt: "2026-06-01T00:00Z" }, TEST_ACTOR)).ok).toBe(true);
    expect((await registerLogger({ serial: "SN-1007", description: "tote 7", accuracyK: 0.3, nextCalibrationAt: "2027-01-01T00:00Z" }, TEST_ACTOR)).ok).toBe(true);
    const made = await createShipmentFromForm({ reference: "REG-1", limitsId: ids.limits, actualDepartureAt: "2026-06-16T04:00Z" }, [
      { position: "rear bottom", serial: "SN-1006", products: [{ productId: ids.tray }] },
      { position: "tote 7", serial: "SN-1007", products: [{ productId: ids.tray }] },
    ], TEST_ACTOR);
    if (!made.ok) throw new Error(made.message);
    const s = (await getShipment(made.shipmentId))!;
    const stored = await storeBatch(made.shipmentId, [{ name: "l6.csv", bytes: new TextEncoder().encode(loggerCsv(6)) }, { name: "l7.csv", bytes: new TextEncoder().encode(loggerCsv(7)) }], {
      matches: [{ file: "l6.csv", shipmentLoggerId: s.loggers[0]!.id }, { file: "l7.csv", shipmentLoggerId: s.loggers[1]!.id }],
    }, TEST_ACTOR);
    expect(stored.ok && stored.result.stored.length).toBe(2);

    const started = await startShipmentReview(made.shipmentId, TEST_ACTOR);
    if (!started.ok) throw new Error(started.message);
    const run = await waitRun(started.run.id);
    expect(run).toMatchObject({ done: 2, total: 2, progress: 1, kind: "shipment" });
    const after = (await getShipment(made.shipmentId))!;
    expect(after.reviews).toHaveLength(2);
    const r6 = (await getReview(after.reviews[0]!.reviewId))!;
    const r7 = (await getReview(after.reviews[1]!.reviewId))!;
    // the limit set states no accuracy: every rule's guard band is the register's accuracy
    expect(r6.result.rules.map((r) => r.guard_K)).toEqual([0.4, 0.4, 0.4]);
    expect(r7.result.rules.map((r) => r.guard_K)).toEqual([0.3, 0.3, 0.3]);
    // every rule passes on both, but SN-1006 was due on 2026-06-01, before the departure on 2026-06-16
    expect(r6.result.rules.every((r) => r.status === "pass")).toBe(true);
    expect(r6.outcome).toBe("hold");
    expect(r6.result.cautions.some((c) => c.includes("SN-1006 was due for calibration on 2026-06-01"))).toBe(true);
    expect(r7.outcome).toBe("accept");
    expect(after.outcome).toBe("hold");

    // a decision other than the suggestion needs a comment; then one sign-off signs the shipment and both reviews
    // the signature is a signed-in person re-entering their password (issue 13): a script, a wrong password
    // or a decision other than the suggestion without a comment signs nothing
    const { addUser } = await import("@/lib/services/users");
    const added = await addUser({ email: "dana@example.com", name: "Dana Reviewer", role: "reviewer", password: "dana-password-789" }, TEST_ACTOR);
    if (!added.ok) throw new Error(added.message);
    const dana: Actor = { kind: "user", userId: added.user.id, name: added.user.name, email: added.user.email, role: "reviewer" };
    expect(await signOffShipment(made.shipmentId, { decision: "hold", comment: "recalibrate SN-1006", password: "dana-password-789" }, TEST_ACTOR)).toMatchObject({ ok: false, reason: "not-a-user" });
    expect(await signOffShipment(made.shipmentId, { decision: "hold", comment: "recalibrate SN-1006", password: "not-her-password" }, dana)).toMatchObject({ ok: false, reason: "password" });
    expect(await signOffShipment(made.shipmentId, { decision: "accept", password: "dana-password-789" }, dana)).toMatchObject({ ok: false, reason: "comment-required" });
    expect((await getShipment(made.shipmentId))!.status).toBe("open");
    expect(await signOffShipment(made.shipmentId, { decision: "hold", comment: "recalibrate SN-1006", password: "dana-password-789" }, dana)).toEqual({ ok: true });
    const signed = (await getShipment(made.shipmentId))!;
    expect(signed).toMatchObject({ status: "signed", decision: "hold", signedBy: "Dana Reviewer" });
    expect(signed.signMeaning).toContain("Held");
    for (const l of signed.reviews) expect(l.review).toMatchObject({ status: "signed", decision: "hold" });
    // each review was re-checked before it was signed, and the re-check is in the audit log
    const { lastAuditEntry } = await import("@/lib/db/auditQueries");
    for (const l of signed.reviews) expect((await lastAuditEntry(l.reviewId, "verify"))?.details).toMatchObject({ reproduced: true });
    // the database keeps it final
    const { db } = await import("@/lib/db/client");
    await expect(db.shipment.update({ where: { id: made.shipmentId }, data: { notes: "changed" } })).rejects.toThrow();
    await expect(db.shipmentReview.deleteMany({ where: { shipmentId: made.shipmentId } })).rejects.toThrow();
    expect((await getShipment(made.shipmentId))!.notes).toBeNull();
    // the stored reviews reproduce (the logger option is part of their stored options)
    const { verifyStoredReview } = await import("@/lib/services/reviews");
    expect((await verifyStoredReview(r6.id)).reproduced).toBe(true);
  });
});

describe("verify covers the shipment tables", () => {
  it("every shipment, logger entry, link, lane and register row matches its audit entry; a row changed behind the app's back is found", async () => {
    const { checkStoredRecords } = await import("@/lib/services/verify");
    const clean = await checkStoredRecords({ storageChecks: false });
    expect(clean.findings).toEqual([]);
    expect(clean.snapshot.shipmentRows!.map((r) => r.table)).toEqual(expect.arrayContaining(["Lane", "Logger", "Shipment", "ShipmentLogger", "ShipmentReview"]));
    // an open shipment's logger entry moved to another position with plain SQL (no audit entry)
    const { db } = await import("@/lib/db/client");
    const id = (await db.$queryRawUnsafe<Array<{ id: string }>>(`SELECT "id" FROM "ShipmentLogger" WHERE "position" = 'rear top' LIMIT 1`))[0]!.id;
    await db.$executeRawUnsafe(`UPDATE "ShipmentLogger" SET "position" = 'front top' WHERE "id" = '${id}'`);
    await db.$executeRawUnsafe(`UPDATE "Logger" SET "accuracyK" = 5 WHERE "serial" = 'SN-1006'`);
    const after = await checkStoredRecords({ storageChecks: false });
    expect(after.findings.map((f) => [f.kind, f.table, f.row ?? null])).toEqual(expect.arrayContaining([
      ["row-altered", "ShipmentLogger", id],
      ["row-altered", "Logger", expect.any(String)],
    ]));
    expect(after.findings).toHaveLength(2);
  });
});
