// /api/v1 over real HTTP against `next start` on a fresh SQLite file: every endpoint without a token, with
// bad, expired, revoked and disabled-owner tokens, with each role and scope; bad bodies and queries (422
// naming the field), unknown ids (404), bodies over the limit (413); a whole flow (upload, definitions,
// review, list, audit) whose audit entries name the token. Users are seeded as rows; tokens are made with
// the bundled CLI, as an administrator would.
import { spawnSync } from "node:child_process";
import { createHash } from "node:crypto";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { createRequire } from "node:module";
import { tmpdir } from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { actorAllows, type Actor } from "@/lib/access/actor";
import type { Role, TokenScope } from "@/lib/access/roles";
import { ENDPOINTS } from "@/lib/api/openapi";
import { startServer, type RunningServer } from "../helpers/server";
import { documentValidator, type Doc } from "../helpers/openapi";

const ROOT = path.resolve(__dirname, "..", "..");
const DEMO = path.join(ROOT, "public", "demo");
type Sqlite = { prepare(sql: string): { get(...a: unknown[]): unknown; run(...a: unknown[]): unknown; all(...a: unknown[]): unknown[] }; close(): void };
const Database = createRequire(__filename)("better-sqlite3") as new (file: string, options?: { readonly?: boolean }) => Sqlite;
const dir = mkdtempSync(path.join(tmpdir(), "corelag-apiv1-"));
const dbFile = path.join(dir, "api.db");
const env = { DATABASE_URL: `file:${dbFile}` };
let server: RunningServer;
let v: ReturnType<typeof documentValidator>;

function sql<T>(fn: (db: Sqlite) => T): T {
  const db = new Database(dbFile);
  try {
    return fn(db);
  } finally {
    db.close();
  }
}
const count = (table: string) => sql((db) => (db.prepare(`SELECT COUNT(*) AS n FROM "${table}"`).get() as { n: number }).n);

function corelag(...args: string[]) {
  const r = spawnSync(process.execPath, [path.join(ROOT, "dist/cli/corelag.mjs"), ...args], { cwd: ROOT, encoding: "utf8", env: { ...process.env, ...env } });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** every seeded account's password (invented for the test; 12 characters or more, as accounts require) */
const PASSWORD = "cold-chain-test-pass";
const USERS: Array<{ id: string; name: string; email: string; role: Role; disabled?: boolean }> = [
  { id: "u-admin", name: "Avery Admin", email: "admin@example.test", role: "admin" },
  { id: "u-rev", name: "Rowan Reviewer", email: "reviewer@example.test", role: "reviewer" },
  { id: "u-des", name: "Dana Designer", email: "designer@example.test", role: "designer" },
  { id: "u-aud", name: "Alex Auditor", email: "auditor@example.test", role: "auditor" },
  { id: "u-gone", name: "Gale Gone", email: "gone@example.test", role: "reviewer" },
];

interface Tok { token: string; id: string; role: Role; scope: TokenScope; owner: string; name: string }
const tokens: Record<string, Tok> = {};

function makeToken(key: string, email: string, scope: TokenScope, extra: string[] = []): Tok {
  const name = `${key} token`;
  const r = corelag("token", "create", "--user", email, "--name", name, "--scope", scope, "--format", "json", ...extra);
  expect(r.stderr).toBe("");
  expect(r.code).toBe(0);
  const out = JSON.parse(r.stdout) as { id: string; token: string; scope: string; expires_at: string | null };
  expect(Object.keys(out)).toEqual(["id", "token", "scope", "expires_at", ...(extra.includes("--monitor") ? ["monitor_id"] : [])]);
  const u = USERS.find((x) => x.email === email)!;
  return (tokens[key] = { token: out.token, id: out.id, role: u.role, scope, owner: u.name, name });
}

const actorOf = (t: Tok): Actor => ({ kind: "token", tokenId: t.id, tokenName: t.name, scope: t.scope, userId: "", name: t.owner, role: t.role });

async function call(method: string, p: string, opts: { token?: string; body?: unknown; raw?: BodyInit; type?: string; headers?: Record<string, string> } = {}) {
  const headers: Record<string, string> = { ...(opts.headers ?? {}) };
  if (opts.token !== undefined) headers.authorization = `Bearer ${opts.token}`;
  let body: BodyInit | undefined = opts.raw;
  if (opts.body !== undefined) {
    body = JSON.stringify(opts.body);
    headers["content-type"] = "application/json";
  }
  if (opts.type) headers["content-type"] = opts.type;
  const init = { method, headers, body, ...(body instanceof ReadableStream ? { duplex: "half" } : {}) } as RequestInit;
  let res: Response;
  try {
    res = await fetch(server.url + p, init);
  } catch (e) {
    // spawnSync (the CLI) blocks the event loop, so fetch's idle keep-alive socket may have been closed by
    // the server without the client noticing; such a request was not read by the server: send it once more.
    const code = (e as { cause?: { code?: string } }).cause?.code;
    if ((code !== "UND_ERR_SOCKET" && code !== "ECONNRESET") || body instanceof ReadableStream) throw e;
    res = await fetch(server.url + p, init);
  }
  const text = await res.text();
  let json: unknown = null;
  try {
    json = JSON.parse(text);
  } catch {
    // not JSON (the original bytes)
  }
  return { status: res.status, type: res.headers.get("content-type") ?? "", headers: res.headers, json: json as Record<string, unknown>, text };
}

/** A concrete URL for a documented path, with ids that exist nowhere. */
const concrete = (p: string) => p.replace("{id}", "no-such-id");

beforeAll(async () => {
  const migrate = spawnSync(process.execPath, [path.join(ROOT, "node_modules", "prisma", "build", "index.js"), "migrate", "deploy"], { cwd: ROOT, env: { ...process.env, ...env }, encoding: "utf8" });
  expect(migrate.status, migrate.stderr).toBe(0);
  // Accounts made as an administrator would, with `corelag user add` (the password on standard input).
  for (const u of USERS) {
    const r = spawnSync(process.execPath, [path.join(ROOT, "dist/cli/corelag.mjs"), "user", "add", "--email", u.email, "--name", u.name, "--role", u.role, "--password-stdin"], { cwd: ROOT, encoding: "utf8", env: { ...process.env, ...env }, input: PASSWORD + "\n" });
    expect(r.status, r.stderr).toBe(0);
  }
  makeToken("adminW", "admin@example.test", "write");
  makeToken("reviewerW", "reviewer@example.test", "write");
  makeToken("reviewerR", "reviewer@example.test", "read");
  // a device token is always bound to one monitor; this one to a monitor no request below names (a bare row:
  // the roles-and-scopes loop only needs it to exist)
  sql((db) =>
    db.prepare(`INSERT INTO "Monitor" ("id","name","productId","limitsId","alertLeadMin","webhooks","emails","webhookSecret","deviceTokenSha256","createdAt") VALUES (?,?,?,?,?,?,?,?,?,?)`)
      .run("mon-elsewhere", "elsewhere", "p-none", "l-none", 60, "[]", "[]", "secret", "0".repeat(64), Date.now()),
  );
  makeToken("reviewerD", "reviewer@example.test", "device", ["--monitor", "mon-elsewhere"]);
  makeToken("designerW", "designer@example.test", "write");
  makeToken("auditorW", "auditor@example.test", "write");
  makeToken("revoked", "reviewer@example.test", "write");
  makeToken("gone", "gone@example.test", "write");
  const rv = corelag("token", "revoke", tokens.revoked!.id);
  expect(rv.code, rv.stderr).toBe(0);
  expect(corelag("user", "disable", "--email", "gone@example.test").code).toBe(0);
  // An expired token: a row whose expiry has passed (the CLI only makes tokens that expire in whole days).
  const expired = "clg_" + "E".repeat(43);
  sql((db) =>
    db.prepare(`INSERT INTO "ApiToken" ("id","name","userId","scope","prefix","tokenSha256","createdAt","expiresAt") VALUES (?,?,?,?,?,?,?,?)`)
      .run("t-expired", "expired token", sql((db) => (db.prepare(`SELECT "id" FROM "User" WHERE "email" = ?`).get("reviewer@example.test") as { id: string }).id), "write", expired.slice(0, 12), createHash("sha256").update(expired).digest("hex"), Date.parse("2026-01-01T00:00:00Z"), Date.parse("2026-01-02T00:00:00Z")),
  );
  tokens.expired = { token: expired, id: "t-expired", role: "reviewer", scope: "write", owner: "Rowan Reviewer", name: "expired token" };
  server = await startServer(env, "/api/v1/health");
  v = documentValidator((await call("GET", "/api/v1/openapi.json", { token: tokens.auditorW!.token })).json as Doc);
}, 240_000);

afterAll(async () => {
  await server?.stop();
  rmSync(dir, { recursive: true, force: true });
});

describe("health needs no token; the document and problem types need a read token", () => {
  it("GET /api/v1/health answers status, versions and the database kind", async () => {
    const r = await call("GET", "/api/v1/health");
    expect(r.status).toBe(200);
    const pkg = JSON.parse(readFileSync(path.join(ROOT, "package.json"), "utf8")) as { version: string };
    const engine = /ENGINE_VERSION = "([^"]+)"/.exec(readFileSync(path.join(ROOT, "lib/review/runReview.ts"), "utf8"))![1];
    expect(r.json).toEqual({ status: "ok", version: pkg.version, engine_version: engine, database: "sqlite" });
    expect(v.response("get", "/api/v1/health", 200, r.json)).toBeNull();
  });

  it("GET /api/v1/openapi.json is the OpenAPI 3.1 document with every endpoint", async () => {
    expect((await call("GET", "/api/v1/openapi.json")).status).toBe(401);
    const r = await call("GET", "/api/v1/openapi.json", { token: tokens.reviewerR!.token });
    expect(r.status).toBe(200);
    expect(r.json.openapi).toBe("3.1.0");
    for (const e of ENDPOINTS) expect(Object.keys((r.json.paths as Record<string, object>)[e.path] ?? {})).toContain(e.method);
  });

  it("a problem type URI describes itself", async () => {
    const r = await call("GET", "/api/v1/problems/too-large", { token: tokens.reviewerR!.token });
    expect(r.json).toMatchObject({ type: "/api/v1/problems/too-large", status: 413, title: "The request body is over the limit" });
  });
});

