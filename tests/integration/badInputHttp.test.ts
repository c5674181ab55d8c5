import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { createRequire } from "node:module";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startServer, type RunningServer } from "../helpers/server";
import { utf16 } from "../helpers/encode";
import { seedAccounts, signInCookie } from "../helpers/accounts";

// Hostile uploads against `next start` (issue #9): each was an HTTP 500 with an empty body; each must
// be a 4xx whose message names what is wrong, with nothing stored.
const ROOT = path.resolve(__dirname, "..", "..");
// The test reads the server's database file directly (read-only) to see that nothing was stored.
type Sqlite = { prepare(sql: string): { get(): unknown }; close(): void };
const Database = createRequire(__filename)("better-sqlite3") as new (file: string, options: { readonly: boolean }) => Sqlite;
const dir = mkdtempSync(path.join(tmpdir(), "corelag-badhttp-"));
const dbFile = path.join(dir, "bad.db");
let server: RunningServer;
let cookie = "";
let storedAccountEntries = 0;

const CSV = "Time,Air\n2026-03-02T06:00:00Z,3.1\n2026-03-02T06:05:00Z,3.2\n";

async function upload(bytes: Uint8Array, fileName: string, options: unknown = {}): Promise<{ status: number; body: { error?: string; id?: string; field?: string } }> {
  const form = new FormData();
  form.append("file", new File([new Uint8Array(bytes)], fileName));
  form.append("name", "");
  form.append("options", JSON.stringify(options));
  const res = await fetch(`${server.url}/api/traces`, { method: "POST", body: form, headers: { cookie, origin: server.url } });
  return { status: res.status, body: (await res.json()) as { error?: string } };
}

const storedRows = (table: "Trace" | "AuditEntry", where = "1") => {
  const db = new Database(dbFile, { readonly: true });
  try {
    return (db.prepare(`SELECT COUNT(*) AS n FROM "${table}" WHERE ${where}`).get() as { n: number }).n;
  } finally {
    db.close();
  }
};

beforeAll(async () => {
  const env = { ...process.env, DATABASE_URL: `file:${dbFile}` };
  const migrate = spawnSync(process.execPath, [path.join(ROOT, "node_modules", "prisma", "build", "index.js"), "migrate", "deploy"], { cwd: ROOT, env, encoding: "utf8" });
  expect(migrate.status, migrate.stderr).toBe(0);
  seedAccounts(`file:${dbFile}`);
  server = await startServer({ DATABASE_URL: `file:${dbFile}` });
  cookie = await signInCookie(server.url, "reviewer");
  storedAccountEntries = storedRows("AuditEntry", `entity IN ('user', 'key')`);
}, 120_000);

afterAll(async () => {
  await server?.stop();
  rmSync(dir, { recursive: true, force: true });
});

