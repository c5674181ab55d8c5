// Every server action and route handler in app/ checks the caller before it does anything (issue 13):
// this test finds them all in the source, then calls each over real HTTP against `next start` as an
// anonymous caller and as a signed-in user whose role lacks the permission, and expects a refusal.
// It also opens every page anonymously (each must send the caller to the sign-in page).
import { spawnSync } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { createRequire } from "node:module";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startServer, type RunningServer } from "../helpers/server";
import { seedAccounts, signInCookie } from "../helpers/accounts";
import { ROLES, allows, type Permission, type Role } from "../../lib/access/roles";

const ROOT = path.resolve(__dirname, "..", "..");
const APP = path.join(ROOT, "app");

function files(dir: string): string[] {
  return readdirSync(dir).flatMap((n) => {
    const p = path.join(dir, n);
    return statSync(p).isDirectory() ? files(p) : [p];
  });
}
const rel = (p: string) => path.relative(ROOT, p).split(path.sep).join("/");
/** A URL path for a file under app/: dynamic segments get a placeholder id. */
const urlPath = (dir: string) => "/" + rel(dir).replace(/^app\/?/, "").replace(/\[[^\]]+\]/g, "no-such-id");

interface Wrapped { file: string; name: string; wrapper: string; permission?: Permission }