describe("every authenticated endpoint refuses a caller without a valid token (401 problem+json)", () => {
  const authed = ENDPOINTS.filter((e) => e.permission !== null);
  const cases: Array<[string, () => string | undefined, RegExp]> = [
    ["no token", () => undefined, /send an API token as `Authorization: Bearer <token>`/],
    ["a malformed header", () => "not-a-token", /is not `Bearer <token>` with a Corelag token/],
    ["an unknown token", () => "clg_" + "Z".repeat(43), /this token is not known here/],
    ["an expired token", () => tokens.expired!.token, /expired at 2026-01-02T00:00:00.000Z/],
    ["a revoked token", () => tokens.revoked!.token, /was revoked at /],
    ["a token of a disabled user", () => tokens.gone!.token, /the owner of this token \(gone@example\.test\) is disabled/],
  ];
  for (const [what, tok, message] of cases) {
    it(`${what}: 401 from all ${authed.length} authenticated operations`, async () => {
      for (const e of authed) {
        const t = tok();
        const r = await call(e.method.toUpperCase(), concrete(e.path), { ...(t === "not-a-token" ? { headers: { authorization: "Basic abc" } } : t !== undefined ? { token: t } : {}), ...(e.method !== "get" ? { body: {} } : {}) });
        expect(r.status, `${e.method} ${e.path}`).toBe(401);
        expect(r.type).toBe("application/problem+json");
        expect(r.headers.get("www-authenticate")).toBe('Bearer realm="corelag"');
        expect(r.json).toMatchObject({ type: "/api/v1/problems/unauthorized", status: 401, title: "No valid API token", instance: concrete(e.path) });
        expect(String(r.json.detail)).toMatch(message);
      }
    });
  }
});