describe("bad input over HTTP is a 4xx naming what is wrong, never a 500", () => {
  it("POST /api/traces refuses UTF-16 with a byte-order mark and an odd byte count (422)", async () => {
    const r = await upload(new Uint8Array([...utf16(CSV, false), 0x41]), "odd.csv");
    expect(r.status).toBe(422);
    // 2 (BOM) + 59 characters × 2 + 1 = 121 bytes
    expect(r.body.error).toBe("odd.csv: the file starts with a UTF-16LE byte-order mark but is not valid UTF-16LE: it has an odd number of bytes (121), so its last character is cut in half; the file may be cut short or damaged. Nothing was stored.");
  });

  it("POST /api/traces refuses UTF-16 with a lone surrogate (422)", async () => {
    const r = await upload(utf16(CSV.replace("3.1", "3.1\ud800"), true), "surrogate.csv");
    expect(r.status).toBe(422);
    expect(r.body.error).toMatch(/^surrogate\.csv: the file starts with a UTF-16BE byte-order mark but is not valid UTF-16BE: a lone surrogate 0xd800 at byte \d+ has no partner/);
  });

  it("POST /api/traces refuses an encoding option that does not fit the file (422)", async () => {
    // CSV is 59 bytes of UTF-8: an odd count, which UTF-16 cannot be
    const r = await upload(new TextEncoder().encode(CSV), "utf8.csv", { encoding: "utf-16le" });
    expect(r.status).toBe(422);
    expect(r.body.error).toMatch(/^utf8\.csv: the encoding chosen \(UTF-16LE\) does not fit the file: it has an odd number of bytes/);
  });

  it("POST /api/traces refuses Shift-JIS text instead of storing garbled column names (422)", async () => {
    const sjis = new Uint8Array([0x93, 0xfa, 0x8e, 0x9e, 0x2c, 0x89, 0xb7, 0x93, 0x78, 0x0a, ...new TextEncoder().encode("2026-03-02T06:00:00Z,3.1\n2026-03-02T06:05:00Z,3.2\n")]);
    const r = await upload(sjis, "sjis.csv");
    expect(r.status).toBe(422);
    expect(r.body.error).toMatch(/^sjis\.csv: the file is neither UTF-8 nor Windows-1252 text/);
  });

  it("POST /api/traces refuses a file name over 260 characters and one of spaces only (422)", async () => {
    const long = await upload(new TextEncoder().encode(CSV), `${"a".repeat(261)}.csv`);
    expect(long).toEqual({ status: 422, body: { error: "the file name is longer than 260 characters; rename the file. Nothing was stored.", field: "fileName" } });
    const spaces = await upload(new TextEncoder().encode(CSV), "     ");
    expect(spaces).toEqual({ status: 422, body: { error: "the file name is empty or only spaces; rename the file. Nothing was stored.", field: "fileName" } });
  });

  it("POST /api/traces refuses a plausible minimum above the maximum, saying so (422)", async () => {
    const r = await upload(new TextEncoder().encode(CSV), "range.csv", { plausibleMin_C: 10, plausibleMax_C: -5 });
    expect(r).toEqual({ status: 422, body: { error: "import setting 'plausibleMin_C': the plausible minimum (10 °C) must be below the plausible maximum (-5 °C)", field: "options" } });
  });

  it("a 60 MB server-action body is refused with 413 and the limit, not a 500", async () => {
    const res = await fetch(`${server.url}/products`, {
      method: "POST",
      headers: { "Next-Action": "0123456789abcdef0123456789abcdef01234567", "Content-Type": "text/plain;charset=UTF-8" },
      body: new Uint8Array(60 * 1024 * 1024).fill(0x61),
    });
    expect(res.status).toBe(413);
    expect(await res.json()).toEqual({ error: "the form is 60.0 MB; at most 50 MB can be sent. Nothing was stored." });
  });

  it("an upload sent without a Content-Length (chunked) is cut off at 201 MB with 413, not read whole", async () => {
    // 210 MB produced lazily, 1 MB at a time: only a streaming check can refuse it (proxy.ts sees no length).
    let sent = 0;
    const body = new ReadableStream<Uint8Array>({
      pull(controller) {
        if (sent >= 210) return controller.close();
        sent++;
        controller.enqueue(new Uint8Array(1024 * 1024).fill(0x41));
      },
    });
    const res = await fetch(`${server.url}/api/traces`, {
      method: "POST",
      headers: { "content-type": "multipart/form-data; boundary=x", cookie, origin: server.url },
      body,
      duplex: "half",
    } as RequestInit & { duplex: "half" });
    expect(res.status).toBe(413);
    expect(await res.json()).toEqual({ error: "the upload is over 201 MB; at most 201 MB can be sent. Nothing was stored." });
  });

  it("nothing was stored by any of the refused requests", () => {
    expect(storedRows("Trace")).toBe(0);
    // the only entries: the test accounts' creation and sign-in (and the signing key's)
    expect(storedRows("AuditEntry")).toBe(storedAccountEntries);
  });

  it("a good upload still works afterwards (201)", async () => {
    const r = await upload(new TextEncoder().encode(CSV), "good.csv");
    expect(r.status).toBe(201);
    expect(storedRows("Trace")).toBe(1);
  });
  it("a 20 MB logger file (over the 10 MB Next buffers for proxy.ts by default) is stored whole (201)", async () => {
    let csv = "time,air_C\n";
    const start = Date.UTC(2026, 0, 1);
    for (let i = 0; i < 700_000; i++) csv += `${new Date(start + i * 60_000).toISOString()},${(4 + Math.sin(i / 100)).toFixed(2)}\n`;
    expect(csv.length).toBeGreaterThan(20 * 1024 * 1024);
    const r = await upload(new TextEncoder().encode(csv), "twenty-mb.csv");
    expect(r.status).toBe(201);
    const db = new Database(dbFile, { readonly: true });
    try {
      expect(db.prepare("SELECT sampleCount FROM Trace WHERE fileName = 'twenty-mb.csv'").get()).toEqual({ sampleCount: 700_000 });
    } finally {
      db.close();
    }
  });

});