/** Every export of a "use server" file, with the wrapper it is made with (or none). */
function serverActions(): { wrapped: Wrapped[]; unwrapped: string[] } {
  const wrapped: Wrapped[] = [];
  const unwrapped: string[] = [];
  for (const f of files(APP).filter((f) => /\.(ts|tsx)$/.test(f))) {
    const src = readFileSync(f, "utf8");
    if (!/^\s*["']use server["']/.test(src)) {
      // an inline "use server" function inside a component would escape the wrappers
      if (/^\s+["']use server["'];?\s*$/m.test(src)) unwrapped.push(`${rel(f)}: an inline "use server" function`);
      continue;
    }
    for (const m of src.matchAll(/^export\s+(?:async\s+)?(?:const|function|let|var)\s+(\w+)(.*)$/gm)) {
      const w = /^\s*=\s*(guardAction|publicAction)\(\s*"([^"]+)"/.exec(m[2]!);
      if (!w) unwrapped.push(`${rel(f)}: ${m[1]}`);
      else wrapped.push({ file: rel(f), name: m[1]!, wrapper: w[1]!, permission: w[1] === "guardAction" ? (w[2] as Permission) : undefined });
    }
    for (const m of src.matchAll(/^export\s+(?:default|\{)/gm)) unwrapped.push(`${rel(f)}: ${m[0]}`);
  }
  return { wrapped, unwrapped };
}

interface Route { file: string; path: string; method: string; wrapper: string; permission?: Permission }

function routeHandlers(): { wrapped: Route[]; unwrapped: string[] } {
  const wrapped: Route[] = [];
  const unwrapped: string[] = [];
  for (const f of files(APP).filter((f) => /\/route\.(ts|tsx)$/.test(f))) {
    const src = readFileSync(f, "utf8");
    for (const m of src.matchAll(/^export\s+(?:async\s+)?(?:const|function)\s+(GET|POST|PUT|PATCH|DELETE|HEAD|OPTIONS)\b(.*)$/gm)) {
      const w = /^\s*=\s*(guardRoute|publicRoute)(?:<[^>]*>)?\(\s*"([^"]+)"/.exec(m[2]!);
      if (!w) unwrapped.push(`${rel(f)}: ${m[1]}`);
      else wrapped.push({ file: rel(f), path: urlPath(path.dirname(f)), method: m[1]!, wrapper: w[1]!, permission: w[1] === "guardRoute" ? (w[2] as Permission) : undefined });
    }
  }
  return { wrapped, unwrapped };
}

/** The public ones, by name: each must say why (the wrapper's reason) and be listed here. */
const PUBLIC_ACTIONS = new Set(["app/actions/session.ts:signInAction", "app/actions/session.ts:createFirstAdminAction"]);
const PUBLIC_ROUTES = new Set(["app/api/session/route.ts:POST", "app/api/v1/health/route.ts:GET"]);
const PUBLIC_PAGES = new Set(["/sign-in", "/setup"]);

/** A role without the permission, if any role lacks it ("read" is everyone's: only the anonymous case then). */
const smallRole = (p: Permission): Role | undefined => ROLES.find((r) => !allows(r, p));

const dir = mkdtempSync(path.join(tmpdir(), "corelag-access-"));
const dbUrl = `file:${path.join(dir, "access.db")}`;
let server: RunningServer;
const cookies: Partial<Record<Role, string>> = {};

type Sqlite = { prepare(sql: string): { get(): unknown }; close(): void };
const Database = createRequire(__filename)("better-sqlite3") as new (file: string, options: { readonly: boolean }) => Sqlite;
const auditCount = () => {
  const db = new Database(path.join(dir, "access.db"), { readonly: true });
  try {
    return (db.prepare(`SELECT COUNT(*) AS n FROM "AuditEntry" WHERE action NOT IN ('sign-in', 'sign-in-refused', 'sign-out', 'key')`).get() as { n: number }).n;
  } finally {
    db.close();
  }
};

beforeAll(async () => {
  const migrate = spawnSync(process.execPath, [path.join(ROOT, "node_modules", "prisma", "build", "index.js"), "migrate", "deploy"], { cwd: ROOT, env: { ...process.env, DATABASE_URL: dbUrl }, encoding: "utf8" });
  expect(migrate.status, migrate.stderr).toBe(0);
  seedAccounts(dbUrl);
  server = await startServer({ DATABASE_URL: dbUrl }, "/sign-in");
  for (const r of ROLES) cookies[r] = await signInCookie(server.url, r);
}, 120_000);

afterAll(async () => {
  await server?.stop();
  rmSync(dir, { recursive: true, force: true });
});

/** The action ids of the build, by file and export name, and a page that can run each. */
function actionIds(): Map<string, { id: string; page: string }> {
  const manifest = JSON.parse(readFileSync(path.join(ROOT, ".next", "server", "server-reference-manifest.json"), "utf8")) as {
    node: Record<string, { workers: Record<string, unknown>; filename?: string; exportedName?: string }>;
  };
  const out = new Map<string, { id: string; page: string }>();
  for (const [id, a] of Object.entries(manifest.node)) {
    const worker = Object.keys(a.workers)[0]!; // "app/design/calibrate/page"
    const page = "/" + worker.replace(/^app\/?/, "").replace(/\/?page$/, "").replace(/\[[^\]]+\]/g, "no-such-id");
    if (a.filename && a.exportedName) out.set(`${a.filename}:${a.exportedName}`, { id, page });
  }
  return out;
}

/**
 * Calls a server action as the browser would (Next-Action header, the arguments as React's encoded reply:
 * the previous state and a form). The wrapper refuses before it reads them.
 */
async function callAction(a: { id: string; page: string }, cookie?: string): Promise<{ status: number; body: string }> {
  const res = await fetch(server.url + a.page, {
    method: "POST",
    headers: { "next-action": a.id, accept: "text/x-component", "content-type": "text/plain;charset=UTF-8", origin: server.url, ...(cookie ? { cookie } : {}) },
    body: JSON.stringify([{}, {}]),
    redirect: "manual",
  });
  return { status: res.status, body: await res.text() };
}

describe("every server action goes through the access wrapper", () => {
  const { wrapped, unwrapped } = serverActions();

  it("finds the actions, and every export of a \"use server\" file is wrapped", () => {
    expect(unwrapped).toEqual([]);
    expect(wrapped.length).toBeGreaterThanOrEqual(12);
    for (const a of wrapped.filter((w) => w.wrapper === "publicAction")) expect(PUBLIC_ACTIONS.has(`${a.file}:${a.name}`), `${a.file}:${a.name} is public but not listed`).toBe(true);
  });

  it("refuses each guarded action to an anonymous caller and to a role without its permission, and writes nothing", async () => {
    const ids = actionIds();
    const before = auditCount();
    for (const a of wrapped.filter((w) => w.wrapper === "guardAction")) {
      const target = ids.get(`${a.file}:${a.name}`);
      expect(target, `${a.file}:${a.name} is not in the build's action manifest`).toBeDefined();
      const anon = await callAction(target!);
      expect(anon.body, `${a.name} anonymous`).toContain("Not signed in");
      const role = smallRole(a.permission!);
      if (role) {
        const small = await callAction(target!, cookies[role]);
        expect(small.body, `${a.name} as ${role}`).toContain(`Not allowed: your role (${role})`);
      }
    }
    expect(auditCount()).toBe(before);
  }, 120_000);
});

describe("every route handler goes through the access wrapper", () => {
  const { wrapped, unwrapped } = routeHandlers();

  it("finds the route handlers, and each is wrapped", () => {
    expect(unwrapped).toEqual([]);
    expect(wrapped.length).toBeGreaterThanOrEqual(9);
    for (const r of wrapped.filter((w) => w.wrapper === "publicRoute")) expect(PUBLIC_ROUTES.has(`${r.file}:${r.method}`), `${r.file}:${r.method} is public but not listed`).toBe(true);
  });

  it("answers 401 to an anonymous caller and 403 to a role without the permission", async () => {
    const before = auditCount();
    for (const r of wrapped.filter((w) => w.wrapper === "guardRoute")) {
      const init = (cookie?: string): RequestInit => ({ method: r.method, headers: { origin: server.url, "content-type": "application/json", ...(cookie ? { cookie } : {}) }, body: r.method === "GET" ? undefined : "{}", redirect: "manual" });
      const anon = await fetch(server.url + r.path, init());
      expect(anon.status, `${r.method} ${r.path} anonymous`).toBe(401);
      const role = smallRole(r.permission!);
      if (role) {
        const small = await fetch(server.url + r.path, init(cookies[role]));
        expect(small.status, `${r.method} ${r.path} as ${role}`).toBe(403);
        // /api/v1 answers RFC 9457 problems (lib/services/apiRefusal.ts); other routes `{ error }`
        const body = (await small.json()) as { error?: string; detail?: string };
        if (r.path.startsWith("/api/v1/")) expect(body.detail).toContain(`the role '${role}' does not allow`);
        else expect(body.error).toContain(`your role (${role})`);
      }
    }
    expect(auditCount()).toBe(before);
  }, 60_000);

  it("refuses a cookie-authenticated write without this site's Origin (403), even for a role that may write", async () => {
    for (const origin of [undefined, "http://evil.example"]) {
      const res = await fetch(server.url + "/api/traces", { method: "POST", headers: { cookie: cookies.admin!, ...(origin ? { origin } : {}) }, body: new FormData() });
      expect(res.status).toBe(403);
      expect(((await res.json()) as { error: string }).error).toContain("Origin");
    }
  });
});

describe("every page needs a session", () => {
  const pages = files(APP).filter((f) => /\/page\.tsx$/.test(f)).map((f) => urlPath(path.dirname(f)).replace(/\/$/, "") || "/");

  it("sends an anonymous caller to the sign-in page", async () => {
    expect(pages.length).toBeGreaterThanOrEqual(15);
    for (const p of pages.filter((p) => !PUBLIC_PAGES.has(p))) {
      const res = await fetch(server.url + p, { redirect: "manual" });
      expect(res.status, p).toBe(307);
      expect(new URL(res.headers.get("location")!, server.url).pathname, p).toBe("/sign-in");
    }
  });

  it("lets a signed-in auditor read the pages, but the users page is the administrator's", async () => {
    expect((await fetch(server.url + "/traces", { headers: { cookie: cookies.auditor! } })).status).toBe(200);
    expect((await fetch(server.url + "/users", { headers: { cookie: cookies.auditor! } })).status).toBe(404);
    const users = await fetch(server.url + "/users", { headers: { cookie: cookies.admin! } });
    expect(users.status).toBe(200);
    // "Added" is the account's creation day (created during this test run), not a date near the 1970 epoch
    const html = await users.text();
    expect(html).toContain(`${new Date().getUTCFullYear()}-`);
    expect(html).not.toContain("1970-01-");
  });
});