describe("roles and scopes (403 exactly when the owner's role or the token's scope does not allow it)", () => {
  const keys = ["adminW", "reviewerW", "reviewerR", "reviewerD", "designerW", "auditorW"];
  for (const key of keys) {
    it(`${key}: every operation is refused or let through as lib/access says`, async () => {
      const t = tokens[key]!;
      const before = ["Trace", "Definition", "Review"].map(count);
      for (const e of ENDPOINTS.filter((x) => x.permission !== null)) {
        // Requests that cannot write: unknown ids, and empty bodies that do not validate.
        const r = await call(e.method.toUpperCase(), concrete(e.path), { token: t.token, ...(e.method !== "get" ? { body: {} } : {}) });
        const allowed = actorAllows(actorOf(t), e.permission!);
        // a device token posts readings only to the monitor it is bound to, which no request here names
        const elsewhere = t.scope === "device" && e.permission === "monitor:post-readings";
        if (allowed && !elsewhere) {
          expect([200, 404, 422], `${key} ${e.method} ${e.path}: ${r.text}`).toContain(r.status);
        } else {
          expect(r.status, `${key} ${e.method} ${e.path}`).toBe(403);
          expect(r.json).toMatchObject({ type: "/api/v1/problems/forbidden", status: 403 });
        }
      }
      expect(["Trace", "Definition", "Review"].map(count)).toEqual(before);
    });
  }

  it("a read token is told that its scope only reads", async () => {
    const r = await call("POST", "/api/v1/definitions/product", { token: tokens.reviewerR!.token, body: {} });
    expect(r.status).toBe(403);
    expect(r.json.detail).toBe("this token's scope is 'read', which only reads; 'definition:edit' needs a write token");
  });

  it("a designer's write token is told which roles may", async () => {
    const r = await call("POST", "/api/v1/traces", { token: tokens.designerW!.token, raw: "x", type: "text/csv" });
    expect(r.status).toBe(403);
    expect(r.json.detail).toBe("the role 'designer' does not allow 'trace:import' (roles that do: admin, reviewer)");
  });
});

