import { describe, it, expect, beforeAll, afterAll } from "vitest";
import { chmodSync, copyFileSync, mkdtempSync, readFileSync, rmSync, writeFileSync, openSync, writeSync, closeSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { execFile } from "node:child_process";
import { promisify } from "node:util";
import { createPrivateKey, generateKeyPairSync } from "node:crypto";
import Database from "better-sqlite3";
import { auditHash, GENESIS_HASH } from "@/lib/review/audit";
import { definitionContentHash, reviewContentHash, traceContentHash } from "@/lib/review/content";
import { keyFingerprint, publicKeyText, signEntry } from "@/lib/review/signature";
import { resultHash } from "@/lib/review/canonical";
import { runReview } from "@/lib/review";
import { importCsv } from "@/lib/trace";
import { sha256Hex } from "@/lib/trace/hash";
import { TEST_ACTOR } from "../helpers/accounts";

// The tamper suite (issue 12): each manipulation is made with raw SQL on a copy of a real SQLite file
// holding the demo data (plus one signed review and a second, open one), the way someone with the file
// and the sqlite3 command line would make it: dropping a trigger where one refuses, and recomputing
// hashes as a careful forger who has read the source would. `corelag verify` (a real subprocess) must
// report each with the right kind and exit 1, never 3.
const dir = mkdtempSync(path.join(tmpdir(), "corelag-tamper-"));
const base = path.join(dir, "base.db");
process.env.DATABASE_URL = `file:${base}`;
const ROOT = path.resolve(__dirname, "../..");
const run = promisify(execFile);

let ids: { signedReview: string; openReview: string; shipmentReview: string; demoTrace: string; product: string; limits: string; profile: string };

beforeAll(async () => {
  const { migrateDatabase } = await import("@/lib/db/migrate");
  migrateDatabase(`file:${base}`);
  // as npm start: the demo accounts first (the demo monitor's device token belongs to the first administrator)
  const { createDemoAccounts } = await import("@/lib/services/users");
  await createDemoAccounts(TEST_ACTOR);
  const { loadDemoIfEmpty } = await import("@/lib/services/demo");
  await loadDemoIfEmpty();
  const { db } = await import("@/lib/db/client");
  // the demo's open review (16 June, suggests reject) is signed here; the demo's own signed review stays as it is
  const first = (await db.review.findFirst({ where: { status: "open" }, orderBy: { createdAt: "asc" } }))!;
  const { signOff, runAndStoreReview } = await import("@/lib/services/reviews");
  const signed = await signOff(first.id, { reviewer: "Dana Ruiz", decision: "reject", comment: "core above 5 °C for too long" }, TEST_ACTOR);
  if (!signed.ok) throw new Error(signed.message);
  const second = await runAndStoreReview({ title: "Route 7, lumped check", traceId: first.traceId, productId: first.productId, limitsId: first.limitsId, model: "lumped" }, TEST_ACTOR);
  if (!second.ok) throw new Error(second.message);
  const profile = (await db.definition.findFirst({ where: { kind: "profile" }, orderBy: { createdAt: "desc" } }))!;
  // the demo shipment's review of the same trace (lib/services/demo.ts): a forger must re-run it too
  const shipmentReview = (await db.shipmentReview.findFirstOrThrow()).reviewId;
  ids = { signedReview: first.id, openReview: second.reviewId, shipmentReview, demoTrace: first.traceId, product: first.productId, limits: first.limitsId, profile: profile.id };
  await db.$disconnect();
}, 120_000);

afterAll(() => rmSync(dir, { recursive: true, force: true }));

let copies = 0;
/** A copy of the demo database with its key file beside it. */
function copyOfDemo(): string {
  const file = path.join(dir, `case-${++copies}.db`);
  copyFileSync(base, file);
  copyFileSync(`${base}.key`, `${file}.key`);
  chmodSync(`${file}.key`, 0o600);
  return file;
}

function sql<T>(file: string, fn: (d: Database.Database) => T): T {
  const d = new Database(file);
  try {
    return fn(d);
  } finally {
    d.close();
  }
}

interface Finding { kind: string; table?: string; row?: string; entry?: number; message: string }
interface Report { ok: boolean; findings: Finding[]; head: { seq: number; hash: string; key_fingerprint: string | null } | null }

async function corelag(file: string, ...args: string[]): Promise<{ code: number; out: string; err: string }> {
  try {
    // the bundled CLI, as users run it (tests/globalSetup.ts builds it)
    const r = await run(process.execPath, [path.join(ROOT, "dist/cli/corelag.mjs"), ...args], {
      cwd: ROOT,
      env: { ...process.env, DATABASE_URL: `file:${file}` },
      maxBuffer: 64 * 1024 * 1024,
    });
    return { code: 0, out: r.stdout, err: r.stderr };
  } catch (e) {
    const x = e as { code: number; stdout: string; stderr: string };
    return { code: x.code, out: x.stdout, err: x.stderr };
  }
}

async function verify(file: string, ...args: string[]): Promise<{ code: number; report: Report }> {
  const r = await corelag(file, "verify", "--json", ...args);
  if (r.code !== 0 && r.code !== 1) throw new Error(`verify exited ${r.code}: ${r.err}`);
  return { code: r.code, report: JSON.parse(r.out) as Report };
}

const kinds = (r: Report) => [...new Set(r.findings.map((f) => f.kind))].sort();

// ——— what a careful forger does, written from the source (lib/review/audit.ts, content.ts) ———

type RawEntry = { seq: number; at: string; action: string; entity: string; entityId: string; actor: string; details: string; prevHash: string; hash: string };

/** Re-hashes the whole chain from entry 1 after changes, renumbering if entries were removed; optionally re-signs with a key. */
function rehashChain(d: Database.Database, opts: { signWith?: ReturnType<typeof createPrivateKey> } = {}): void {
  d.exec(`DROP TRIGGER IF EXISTS "AuditEntry_no_update"; DROP TRIGGER IF EXISTS "AuditEntry_no_delete"; DROP TRIGGER IF EXISTS "AuditSignature_no_update"; DROP TRIGGER IF EXISTS "AuditSignature_no_delete";`);
  const rows = d.prepare(`SELECT * FROM "AuditEntry" ORDER BY "seq"`).all() as RawEntry[];
  d.exec(`DELETE FROM "AuditEntry"`);
  if (opts.signWith) d.exec(`DELETE FROM "AuditSignature"`);
  let prev = GENESIS_HASH;
  const insert = d.prepare(`INSERT INTO "AuditEntry" ("seq","at","action","entity","entityId","actor","details","prevHash","hash") VALUES (?,?,?,?,?,?,?,?,?)`);
  rows.forEach((r, i) => {
    const seq = i + 1;
    const fields = { seq, at: new Date(r.at), action: r.action, entity: r.entity, entityId: r.entityId, actor: r.actor, details: JSON.parse(r.details) as unknown, prevHash: prev };
    const hash = auditHash(fields);
    insert.run(seq, r.at, r.action, r.entity, r.entityId, r.actor, r.details, prev, hash);
    if (opts.signWith) {
      d.prepare(`INSERT INTO "AuditSignature" ("seq","keyFingerprint","signature") VALUES (?,?,?)`).run(seq, keyFingerprint(opts.signWith), signEntry(opts.signWith, seq, hash));
    }
    prev = hash;
  });
}

/** Rewrites one entry's details (JSON) in place. */
function editDetails(d: Database.Database, seq: number, edit: (x: Record<string, unknown>) => void): void {
  d.exec(`DROP TRIGGER IF EXISTS "AuditEntry_no_update"`);
  const row = d.prepare(`SELECT "details" FROM "AuditEntry" WHERE "seq" = ?`).get(seq) as { details: string };
  const x = JSON.parse(row.details) as Record<string, unknown>;
  edit(x);
  d.prepare(`UPDATE "AuditEntry" SET "details" = ? WHERE "seq" = ?`).run(JSON.stringify(x), seq);
}

const latestEntryOf = (d: Database.Database, entity: string, id: string) =>
  (d.prepare(`SELECT "seq" FROM "AuditEntry" WHERE "entity" = ? AND "entityId" = ? AND "action" IN ('create','edit','import','run','sign','rename','seal') ORDER BY "seq" DESC LIMIT 1`).get(entity, id) as { seq: number }).seq;

function rawReview(d: Database.Database, id: string) {
  const r = d.prepare(`SELECT * FROM "Review" WHERE "id" = ?`).get(id) as Record<string, unknown>;
  return { ...(r as never as Parameters<typeof reviewContentHash>[0]), options: JSON.parse(r.options as string), result: JSON.parse(r.result as string) } as Parameters<typeof reviewContentHash>[0];
}
function rawTrace(d: Database.Database, id: string) {
  const r = d.prepare(`SELECT * FROM "Trace" WHERE "id" = ?`).get(id) as Record<string, unknown>;
  return { ...(r as never as Parameters<typeof traceContentHash>[0]), importSettings: JSON.parse(r.importSettings as string), warnings: JSON.parse(r.warnings as string) } as Parameters<typeof traceContentHash>[0];
}

/** Points the latest entry of a row at the row's new content, as a forger who read content.ts would. */
function resealRow(d: Database.Database, entity: "trace" | "review" | "definition", id: string): void {
  const hash =
    entity === "trace" ? traceContentHash(rawTrace(d, id))
    : entity === "review" ? reviewContentHash(rawReview(d, id))
    : (() => {
        const r = d.prepare(`SELECT * FROM "Definition" WHERE "id" = ?`).get(id) as Record<string, unknown>;
        return definitionContentHash({ ...(r as never as Parameters<typeof definitionContentHash>[0]), body: JSON.parse(r.body as string) });
      })();
  editDetails(d, latestEntryOf(d, entity, id), (x) => {
    x.contentSha256 = hash;
  });
}

/** Byte offset of a table's or index's root page. */
function rootPageOffset(file: string, name: string): number {
  return sql(file, (d) => {
    const pageSize = d.prepare("PRAGMA page_size").pluck().get() as number;
    const root = d.prepare(`SELECT rootpage FROM sqlite_master WHERE name = ?`).pluck().get(name) as number;
    return (root - 1) * pageSize;
  });
}
function overwrite(file: string, offset: number, bytes: Buffer): void {
  const fd = openSync(file, "r+");
  writeSync(fd, bytes, 0, bytes.length, offset);
  closeSync(fd);
}

describe("verify on untouched demo data", () => {
  it("passes, exit 0, no findings, head signed by the installation's key", async () => {
    const file = copyOfDemo();
    const { code, report } = await verify(file);
    expect(report.findings).toEqual([]);
    expect(code).toBe(0);
    const keyFp = keyFingerprint(createPrivateKey(readFileSync(`${file}.key`, "utf8")));
    expect(report.head!.key_fingerprint).toBe(keyFp);
  });
});

describe("the database refuses what the application never does (triggers)", () => {
  const refused = (file: string, statement: string) => expect(() => sql(file, (d) => d.exec(statement))).toThrow();
  it("refuses updates and deletes of traces and definitions", () => {
    const file = copyOfDemo();
    refused(file, `UPDATE "Trace" SET "name" = 'x'`);
    refused(file, `DELETE FROM "Trace"`);
    refused(file, `UPDATE "Definition" SET "name" = 'x'`);
    refused(file, `DELETE FROM "Definition"`);
    refused(file, `UPDATE "AuditSignature" SET "signature" = 'x'`);
    refused(file, `DELETE FROM "AuditSignature"`);
  });
  it("lets an open review be renamed and signed once, and refuses everything else", () => {
    const file = copyOfDemo();
    refused(file, `UPDATE "Review" SET "outcome" = 'accept' WHERE "id" = '${ids.openReview}'`);
    refused(file, `UPDATE "Review" SET "result" = '{}' WHERE "id" = '${ids.openReview}'`);
    refused(file, `UPDATE "Review" SET "coreC" = x'00' WHERE "id" = '${ids.openReview}'`);
    refused(file, `UPDATE "Review" SET "decision" = 'accept' WHERE "id" = '${ids.openReview}'`);
    refused(file, `UPDATE "Review" SET "status" = 'signed' WHERE "id" = '${ids.openReview}'`);
    refused(file, `UPDATE "Review" SET "status" = 'open', "decision" = NULL, "signedBy" = NULL, "signedAt" = NULL WHERE "id" = '${ids.signedReview}'`);
    refused(file, `DELETE FROM "Review" WHERE "id" = '${ids.openReview}'`);
    sql(file, (d) => d.exec(`UPDATE "Review" SET "title" = 'renamed' WHERE "id" = '${ids.openReview}'`));
    sql(file, (d) => d.exec(`UPDATE "Review" SET "status" = 'signed', "decision" = 'hold', "signedBy" = 'A B', "signedAt" = '2026-12-01T10:00:00.000+00:00' WHERE "id" = '${ids.openReview}'`));
    refused(file, `UPDATE "Review" SET "decision" = 'accept' WHERE "id" = '${ids.openReview}'`);
  });
});

type Case = { name: string; expect: string[]; tamper: (file: string) => void };

const CASES: Case[] = [
  {
    name: "the review's result JSON changed (outcome and rule statuses)",
    expect: ["row-altered", "row-inconsistent"],
    tamper: (f) =>
      sql(f, (d) => {
        d.exec(`DROP TRIGGER "Review_stored_result_final"; DROP TRIGGER "Review_signed_final"; DROP TRIGGER "Review_status_transition"`);
        const r = JSON.parse((d.prepare(`SELECT "result" FROM "Review" WHERE "id" = ?`).pluck().get(ids.signedReview)) as string);
        r.outcome = "accept";
        for (const rule of r.rules) rule.status = "pass";
        d.prepare(`UPDATE "Review" SET "result" = ? WHERE "id" = ?`).run(JSON.stringify(r), ids.signedReview);
      }),
  },
  {
    name: "the outcome column changed",
    expect: ["row-altered", "row-inconsistent"],
    tamper: (f) => sql(f, (d) => d.exec(`DROP TRIGGER "Review_stored_result_final"; UPDATE "Review" SET "outcome" = 'accept' WHERE "id" = '${ids.openReview}'`)),
  },
  {
    name: "the stored core series overwritten",
    expect: ["row-altered"],
    tamper: (f) =>
      sql(f, (d) => {
        d.exec(`DROP TRIGGER "Review_stored_result_final"`);
        const core = new Float64Array((d.prepare(`SELECT "coreC" FROM "Review" WHERE "id" = ?`).pluck().get(ids.openReview) as Buffer).slice().buffer);
        for (let i = 0; i < core.length; i++) core[i] = Math.min(core[i]!, 4.5);
        d.prepare(`UPDATE "Review" SET "coreC" = ? WHERE "id" = ?`).run(Buffer.from(core.buffer), ids.openReview);
      }),
  },
  {
    name: "an audit entry edited and the chain re-hashed (without the key)",
    expect: ["signature-invalid"],
    tamper: (f) =>
      sql(f, (d) => {
        editDetails(d, 2, (x) => {
          x.fileName = "other.csv";
        });
        rehashChain(d);
      }),
  },
  {
    name: "a middle entry deleted and the chain re-hashed",
    expect: ["chain-broken", "row-unaudited", "signature-invalid"],
    tamper: (f) =>
      sql(f, (d) => {
        // the entry of the demo's limit set (the second definition; the demo accounts' entries come before it)
        d.exec(`DROP TRIGGER "AuditEntry_no_delete"; DELETE FROM "AuditEntry" WHERE "seq" = (SELECT "seq" FROM "AuditEntry" WHERE "entity" = 'definition' ORDER BY "seq" LIMIT 1 OFFSET 1)`);
        rehashChain(d);
      }),
  },
  {
    // the newest two entries are the sign-off of the first review and the run of the second
    name: "the last two entries deleted with their signatures",
    expect: ["row-altered", "row-unaudited"],
    tamper: (f) =>
      sql(f, (d) => {
        const last = d.prepare(`SELECT max("seq") FROM "AuditEntry"`).pluck().get() as number;
        d.exec(`DROP TRIGGER "AuditEntry_no_delete"; DROP TRIGGER "AuditSignature_no_delete"; DELETE FROM "AuditEntry" WHERE "seq" > ${last - 2}; DELETE FROM "AuditSignature" WHERE "seq" > ${last - 2}`);
      }),
  },
  {
    name: "a signed review's decision changed",
    expect: ["row-altered"],
    tamper: (f) => sql(f, (d) => d.exec(`DROP TRIGGER "Review_signed_final"; DROP TRIGGER "Review_status_transition"; UPDATE "Review" SET "decision" = 'accept' WHERE "id" = '${ids.signedReview}'`)),
  },
  {
    name: "a signed review's signer changed",
    expect: ["row-altered"],
    tamper: (f) => sql(f, (d) => d.exec(`DROP TRIGGER "Review_signed_final"; DROP TRIGGER "Review_status_transition"; UPDATE "Review" SET "signedBy" = 'Someone Else' WHERE "id" = '${ids.signedReview}'`)),
  },
  {
    name: "a signed review's comment changed",
    expect: ["row-altered"],
    tamper: (f) => sql(f, (d) => d.exec(`DROP TRIGGER "Review_signed_final"; DROP TRIGGER "Review_status_transition"; UPDATE "Review" SET "signComment" = 'fine' WHERE "id" = '${ids.signedReview}'`)),
  },
  {
    name: "a signed review reset to open",
    expect: ["row-altered"],
    tamper: (f) =>
      sql(f, (d) =>
        d.exec(`DROP TRIGGER "Review_signed_final"; DROP TRIGGER "Review_status_transition"; UPDATE "Review" SET "status" = 'open', "decision" = NULL, "signedBy" = NULL, "signedAt" = NULL, "signComment" = NULL, "signMeaning" = NULL WHERE "id" = '${ids.signedReview}'`),
      ),
  },
  {
    name: "a signed review deleted (after dropping its trigger)",
    expect: ["row-missing"],
    tamper: (f) =>
      sql(f, (d) => {
        d.exec(`PRAGMA foreign_keys = OFF; DROP TRIGGER "Review_no_delete"; DELETE FROM "Review" WHERE "id" = '${ids.signedReview}'`);
      }),
  },
  {
    name: "an un-audited signed review inserted",
    expect: ["row-unaudited"],
    tamper: (f) =>
      sql(f, (d) => {
        const cols = (d.prepare(`PRAGMA table_info("Review")`).all() as { name: string }[]).map((c) => `"${c.name}"`).filter((c) => c !== '"id"');
        d.exec(`INSERT INTO "Review" ("id", ${cols.join(",")}) SELECT 'forged-review', ${cols.join(",")} FROM "Review" WHERE "id" = '${ids.signedReview}'`);
      }),
  },
  {
    name: "a definition's body edited without updating its hash",
    expect: ["review-not-reproduced", "row-altered", "stored-hash-mismatch"],
    tamper: (f) =>
      sql(f, (d) => {
        const body = JSON.parse(d.prepare(`SELECT "body" FROM "Definition" WHERE "id" = ?`).pluck().get(ids.limits) as string);
        body.rules[0].threshold_C = 8;
        d.exec(`DROP TRIGGER "Definition_no_update"`);
        d.prepare(`UPDATE "Definition" SET "body" = ? WHERE "id" = ?`).run(JSON.stringify(body), ids.limits);
      }),
  },
  {
    name: "a definition's name edited",
    expect: ["row-altered"],
    tamper: (f) => sql(f, (d) => d.exec(`DROP TRIGGER "Definition_no_update"; UPDATE "Definition" SET "name" = 'Renamed' WHERE "id" = '${ids.product}'`)),
  },
  {
    name: "a trace row deleted with foreign keys off",
    expect: ["foreign-key-hole", "review-not-reproduced", "row-missing"],
    tamper: (f) => sql(f, (d) => d.exec(`PRAGMA foreign_keys = OFF; DROP TRIGGER "Trace_no_delete"; DELETE FROM "Trace" WHERE "id" = '${ids.demoTrace}'`)),
  },
  {
    name: "a signed review's decision changed, its entry's content hash recomputed, the chain re-hashed (no key)",
    expect: ["signature-invalid"],
    tamper: (f) =>
      sql(f, (d) => {
        d.exec(`DROP TRIGGER "Review_signed_final"; DROP TRIGGER "Review_status_transition"; UPDATE "Review" SET "decision" = 'accept' WHERE "id" = '${ids.signedReview}'`);
        resealRow(d, "review", ids.signedReview);
        editDetails(d, latestEntryOf(d, "review", ids.signedReview), (x) => {
          x.decision = "accept";
        });
        rehashChain(d);
      }),
  },
];

describe("each manipulation is reported with its kind, exit 1", () => {
  for (const c of CASES) {
    it.concurrent(c.name, async () => {
      const file = copyOfDemo();
      c.tamper(file);
      const { code, report } = await verify(file);
      expect(kinds(report)).toEqual([...c.expect].sort());
      expect(code).toBe(1);
      for (const f of report.findings) expect(f.message.length).toBeGreaterThan(10);
    });
  }
});

describe("a full forgery (readings lowered, hashes and series recomputed, reviews re-run, decision changed)", () => {
  /** The demo file with every air reading 6 K lower, stored as if it had been uploaded so; returns the trace's new series. */
  function forge(file: string, opts: { rehash: boolean; signWith?: ReturnType<typeof createPrivateKey> }): void {
    sql(file, (d) => {
      d.exec(`DROP TRIGGER "Trace_no_update"; DROP TRIGGER "Review_stored_result_final"; DROP TRIGGER "Review_signed_final"; DROP TRIGGER "Review_status_transition"`);
      const t = rawTrace(d, ids.demoTrace);
      const text = Buffer.from(t.original!).toString("utf8");
      // lower every air reading (the second column of the data rows) by 6 K
      const lowered = text.replace(/^(\d{4}-[^,\n]+,)(-?\d+(?:\.\d+)?)/gm, (_m, head: string, v: string) => `${head}${(Number(v) - 6).toFixed(1)}`);
      expect(lowered).not.toBe(text);
      const bytes = Buffer.from(lowered, "utf8");
      const imp = importCsv(bytes);
      const f64 = (a: Float64Array) => Buffer.from(a.buffer, a.byteOffset, a.byteLength);
      d.prepare(`UPDATE "Trace" SET "original" = ?, "sha256" = ?, "timesS" = ?, "airC" = ? WHERE "id" = ?`).run(bytes, sha256Hex(bytes), f64(imp.series.t_s), f64(imp.series.air_C), ids.demoTrace);
      for (const id of [ids.signedReview, ids.openReview, ids.shipmentReview]) {
        const r = rawReview(d, id);
        const def = (x: string) => JSON.parse(d.prepare(`SELECT "body" FROM "Definition" WHERE "id" = ?`).pluck().get(x) as string);
        const comp = runReview({ series: imp.series, product: def(r.productId), limits: def(r.limitsId), options: r.options as never, gapMultiple: imp.settings.gapMultiple });
        const hash = resultHash(comp.result, comp.core_C);
        d.prepare(`UPDATE "Review" SET "result" = ?, "outcome" = ?, "coreC" = ?, "surfaceC" = ?, "meanC" = ?, "resultSha256" = ? WHERE "id" = ?`).run(
          JSON.stringify(comp.result), comp.result.outcome, f64(comp.core_C), f64(comp.surface_C), f64(comp.mean_C), hash, id,
        );
        if (id === ids.signedReview) d.prepare(`UPDATE "Review" SET "decision" = ? WHERE "id" = ?`).run(comp.result.outcome, id);
      }
      expect(d.prepare(`SELECT "outcome" FROM "Review" WHERE "id" = ?`).pluck().get(ids.signedReview)).toBe("accept");
      if (opts.rehash) {
        // the careful forger also fixes the entries: the trace's hash, the run's result hash and outcome, the decision, every content hash
        resealRow(d, "trace", ids.demoTrace);
        editDetails(d, latestEntryOf(d, "trace", ids.demoTrace), (x) => {
          x.sha256 = sha256Hex(bytes);
        });
        for (const id of [ids.signedReview, ids.openReview, ids.shipmentReview]) resealRow(d, "review", id);
        rehashChain(d, opts);
      }
    });
  }

  it("without touching the chain: the rows no longer match their entries", async () => {
    const file = copyOfDemo();
    forge(file, { rehash: false });
    const { code, report } = await verify(file);
    expect(code).toBe(1);
    expect(report.findings.filter((f) => f.kind === "row-altered").map((f) => f.row).sort()).toEqual([ids.demoTrace, ids.signedReview, ids.openReview, ids.shipmentReview].sort());
  });

  it("with every entry fixed and the chain re-hashed, but without the key: the signatures fail", async () => {
    const file = copyOfDemo();
    forge(file, { rehash: true });
    const { code, report } = await verify(file);
    expect(code).toBe(1);
    expect(kinds(report)).toEqual(["signature-invalid"]);
  });

  it("re-signed with the forger's own key: the installation's key and the anchor both refuse it", async () => {
    const file = copyOfDemo();
    const anchor = (await corelag(file, "anchor")).out.trim();
    const mine = generateKeyPairSync("ed25519").privateKey;
    sql(file, (d) => {
      // the forger replaces the recorded key with their own
      d.exec(`DROP TRIGGER "AuditEntry_no_update"`);
      const k = d.prepare(`SELECT "seq" FROM "AuditEntry" WHERE "action" = 'key'`).pluck().get() as number;
      d.prepare(`UPDATE "AuditEntry" SET "entityId" = ?, "details" = ? WHERE "seq" = ?`).run(keyFingerprint(mine), JSON.stringify({ fingerprint: keyFingerprint(mine), publicKey: publicKeyText(mine), previous: null }), k);
    });
    forge(file, { rehash: true, signWith: mine });
    const { code, report } = await verify(file);
    expect(code).toBe(1);
    expect(kinds(report)).toEqual(["key-foreign"]);
    const anchored = await verify(file, "--anchor", anchor);
    expect(kinds(anchored.report)).toEqual(["anchor-foreign", "key-foreign"]);
  });

  it("re-signed with the installation's own key: passes (the key holder can rewrite; keep anchors elsewhere)", async () => {
    const file = copyOfDemo();
    const anchor = (await corelag(file, "anchor")).out.trim();
    forge(file, { rehash: true, signWith: createPrivateKey(readFileSync(`${file}.key`, "utf8")) });
    expect((await verify(file)).code).toBe(0);
    // …but an anchor taken before the rewrite no longer matches
    const anchored = await verify(file, "--anchor", anchor);
    expect(anchored.code).toBe(1);
    expect(kinds(anchored.report)).toEqual(["anchor-rewritten"]);
  });
});

describe("signed chain", () => {
  it("a key rotation is recorded in the chain, endorsed by the old key, and verifies across it", async () => {
    const file = copyOfDemo();
    const before = readFileSync(`${file}.key`, "utf8");
    const rot = await corelag(file, "key", "rotate");
    expect(rot.code).toBe(0);
    const out = JSON.parse(rot.out) as { from_key_fingerprint: string; key_fingerprint: string; entry: number };
    expect(out.from_key_fingerprint).toBe(keyFingerprint(createPrivateKey(before)));
    expect(readFileSync(`${file}.key`, "utf8")).not.toBe(before);
    // the rotation entry is signed by the outgoing key…
    const atRotation = JSON.parse((await corelag(file, "anchor")).out) as { key_fingerprint: string; seq: number };
    expect(atRotation).toMatchObject({ key_fingerprint: out.from_key_fingerprint, seq: out.entry });
    // …and the next write by the new one
    await run(process.execPath, [path.join(ROOT, "node_modules/tsx/dist/cli.mjs"), "-e", `require("./lib/db/definitions").createDefinition("product", { name: "after rotation" }, { kind: "system", what: "test" }).then(() => process.exit(0))`], { cwd: ROOT, env: { ...process.env, DATABASE_URL: `file:${file}` } });
    const afterWrite = JSON.parse((await corelag(file, "anchor")).out) as { key_fingerprint: string; seq: number };
    expect(afterWrite).toMatchObject({ key_fingerprint: out.key_fingerprint, seq: out.entry + 1 });
    const entry = sql(file, (d) => d.prepare(`SELECT * FROM "AuditEntry" WHERE "seq" = ?`).get(out.entry)) as RawEntry;
    expect(entry.action).toBe("key");
    expect(JSON.parse(entry.details)).toMatchObject({ fingerprint: out.key_fingerprint, previous: out.from_key_fingerprint });
    const { code, report } = await verify(file);
    expect(report.findings).toEqual([]);
    expect(code).toBe(0);
  });

  it("a rotation entry not endorsed by the key in force is refused", async () => {
    const file = copyOfDemo();
    const other = generateKeyPairSync("ed25519").privateKey;
    sql(file, (d) => {
      const last = d.prepare(`SELECT * FROM "AuditEntry" ORDER BY "seq" DESC LIMIT 1`).get() as RawEntry;
      const fields = { seq: last.seq + 1, at: new Date(), action: "key", entity: "key", entityId: keyFingerprint(other), actor: "cli", details: { fingerprint: keyFingerprint(other), publicKey: publicKeyText(other), previous: "0".repeat(64) }, prevHash: last.hash };
      const hash = auditHash(fields);
      d.prepare(`INSERT INTO "AuditEntry" VALUES (?,?,?,?,?,?,?,?,?)`).run(fields.seq, fields.at.toISOString(), "key", "key", fields.entityId, "cli", JSON.stringify(fields.details), last.hash, hash);
      d.prepare(`INSERT INTO "AuditSignature" VALUES (?,?,?)`).run(fields.seq, keyFingerprint(other), signEntry(other, fields.seq, hash));
    });
    const { code, report } = await verify(file);
    expect(code).toBe(1);
    expect(kinds(report)).toEqual(["key-foreign", "key-unendorsed", "signature-invalid"]);
  });

  it("a key that is not the chain's key cannot sign (here: rotate)", async () => {
    const file = copyOfDemo();
    writeFileSync(`${file}.key`, generateKeyPairSync("ed25519").privateKey.export({ format: "pem", type: "pkcs8" }), { mode: 0o600 });
    const r = await corelag(file, "key", "rotate");
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/^corelag key: the current key file is not the chain's key \([0-9a-f]{16}…\); rotation needs the key in force\n$/);
    expect((await verify(file)).report.findings.map((f) => f.kind)).toEqual(["key-foreign"]);
  });

  it("a key file readable by others is refused", async () => {
    const file = copyOfDemo();
    chmodSync(`${file}.key`, 0o644);
    const { report } = await verify(file);
    expect((report as unknown as { key: { note: string } }).key.note).toMatch(/readable by others \(mode 644\); run chmod 600/);
  });
});

describe("anchors", () => {
  it("prints one JSON line with seq, hash, time and key fingerprint; verify passes against it", async () => {
    const file = copyOfDemo();
    const r = await corelag(file, "anchor");
    expect(r.code).toBe(0);
    expect(r.out.trim().split("\n")).toHaveLength(1);
    const a = JSON.parse(r.out) as Record<string, unknown>;
    expect(Object.keys(a).sort()).toEqual(["anchored_at", "at", "chain", "hash", "key_fingerprint", "seq"]);
    const anchorFile = path.join(dir, "anchor.json");
    writeFileSync(anchorFile, r.out);
    const { code, report } = await verify(file, "--anchor", anchorFile);
    expect(report.findings).toEqual([]);
    expect(code).toBe(0);
  });

  it("truncation after the anchor is detected", async () => {
    const file = copyOfDemo();
    const anchor = (await corelag(file, "anchor")).out.trim();
    sql(file, (d) => {
      // remove the newest entry, its signature and the row it recorded, leaving a self-consistent shorter chain
      const last = d.prepare(`SELECT * FROM "AuditEntry" ORDER BY "seq" DESC LIMIT 1`).get() as RawEntry;
      expect(last.entity).toBe("review");
      d.exec(`DROP TRIGGER "AuditEntry_no_delete"; DROP TRIGGER "AuditSignature_no_delete"; DROP TRIGGER "Review_no_delete"`);
      d.prepare(`DELETE FROM "AuditEntry" WHERE "seq" = ?`).run(last.seq);
      d.prepare(`DELETE FROM "AuditSignature" WHERE "seq" = ?`).run(last.seq);
      d.prepare(`DELETE FROM "Review" WHERE "id" = ?`).run(last.entityId);
    });
    expect((await verify(file)).code).toBe(0); // the shorter chain is consistent in itself…
    const { code, report } = await verify(file, "--anchor", anchor);
    expect(code).toBe(1); // …but not with the anchor
    expect(kinds(report)).toEqual(["anchor-missing"]);
    expect(report.findings[0]!.message).toMatch(/^the anchor records entry \d+ .*but the chain ends at entry \d+: entries were removed$/);
  });

  it("anchor --post sends the same line to CORELAG_ANCHOR_WEBHOOK; a failing webhook exits 1 and still prints the line", async () => {
    const { createServer } = await import("node:http");
    const bodies: string[] = [];
    let status = 204;
    const server = createServer((req, res) => {
      let body = "";
      req.on("data", (c: Buffer) => (body += c.toString("utf8")));
      req.on("end", () => {
        bodies.push(`${req.method} ${req.headers["content-type"]} ${body}`);
        res.statusCode = status;
        res.end();
      });
    });
    await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
    const url = `http://127.0.0.1:${(server.address() as { port: number }).port}/anchors`;
    const file = copyOfDemo();
    try {
      process.env.CORELAG_ANCHOR_WEBHOOK = url;
      const ok = await corelag(file, "anchor", "--post");
      expect(ok.code).toBe(0);
      expect(bodies).toEqual([`POST application/json ${ok.out.trim()}`]);
      status = 500;
      const failed = await corelag(file, "anchor", "--post");
      expect(failed.code).toBe(1);
      expect(JSON.parse(failed.out)).toMatchObject({ seq: JSON.parse(ok.out).seq });
      expect(failed.err).toBe("corelag anchor: the webhook answered HTTP 500\n");
    } finally {
      delete process.env.CORELAG_ANCHOR_WEBHOOK;
      server.close();
    }
  });

  it("an empty chain has nothing to anchor", async () => {
    const empty = path.join(dir, "empty.db");
    const { migrateDatabase } = await import("@/lib/db/migrate");
    migrateDatabase(`file:${empty}`);
    const r = await corelag(empty, "anchor");
    expect(r.code).toBe(1);
    expect(r.err).toBe("corelag anchor: nothing to anchor: the audit chain is empty\n");
  });

  it("an anchor from another database is refused with a clear message", async () => {
    // another installation: the same demo loaded at another time, with its own key
    const other = path.join(dir, "other.db");
    const { migrateDatabase } = await import("@/lib/db/migrate");
    migrateDatabase(`file:${other}`);
    await run(process.execPath, [path.join(ROOT, "node_modules/tsx/dist/cli.mjs"), "-e", `require("./lib/services/users").createDemoAccounts({ kind: "system", what: "demo" }).then(() => require("./lib/services/demo").loadDemoIfEmpty()).then(() => process.exit(0))`], { cwd: ROOT, env: { ...process.env, DATABASE_URL: `file:${other}` } });
    const anchor = (await corelag(other, "anchor")).out.trim();
    const file = copyOfDemo();
    const { code, report } = await verify(file, "--anchor", anchor);
    expect(code).toBe(1);
    expect(kinds(report)).toEqual(["anchor-foreign"]);
    expect(report.findings[0]!.message).toMatch(/^this anchor belongs to another database: its chain begins with entry hash [0-9a-f]{16}…, this database's with [0-9a-f]{16}…/);
  });

  it("a database file that does not exist is bad input (exit 2), not an empty chain", async () => {
    const nowhere = path.join(dir, "nowhere.db");
    for (const cmd of [["verify"], ["anchor"], ["seal"]]) {
      const r = await corelag(nowhere, ...cmd);
      expect(r.code).toBe(2);
      expect(r.err).toBe(`corelag ${cmd[0]}: DATABASE_URL: there is no database at ${nowhere}; check the path (verify never creates one)\n`);
    }
  });

  it("a malformed anchor is a usage error (exit 2) naming the field", async () => {
    const file = copyOfDemo();
    const r = await corelag(file, "verify", "--anchor", JSON.stringify({ seq: 3, hash: "xyz" }));
    expect(r.code).toBe(2);
    expect(r.err).toBe("corelag verify: --anchor: field 'hash': must be 64 lowercase hex digits\n");
  });
});

describe("upgrading a database written before entries carried content hashes and signatures", () => {
  it("verify says the rows are unsealed and the chain unsigned; corelag seal records both once, and verify then passes", async () => {
    const file = copyOfDemo();
    // make it look like a database from before issue 12: no key entries, no signatures, no content hashes
    sql(file, (d) => {
      d.exec(`DROP TRIGGER "AuditEntry_no_delete"; DROP TRIGGER "AuditEntry_no_update"; DROP TRIGGER "AuditSignature_no_delete"`);
      d.exec(`DELETE FROM "AuditEntry" WHERE "action" = 'key'; DELETE FROM "AuditSignature"`);
      // only the tables of that time: shipments, lanes and the logger register (issue 15) came with content hashes,
      // and the demo's shipment rows keep theirs
      for (const e of d.prepare(`SELECT "seq", "details" FROM "AuditEntry" WHERE "entity" IN ('trace', 'definition', 'review')`).all() as { seq: number; details: string }[]) {
        const x = JSON.parse(e.details) as Record<string, unknown>;
        delete x.contentSha256;
        d.prepare(`UPDATE "AuditEntry" SET "details" = ? WHERE "seq" = ?`).run(JSON.stringify(x), e.seq);
      }
      rehashChain(d);
    });
    const before = await verify(file);
    expect(before.code).toBe(1);
    expect(kinds(before.report)).toEqual(["chain-unsigned", "row-unsealed"]);
    const rows = before.report.findings.filter((f) => f.kind === "row-unsealed").length;
    const sealed = await corelag(file, "seal");
    expect(sealed.code).toBe(0);
    expect(JSON.parse(sealed.out)).toEqual({ sealed: rows });
    const after = await verify(file);
    expect(after.report.findings).toEqual([]);
    expect(after.code).toBe(0);
    expect(JSON.parse((await corelag(file, "seal")).out)).toEqual({ sealed: 0 });
  });
});

describe("a damaged database file gives findings, exit 1, never 3", () => {
  it("a damaged index page: the integrity check reports it", async () => {
    const file = copyOfDemo();
    const off = rootPageOffset(file, "AuditEntry_hash_key");
    overwrite(file, off + 8, Buffer.alloc(64, 0xa5));
    const { code, report } = await verify(file);
    expect(code).toBe(1);
    expect(kinds(report)).toContain("storage-damaged");
  });

  it("bytes overwritten inside the audit table's page", async () => {
    const file = copyOfDemo();
    const off = rootPageOffset(file, "AuditEntry");
    overwrite(file, off, Buffer.alloc(512, 0xff));
    const { code, report } = await verify(file);
    expect(code).toBe(1);
    expect(kinds(report)).toEqual(expect.arrayContaining(["storage-damaged", "table-unreadable"]));
    expect(report.findings.find((f) => f.kind === "table-unreadable")!.table).toBe("AuditEntry");
  });

  it("bytes overwritten inside the trace table's page", async () => {
    const file = copyOfDemo();
    const off = rootPageOffset(file, "Trace");
    overwrite(file, off, Buffer.alloc(256, 0x00));
    const { code, report } = await verify(file);
    expect(code).toBe(1);
    expect(kinds(report)).toContain("storage-damaged");
  });

  it("a file that is not a database at all", async () => {
    const file = copyOfDemo();
    overwrite(file, 0, Buffer.from("this is not a database file, just text".padEnd(100, " ")));
    const { code, report } = await verify(file);
    expect(code).toBe(1);
    expect(kinds(report)).toContain("storage-damaged");
  });
});