describe("a whole flow with a reviewer's write token", () => {
  const csv = readFileSync(path.join(DEMO, "route7-tote3.csv"));
  const product = JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8"));
  const limits = JSON.parse(readFileSync(path.join(DEMO, "ready-meal.limits.json"), "utf8"));
  const ids: Record<string, string> = {};
  const DATA_ROWS = csv.toString("utf8").split("\n").filter((l) => /^\d{4}-\d\d-\d\dT/.test(l)).length; // 361

  it("POST /api/v1/traces stores the raw body with query options and answers 201 {id, sha256, samples, start, end, warnings}", async () => {
    const r = await call("POST", "/api/v1/traces?tz=Europe/Berlin&name=Route%207%20tote%203&file_name=route7-tote3.csv", { token: tokens.reviewerW!.token, raw: csv, type: "text/csv" });
    expect(r.status, r.text).toBe(201);
    expect(Object.keys(r.json)).toEqual(["id", "sha256", "samples", "start", "end", "warnings"]);
    // sha256 of the demo file as stored: computed here from the bytes sent
    expect(r.json.sha256).toBe(createHash("sha256").update(csv).digest("hex"));
    // the file's first reading (public/demo/route7-tote3.csv: 2026-06-16T05:00:00+02:00) and its count of data rows
    expect(r.json.start).toBe("2026-06-16T03:00:00.000Z");
    expect(r.json.samples).toBe(DATA_ROWS);
    expect(v.response("post", "/api/v1/traces", 201, r.json)).toBeNull();
    ids.trace = String(r.json.id);
  });

  it("POST /api/v1/traces takes the multipart field `file` too", async () => {
    const form = new FormData();
    form.append("file", new File([csv], "tote3-again.csv"));
    const r = await call("POST", "/api/v1/traces", { token: tokens.adminW!.token, raw: form });
    expect(r.status, r.text).toBe(201);
    const t = await call("GET", `/api/v1/traces/${r.json.id}`, { token: tokens.auditorW!.token });
    expect(t.json).toMatchObject({ file_name: "tote3-again.csv", name: "tote3-again.csv", samples: DATA_ROWS });
  });

  it("GET /api/v1/traces/{id} and /original give the metadata and the exact bytes (the download is audited)", async () => {
    const t = await call("GET", `/api/v1/traces/${ids.trace}`, { token: tokens.reviewerR!.token });
    expect(t.status).toBe(200);
    expect(t.json).toMatchObject({ id: ids.trace, name: "Route 7 tote 3", file_name: "route7-tote3.csv", samples: DATA_ROWS, has_probe: false });
    expect(v.response("get", "/api/v1/traces/{id}", 200, t.json)).toBeNull();
    const res = await fetch(`${server.url}/api/v1/traces/${ids.trace}/original`, { headers: { authorization: `Bearer ${tokens.auditorW!.token}` } });
    expect(res.status).toBe(200);
    expect(Buffer.from(await res.arrayBuffer()).equals(csv)).toBe(true);
    expect(res.headers.get("x-corelag-sha256")).toBe(createHash("sha256").update(csv).digest("hex"));
  });

  it("POST /api/v1/definitions/{kind} stores the CLI's JSON (201 {id, version, sha256}); PUT adds a version", async () => {
    const p = await call("POST", "/api/v1/definitions/product", { token: tokens.reviewerW!.token, body: product });
    expect(p.status, p.text).toBe(201);
    expect(p.json).toMatchObject({ version: 1, kind: "product", name: product.name });
    const stored = sql((db) => db.prepare(`SELECT "sha256", "version" FROM "Definition" WHERE "id" = ?`).get(p.json.id)) as { sha256: string; version: number };
    expect(p.json.sha256).toBe(stored.sha256);
    ids.product = String(p.json.id);
    const l = await call("POST", "/api/v1/definitions/limits", { token: tokens.designerW!.token, body: limits });
    expect(l.status, l.text).toBe(201);
    ids.limits = String(l.json.id);
    const p2 = await call("PUT", `/api/v1/definitions/product/${ids.product}`, { token: tokens.reviewerW!.token, body: { ...product, initial_C: 3.0 } });
    expect(p2.status, p2.text).toBe(201);
    expect(p2.json).toMatchObject({ version: 2, lineage: p.json.lineage });
    expect(p2.json.id).not.toBe(ids.product);
    // a version id of another kind is not a product
    const wrong = await call("PUT", `/api/v1/definitions/product/${ids.limits}`, { token: tokens.reviewerW!.token, body: product });
    expect(wrong.status).toBe(404);
    expect(wrong.json).toMatchObject({ type: "/api/v1/problems/not-found", field: "id" });
  });

  it("POST /api/v1/reviews stores the review: the CLI's result JSON plus id, status and result_sha256", async () => {
    const r = await call("POST", "/api/v1/reviews", { token: tokens.reviewerW!.token, body: { trace_id: ids.trace, product_id: ids.product, limits_id: ids.limits, title: "Route 7 tote 3, API" } });
    expect(r.status, r.text).toBe(201);
    expect(r.json).toMatchObject({ status: "open", title: "Route 7 tote 3, API", product_id: ids.product, signature: null });
    expect(r.json.result_sha256).toMatch(/^[0-9a-f]{64}$/);
    expect(v.response("post", "/api/v1/reviews", 201, r.json)).toBeNull();
    // the same computation as `corelag review` on the same file and JSON (the CLI reads the file with --tz)
    const cli = corelag("review", "--trace", path.join(DEMO, "route7-tote3.csv"), "--tz", "Europe/Berlin", "--product", path.join(DEMO, "ready-meal.product.json"), "--limits", path.join(DEMO, "ready-meal.limits.json"));
    expect(cli.code, cli.stderr).toBe(0);
    const out = JSON.parse(cli.stdout);
    for (const k of ["outcome", "rules", "mkt_C", "screening", "window", "bands", "cautions", "engine_version"]) expect(r.json[k], k).toEqual(out[k]);
    ids.review = String(r.json.id);
    const g = await call("GET", `/api/v1/reviews/${ids.review}`, { token: tokens.auditorW!.token });
    expect(g.json).toEqual(r.json);
  });

  it("POST /api/v1/reviews with Prefer: respond-async answers 202 with the run; GET /api/v1/runs/{id} follows it to the stored review", async () => {
    const r = await call("POST", "/api/v1/reviews", { token: tokens.reviewerW!.token, headers: { prefer: "respond-async" }, body: { trace_id: ids.trace, product_id: ids.product, limits_id: ids.limits, title: "async" } });
    expect(r.status, r.text).toBe(202);
    expect(v.response("post", "/api/v1/reviews", 202, r.json)).toBeNull();
    expect(r.headers.get("location")).toBe(`/api/v1/runs/${r.json.run_id}`);
    let run: Record<string, unknown> = {};
    for (let i = 0; i < 120; i++) {
      run = (await call("GET", String(r.json.href), { token: tokens.reviewerR!.token })).json;
      if (run.status !== "running") break;
      await new Promise((res) => setTimeout(res, 250));
    }
    expect(run).toMatchObject({ run_id: r.json.run_id, status: "done", progress: 1 });
    const stored = await call("GET", `/api/v1/reviews/${run.review_id}`, { token: tokens.reviewerR!.token });
    expect(stored.json).toMatchObject({ title: "async", status: "open" });
    ids.asyncReview = String(run.review_id);
  });

  it("GET /api/v1/reviews pages newest first with next_after, and filters by status and outcome", async () => {
    const second = await call("POST", "/api/v1/reviews", { token: tokens.adminW!.token, body: { trace_id: ids.trace, product_id: ids.product, limits_id: ids.limits, window: "2026-06-16T04:00:00Z/2026-06-16T08:00:00Z" } });
    expect(second.status, second.text).toBe(201);
    expect(second.json.title).toBe(`${product.name} on Route 7 tote 3`);
    const p1 = await call("GET", "/api/v1/reviews?limit=1", { token: tokens.reviewerR!.token });
    expect(p1.status).toBe(200);
    expect((p1.json.items as Array<{ id: string }>).map((i) => i.id)).toEqual([second.json.id]);
    expect(p1.json.next_after).toBe(second.json.id);
    const p2 = await call("GET", `/api/v1/reviews?limit=2&after=${p1.json.next_after}`, { token: tokens.reviewerR!.token });
    expect((p2.json.items as Array<{ id: string }>).map((i) => i.id)).toEqual([ids.asyncReview, ids.review]);
    expect(p2.json.next_after).toBeNull();
    expect(v.response("get", "/api/v1/reviews", 200, p2.json)).toBeNull();
    const outcome = String(second.json.outcome);
    const other = outcome === "accept" ? "reject" : "accept";
    const f = await call("GET", `/api/v1/reviews?status=open&outcome=${other}`, { token: tokens.reviewerR!.token });
    expect((f.json.items as Array<{ outcome: string }>).every((i) => i.outcome === other)).toBe(true);
  });

  it("POST /api/v1/reviews/{id}/sign-off: the token names the signer, the owner's password is the second component", async () => {
    const url = `/api/v1/reviews/${ids.review}/sign-off`;
    const stored = (await call("GET", `/api/v1/reviews/${ids.review}`, { token: tokens.reviewerR!.token })).json;
    const other = stored.outcome === "accept" ? "hold" : "accept";
    // a read token or a designer cannot sign, whatever the password
    expect((await call("POST", url, { token: tokens.reviewerR!.token, body: { decision: stored.outcome, password: PASSWORD } })).status).toBe(403);
    expect((await call("POST", url, { token: tokens.designerW!.token, body: { decision: stored.outcome, password: PASSWORD } })).status).toBe(403);
    // the password is required, must be the owner's, and a differing decision needs a comment
    expect((await call("POST", url, { token: tokens.reviewerW!.token, body: { decision: stored.outcome } })).json).toMatchObject({ status: 422, field: "password" });
    const wrong = await call("POST", url, { token: tokens.reviewerW!.token, body: { decision: stored.outcome, password: "not-the-password" } });
    expect(wrong.json).toMatchObject({ status: 422, type: "/api/v1/problems/signature-refused", field: "password" });
    const bare = await call("POST", url, { token: tokens.reviewerW!.token, body: { decision: other, password: PASSWORD } });
    expect(bare.json).toMatchObject({ status: 422, field: "comment" });
    expect((await call("GET", `/api/v1/reviews/${ids.review}`, { token: tokens.reviewerR!.token })).json.status).toBe("open");
    expect((await call("POST", "/api/v1/reviews/no-such-id/sign-off", { token: tokens.reviewerW!.token, body: { decision: "hold", password: PASSWORD } })).status).toBe(404);
    // signed: the signature names the token's owner, the time and the meaning of the decision
    const ok = await call("POST", url, { token: tokens.reviewerW!.token, body: { decision: other, comment: "probe reading checked on arrival", password: PASSWORD } });
    expect(ok.status, ok.text).toBe(200);
    expect(ok.json).toMatchObject({ id: ids.review, status: "signed", signature: { decision: other, signed_by: "Rowan Reviewer", comment: "probe reading checked on arrival" } });
    expect(v.response("post", "/api/v1/reviews/{id}/sign-off", 200, ok.json)).toBeNull();
    // a second signature is refused: a correction is a new review
    expect((await call("POST", url, { token: tokens.adminW!.token, body: { decision: "hold", comment: "again, later", password: PASSWORD } })).json).toMatchObject({ status: 409, type: "/api/v1/problems/conflict" });
    const signedList = await call("GET", "/api/v1/reviews?status=signed", { token: tokens.reviewerR!.token });
    expect((signedList.json.items as Array<{ id: string; decision: string }>).map((i) => [i.id, i.decision])).toEqual([[ids.review, other]]);
  });

  it("GET /api/v1/audit walks the chain in pages; each entry of the flow names the token and its owner", async () => {
    const all = await call("GET", "/api/v1/audit?after=0&limit=1000", { token: tokens.auditorW!.token });
    expect(all.status).toBe(200);
    expect(v.response("get", "/api/v1/audit", 200, all.json)).toBeNull();
    const entries = all.json.entries as Array<{ seq: number; action: string; entity: string; entity_id: string; actor: string; prev_hash: string; hash: string }>;
    expect(all.json.next_after).toBeNull();
    for (let i = 1; i < entries.length; i++) {
      expect(entries[i]!.seq).toBe(entries[i - 1]!.seq + 1);
      expect(entries[i]!.prev_hash).toBe(entries[i - 1]!.hash);
    }
    const label = (k: string) => `token ${tokens[k]!.name} (${tokens[k]!.id}) of ${tokens[k]!.owner}`;
    const entryFor = (action: string, id: string) => entries.find((e) => e.action === action && e.entity_id === id);
    expect(entryFor("import", ids.trace!)!.actor).toBe(label("reviewerW"));
    expect(entryFor("create", ids.product!)!.actor).toBe(label("reviewerW"));
    expect(entryFor("create", ids.limits!)!.actor).toBe(label("designerW"));
    expect(entryFor("run", ids.review!)!.actor).toBe(label("reviewerW"));
    expect(entryFor("sign", ids.review!)!.actor).toBe(label("reviewerW"));
    expect(entries.find((e) => e.action === "export" && e.entity_id === ids.trace)!.actor).toBe(label("auditorW"));
    // token creation and revocation by the CLI are in the chain too
    expect(entries.find((e) => e.action === "create" && e.entity === "token" && e.entity_id === tokens.reviewerW!.id)!.actor).toMatch(/^cli:/);
    expect(entries.find((e) => e.action === "revoke" && e.entity_id === tokens.revoked!.id)).toBeDefined();
    // paging by 3 gives the same entries
    const paged: typeof entries = [];
    let after = 0;
    for (;;) {
      const p = await call("GET", `/api/v1/audit?after=${after}&limit=3`, { token: tokens.auditorW!.token });
      paged.push(...(p.json.entries as typeof entries));
      if (p.json.next_after === null) break;
      after = Number(p.json.next_after);
    }
    expect(paged).toEqual(entries);
  });

  it("a token revoked with the CLI is refused from the next request on", async () => {
    const t = makeToken("shortLived", "auditor@example.test", "read", ["--expires-days", "30"]);
    expect((await call("GET", "/api/v1/reviews", { token: t.token })).status).toBe(200);
    const list = corelag("token", "list", "--user", "auditor@example.test");
    const listed = (JSON.parse(list.stdout) as Array<{ id: string; prefix: string; state: string; expires_at: string }>).find((x) => x.id === t.id)!;
    expect(listed).toMatchObject({ prefix: t.token.slice(0, 12), state: "active" });
    expect(JSON.stringify(JSON.parse(list.stdout))).not.toContain(t.token);
    expect(corelag("token", "revoke", t.id).code).toBe(0);
    const r = await call("GET", "/api/v1/reviews", { token: t.token });
    expect(r.status).toBe(401);
    expect(corelag("token", "revoke", t.id)).toMatchObject({ code: 2, stderr: expect.stringMatching(/already revoked/) });
  });
});

describe("live monitors over /api/v1: the device token is an API token bound to its monitor", () => {
  // Invented fixture: two totes on one route, the demo's ready meal and limit set, readings five minutes apart.
  const monitors: Record<"A" | "B", { id: string; token: string; tokenId: string }> = {} as never;
  const reading = (i: number, air_C: number) => ({ t: new Date(Date.parse("2026-06-16T06:00:00Z") + i * 300_000).toISOString(), air_C });
  const readingRows = (id: string) => sql((db) => (db.prepare(`SELECT COUNT(*) AS n FROM "MonitorReading" WHERE "monitorId" = ?`).get(id) as { n: number }).n);
  let defs: { product: string; limits: string };

  beforeAll(async () => {
    const product = JSON.parse(readFileSync(path.join(DEMO, "ready-meal.product.json"), "utf8"));
    const limits = JSON.parse(readFileSync(path.join(DEMO, "ready-meal.limits.json"), "utf8"));
    const p = await call("POST", "/api/v1/definitions/product", { token: tokens.reviewerW!.token, body: product });
    const l = await call("POST", "/api/v1/definitions/limits", { token: tokens.reviewerW!.token, body: limits });
    defs = { product: String(p.json.id), limits: String(l.json.id) };
  });

  it("POST /api/v1/monitors: 201 {id, device_token}; the token is a device API token of the caller's owner, bound to the monitor, listed by corelag token list", async () => {
    for (const k of ["A", "B"] as const) {
      const r = await call("POST", "/api/v1/monitors", { token: tokens.reviewerW!.token, body: { name: `Route 7 tote ${k}`, product_id: defs.product, limits_id: defs.limits, serial: `HX-${k}`, alert: { lead_min: 60 } } });
      expect(r.status, r.text).toBe(201);
      expect(v.response("post", "/api/v1/monitors", 201, r.json)).toBeNull();
      expect(Object.keys(r.json).sort()).toEqual(["device_token", "id"]);
      expect(r.headers.get("location")).toBe(`/api/v1/monitors/${r.json.id}`);
      expect(String(r.json.device_token)).toMatch(/^clg_[A-Za-z0-9_-]{43}$/);
      const listed = (JSON.parse(corelag("token", "list", "--user", "reviewer@example.test").stdout) as Array<{ id: string; name: string; scope: string; monitor_id: string | null; prefix: string }>).filter((x) => x.monitor_id === r.json.id);
      expect(listed).toHaveLength(1);
      expect(listed[0]).toMatchObject({ name: `device: Route 7 tote ${k}`, scope: "device", prefix: String(r.json.device_token).slice(0, 12) });
      monitors[k] = { id: String(r.json.id), token: String(r.json.device_token), tokenId: listed[0]!.id };
    }
    // a body that does not validate: 422 naming the field, no monitor stored
    const before = count("Monitor");
    const bad = await call("POST", "/api/v1/monitors", { token: tokens.reviewerW!.token, body: { name: "x", product_id: defs.product, limits_id: defs.limits, alert: { lead_min: -5 } } });
    expect(bad.status).toBe(422);
    expect(bad.json).toMatchObject({ type: "/api/v1/problems/invalid-request", field: "alert.lead_min" });
    expect(count("Monitor")).toBe(before);
  });

  it("a device token posts readings to its own monitor; the batch's audit entry names the token, its name and its owner; the state validates", async () => {
    const r = await call("POST", `/api/v1/monitors/${monitors.A.id}/readings`, { token: monitors.A.token, body: { readings: [reading(0, 3), reading(1, 3.2)] } });
    expect(r.status, r.text).toBe(200);
    expect(v.response("post", "/api/v1/monitors/{id}/readings", 200, r.json)).toBeNull();
    expect(r.json).toMatchObject({ accepted: 2, duplicates: 0, conflicts: [], refused: [] });
    const state = await call("GET", `/api/v1/monitors/${monitors.A.id}`, { token: tokens.auditorW!.token });
    expect(state.status).toBe(200);
    expect(v.response("get", "/api/v1/monitors/{id}", 200, state.json)).toBeNull();
    expect(state.json.last_reading).toEqual({ t: "2026-06-16T06:05:00.000Z", air_C: 3.2 });
    const audit = await call("GET", "/api/v1/audit?after=0&limit=1000", { token: tokens.auditorW!.token });
    const entry = (audit.json.entries as Array<{ action: string; entity_id: string; actor: string; details: { actor: Record<string, string> } }>).find((e) => e.action === "readings" && e.entity_id === monitors.A.id)!;
    expect(entry.actor).toBe(`token device: Route 7 tote A (${monitors.A.tokenId}) of Rowan Reviewer`);
    expect(entry.details.actor).toEqual({ kind: "token", token_id: monitors.A.tokenId, token_name: "device: Route 7 tote A", user_id: sql((db) => (db.prepare(`SELECT "id" FROM "User" WHERE "email" = ?`).get("reviewer@example.test") as { id: string }).id), name: "Rowan Reviewer" });
    // CSV with ?partial=true from the same token
    const csv = await call("POST", `/api/v1/monitors/${monitors.A.id}/readings?partial=true`, { token: monitors.A.token, raw: `t,air_C\n${reading(2, 3.1).t},3.1\n`, type: "text/csv" });
    expect(csv.json).toMatchObject({ accepted: 1 });
    const badQuery = await call("POST", `/api/v1/monitors/${monitors.A.id}/readings?partial=yes`, { token: monitors.A.token, body: { readings: [reading(3, 3)] } });
    expect(badQuery.json).toMatchObject({ status: 422, field: "partial" });
  });

  it("a device token of monitor A posting to monitor B: 403 problem naming the binding, nothing stored", async () => {
    const r = await call("POST", `/api/v1/monitors/${monitors.B.id}/readings`, { token: monitors.A.token, body: { readings: [reading(0, 3)] } });
    expect(r.status).toBe(403);
    expect(r.type).toContain("application/problem+json");
    expect(r.json).toMatchObject({ type: "/api/v1/problems/forbidden", instance: `/api/v1/monitors/${monitors.B.id}/readings` });
    expect(String(r.json.detail)).toMatch(/bound to another monitor/);
    expect(readingRows(monitors.B.id)).toBe(0);
  });

  it("a read token cannot post readings (403), a device token cannot read or close a monitor (403), a write token of a reviewer may post", async () => {
    const read = await call("POST", `/api/v1/monitors/${monitors.B.id}/readings`, { token: tokens.reviewerR!.token, body: { readings: [reading(0, 3)] } });
    expect(read.status).toBe(403);
    expect(String(read.json.detail)).toMatch(/scope is 'read'/);
    expect((await call("GET", `/api/v1/monitors/${monitors.B.id}`, { token: monitors.B.token })).status).toBe(403);
    expect((await call("POST", `/api/v1/monitors/${monitors.B.id}/close`, { token: monitors.B.token })).status).toBe(403);
    expect(readingRows(monitors.B.id)).toBe(0);
    const write = await call("POST", `/api/v1/monitors/${monitors.B.id}/readings`, { token: tokens.reviewerW!.token, body: { readings: [reading(0, 3)] } });
    expect(write.json).toMatchObject({ accepted: 1 });
  });

  it("a revoked device token: 401 saying it was revoked, nothing stored", async () => {
    expect(corelag("token", "revoke", monitors.B.tokenId).code).toBe(0);
    const before = readingRows(monitors.B.id);
    const r = await call("POST", `/api/v1/monitors/${monitors.B.id}/readings`, { token: monitors.B.token, body: { readings: [reading(1, 3)] } });
    expect(r.status).toBe(401);
    expect(r.json).toMatchObject({ type: "/api/v1/problems/unauthorized" });
    expect(String(r.json.detail)).toMatch(/\('device: Route 7 tote B', clg_.{8}…\) was revoked at /);
    expect(readingRows(monitors.B.id)).toBe(before);
  });

  it("corelag token create --scope device --monitor ID issues a replacement that posts to that monitor only", async () => {
    const bad = corelag("token", "create", "--user", "reviewer@example.test", "--name", "x", "--scope", "write", "--monitor", monitors.B.id);
    expect(bad.stderr.split("\n")[0]).toBe("corelag token: --monitor: only a device token is bound to a monitor (give the scope device)");
    expect(corelag("token", "create", "--user", "reviewer@example.test", "--name", "x", "--scope", "device", "--monitor", "no-such-monitor").stderr.split("\n")[0]).toBe("corelag token: --monitor: there is no monitor with id 'no-such-monitor'");
    // a device token bound to no monitor could post nowhere: refused, naming the flag
    expect(corelag("token", "create", "--user", "reviewer@example.test", "--name", "x", "--scope", "device").stderr.split("\n")[0]).toBe("corelag token: --monitor: a device token posts readings to one monitor: choose the monitor it is for");
    const t = makeToken("gatewayB", "reviewer@example.test", "device", ["--monitor", monitors.B.id]);
    expect((await call("POST", `/api/v1/monitors/${monitors.B.id}/readings`, { token: t.token, body: { readings: [reading(1, 3)] } })).json).toMatchObject({ accepted: 1 });
    expect((await call("POST", `/api/v1/monitors/${monitors.A.id}/readings`, { token: t.token, body: { readings: [reading(9, 3)] } })).status).toBe(403);
  });

  it("POST /api/v1/monitors/{id}/close: 200 {trace_id, review_id}; then readings are refused (409)", async () => {
    const r = await call("POST", `/api/v1/monitors/${monitors.A.id}/close`, { token: tokens.reviewerW!.token });
    expect(r.status, r.text).toBe(200);
    expect(v.response("post", "/api/v1/monitors/{id}/close", 200, r.json)).toBeNull();
    const late = await call("POST", `/api/v1/monitors/${monitors.A.id}/readings`, { token: monitors.A.token, body: { readings: [reading(10, 3)] } });
    expect(late.status).toBe(409);
    expect(late.json).toMatchObject({ type: "/api/v1/problems/conflict" });
  });
});

describe("corelag token: bad input exits 2 with one line naming the flag", () => {
  it.each([
    [["token", "create", "--name", "x"], "corelag token: --user is required (the owner's e-mail address)"],
    [["token", "create", "--user", "nobody@example.test", "--name", "x"], "corelag token: --user: there is no user with the e-mail address nobody@example.test"],
    [["token", "create", "--user", "gone@example.test", "--name", "x"], "corelag token: --user: gone@example.test is disabled; a token of a disabled user could not be used"],
    [["token", "create", "--user", "admin@example.test", "--name", "x", "--scope", "admin"], "corelag token: --scope: scope must be read, write or device"],
    [["token", "create", "--user", "admin@example.test", "--name", "x", "--expires-days", "0"], "corelag token: --expires-days: must be at least 1 day"],
    [["token", "create", "--user", "admin@example.test", "--name", "x", "--expires-days", "1.5"], "corelag token: --expires-days: '1.5' is not a whole number of days"],
    [["token", "revoke", "no-such-token"], "corelag token: there is no API token with id 'no-such-token'"],
    [["token", "rotate"], "corelag token: unknown subcommand 'rotate'"],
  ])("%j", (args, line) => {
    const before = count("ApiToken");
    const r = corelag(...args);
    expect(r.code).toBe(2);
    expect(r.stderr.split("\n")[0]).toBe(line);
    expect(r.stdout).toBe("");
    expect(count("ApiToken")).toBe(before);
  });

  it("without --format json, create prints the token on the first line and says it is shown once", () => {
    const r = corelag("token", "create", "--user", "designer@example.test", "--name", "text output");
    expect(r.code, r.stderr).toBe(0);
    const [first, , second] = r.stdout.split("\n");
    expect(first).toMatch(/^clg_[A-Za-z0-9_-]{43}$/);
    expect(second).toMatch(/^id [0-9a-f]{32} · owner designer@example\.test · scope read · does not expire/);
    expect(r.stdout).toContain("This is the only time the token is shown");
    // only the hash is stored
    const stored = sql((db) => db.prepare(`SELECT "tokenSha256", "prefix" FROM "ApiToken" WHERE "prefix" = ?`).get(first!.slice(0, 12))) as { tokenSha256: string; prefix: string };
    expect(stored.tokenSha256).toBe(createHash("sha256").update(first!).digest("hex"));
    expect(JSON.stringify(sql((db) => db.prepare(`SELECT * FROM "ApiToken"`).all()))).not.toContain(first!);
  });

  it("the database refuses to un-revoke or delete a token", () => {
    expect(() => sql((db) => db.prepare(`UPDATE "ApiToken" SET "revokedAt" = NULL WHERE "id" = ?`).run(tokens.revoked!.id))).toThrow(/a revocation is final/);
    expect(() => sql((db) => db.prepare(`UPDATE "ApiToken" SET "scope" = 'write' WHERE "id" = ?`).run(tokens.reviewerR!.id))).toThrow(/cannot change/);
    expect(() => sql((db) => db.prepare(`DELETE FROM "ApiToken" WHERE "id" = ?`).run(tokens.reviewerR!.id))).toThrow(/revoked, never deleted/);
  });
});

describe("bad requests are refused by name, and nothing is stored", () => {
  const tok = () => tokens.reviewerW!.token;

  it("a definition that does not validate: 422 naming the field", async () => {
    const before = count("Definition");
    const r = await call("POST", "/api/v1/definitions/product", { token: tok(), body: { name: "Tray", mass_kg: -1, area_m2: 0.06, h_W_m2K: 2.5, initial_C: 3, properties: { cp_J_kgK: 3600 } } });
    expect(r.status).toBe(422);
    expect(r.type).toBe("application/problem+json");
    expect(r.json).toMatchObject({ type: "/api/v1/problems/invalid-request", field: "mass_kg" });
    expect(String(r.json.detail)).toMatch(/^body field 'mass_kg': /);
    const unknown = await call("POST", "/api/v1/definitions/pack", { token: tok(), body: { name: "x", colour: "red" } });
    expect(unknown.status).toBe(422);
    expect(count("Definition")).toBe(before);
  });

  it("a body that is not JSON (422), not declared JSON (415), an unknown kind (404)", async () => {
    expect((await call("POST", "/api/v1/definitions/product", { token: tok(), raw: "{name:", type: "application/json" })).json).toMatchObject({ status: 422, field: "body" });
    expect((await call("POST", "/api/v1/definitions/product", { token: tok(), raw: "{}", type: "text/plain" })).json).toMatchObject({ status: 415, type: "/api/v1/problems/unsupported-media-type" });
    expect((await call("POST", "/api/v1/definitions/recipe", { token: tok(), body: {} })).json).toMatchObject({ status: 404, field: "kind" });
  });

  it("a review request with a missing field, an unknown id or a bad window", async () => {
    expect((await call("POST", "/api/v1/reviews", { token: tok(), body: { trace_id: "a", product_id: "b" } })).json).toMatchObject({ status: 422, field: "limits_id" });
    const nf = await call("POST", "/api/v1/reviews", { token: tok(), body: { trace_id: "nope", product_id: "b", limits_id: "c" } });
    expect(nf.json).toMatchObject({ status: 404, field: "trace_id", detail: "body field 'trace_id': that trace does not exist" });
    expect((await call("POST", "/api/v1/reviews", { token: tok(), body: { trace_id: "a", product_id: "b", limits_id: "c", window: "yesterday" } })).json).toMatchObject({ status: 422, field: "window" });
    expect((await call("POST", "/api/v1/reviews", { token: tok(), body: { trace_id: "a", product_id: "b", limits_id: "c", reviewer: "me" } })).json).toMatchObject({ status: 422, field: "reviewer" });
  });

  it("a refused logger file: 422 naming row and column, nothing stored", async () => {
    const before = [count("Trace"), count("AuditEntry")];
    const bad = "Time,Air\n2026-03-02T06:00:00Z,3.1\n2026-03-02T06:05:00Z,3.2\n2026-03-02T06:10:00Z,warm\n2026-03-02T06:15:00Z,3.3\n";
    const r = await call("POST", "/api/v1/traces?file_name=bad.csv", { token: tok(), raw: bad, type: "text/csv" });
    expect(r.status, r.text).toBe(422);
    expect(r.json).toMatchObject({ type: "/api/v1/problems/invalid-file", row: 4, column: "Air" });
    expect(String(r.json.detail)).toMatch(/^bad\.csv: .*Nothing was stored\.$/);
    expect([count("Trace"), count("AuditEntry")]).toEqual(before);
  });

  it("import options and list queries are checked by parameter name", async () => {
    expect((await call("POST", "/api/v1/traces?tz=Mars/Olympus", { token: tok(), raw: "x", type: "text/csv" })).json).toMatchObject({ status: 422, field: "tz" });
    expect((await call("POST", "/api/v1/traces?airCol=Air", { token: tok(), raw: "x", type: "text/csv" })).json).toMatchObject({ status: 422, field: "airCol" });
    expect((await call("GET", "/api/v1/reviews?limit=0", { token: tok() })).json).toMatchObject({ status: 422, field: "limit", detail: "query parameter 'limit': limit must be at least 1" });
    expect((await call("GET", "/api/v1/reviews?status=closed", { token: tok() })).json).toMatchObject({ status: 422, field: "status" });
    expect((await call("GET", "/api/v1/reviews?after=nobody", { token: tok() })).json).toMatchObject({ status: 422, field: "after" });
    expect((await call("GET", "/api/v1/audit?after=-1", { token: tok() })).json).toMatchObject({ status: 422, field: "after" });
    expect((await call("GET", "/api/v1/audit?limit=5000", { token: tok() })).json).toMatchObject({ status: 422, field: "limit" });
  });

  it("an unknown path under /api/v1: 404 problem, not an HTML page", async () => {
    expect((await call("GET", "/api/v1/nothing/here")).status).toBe(401);
    const g = await call("GET", "/api/v1/nothing/here", { token: tok() });
    expect(g.type).toBe("application/problem+json");
    expect(g.json).toMatchObject({ status: 404, detail: "there is no endpoint GET /api/v1/nothing/here; GET /api/v1/openapi.json lists them" });
  });

  it("unknown ids: 404 problem naming the id", async () => {
    for (const p of ["/api/v1/traces/nope", "/api/v1/traces/nope/original", "/api/v1/reviews/nope", "/api/v1/runs/nope"]) {
      const r = await call("GET", p, { token: tok() });
      expect(r.status, p).toBe(404);
      expect(r.json).toMatchObject({ type: "/api/v1/problems/not-found", field: "id", instance: p });
    }
  });

  it("a JSON body over 1 MB, sent without a Content-Length: 413 as it streams", async () => {
    const before = count("Definition");
    const chunk = new TextEncoder().encode(" ".repeat(64 * 1024));
    let sent = 0;
    const stream = new ReadableStream<Uint8Array>({
      pull(c) {
        if (sent >= 2 * 1024 * 1024) return c.close();
        sent += chunk.byteLength;
        c.enqueue(chunk);
      },
    });
    const r = await call("POST", "/api/v1/definitions/product", { token: tok(), raw: stream, type: "application/json" });
    expect(r.status).toBe(413);
    expect(r.json).toMatchObject({ type: "/api/v1/problems/too-large", detail: "the body is over 1 MB; at most 1 MB can be sent here. Nothing was stored." });
    expect(count("Definition")).toBe(before);
  });

  it("a logger file over 201 MB, streamed: 413, nothing stored", async () => {
    const before = count("Trace");
    const chunk = new Uint8Array(1024 * 1024).fill(0x31);
    let sent = 0;
    const stream = new ReadableStream<Uint8Array>({
      pull(c) {
        if (sent >= 205 * 1024 * 1024) return c.close();
        sent += chunk.byteLength;
        c.enqueue(chunk);
      },
    });
    const r = await call("POST", "/api/v1/traces", { token: tok(), raw: stream, type: "text/csv" });
    expect(r.status).toBe(413);
    expect(r.json).toMatchObject({ type: "/api/v1/problems/too-large" });
    expect(count("Trace")).toBe(before);
  }, 120_000);
});
