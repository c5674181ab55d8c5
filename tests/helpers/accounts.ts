// Accounts for tests that go through the web app: one per role, all with TEST_PASSWORD (passed to the
// app as CORELAG_DEMO_PASSWORD, the only way a demo password is not random). See DEVELOPERS.md, "Tests and sign-in".
import { spawnSync } from "node:child_process";
import path from "node:path";
import type { Actor } from "../../lib/access/actor";
import type { Role } from "../../lib/access/roles";

const ROOT = path.resolve(__dirname, "..", "..");

/** The password of every test account (at least 12 characters; not a secret: tests only). */
export const TEST_PASSWORD = "corelag-test-password";

/** The e-mail of the test account with a role (the demo accounts of lib/services/users.ts). */
export const TEST_EMAIL: Record<Role, string> = {
  admin: "admin@corelag.test",
  reviewer: "reviewer@corelag.test",
  designer: "designer@corelag.test",
  auditor: "auditor@corelag.test",
};

/** For tests that call lib/db or lib/services directly: the audit entries name "system:test". */
export const TEST_ACTOR: Actor = { kind: "system", what: "test" };

/** Creates the four test accounts in a migrated database (a subprocess, so this test's own modules are untouched). */
export function seedAccounts(databaseUrl: string): void {
  const res = spawnSync(process.execPath, [path.join(ROOT, "node_modules", "tsx", "dist", "cli.mjs"), path.join(ROOT, "scripts", "seed-accounts.ts")], {
    cwd: ROOT,
    env: { ...process.env, DATABASE_URL: databaseUrl, CORELAG_DEMO_PASSWORD: TEST_PASSWORD },
    encoding: "utf8",
  });
  if (res.status !== 0) throw new Error(`seeding test accounts failed: ${res.stderr}`);
}

/**
 * Signs in over HTTP (POST /api/session, the same lockout and audit as the page) and returns the
 * session cookie as a `cookie` header value. Throws with the server's message when refused.
 */
export async function signInCookie(baseUrl: string, role: Role | { email: string; password: string }): Promise<string> {
  const creds = typeof role === "string" ? { email: TEST_EMAIL[role], password: TEST_PASSWORD } : role;
  const res = await fetch(`${baseUrl}/api/session`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify(creds) });
  if (res.status !== 200) throw new Error(`sign-in as ${creds.email} refused (${res.status}): ${await res.text()}`);
  const cookies = res.headers.getSetCookie().map((c) => c.split(";")[0]!).filter((c) => c.includes("session_token"));
  if (cookies.length === 0) throw new Error(`sign-in as ${creds.email} set no session cookie`);
  return cookies.join("; ");
}

/** Headers for a signed-in request (add an Origin for cookie-authenticated writes to route handlers). */
export function withCookie(cookie: string, baseUrl?: string, extra: Record<string, string> = {}): Record<string, string> {
  return { cookie, ...(baseUrl ? { origin: baseUrl } : {}), ...extra };
}

/**
 * A `fetch` that is signed in as `role` on every server it is pointed at (it signs in once per origin,
 * then sends the session cookie and this site's Origin). For tests that talk to several servers on one
 * database: `const fetch = signedInFetch("reviewer");` at the top of the file.
 */
export function signedInFetch(role: Role): typeof fetch {
  const cookies = new Map<string, Promise<string>>();
  return (async (input: string | URL | Request, init: RequestInit = {}) => {
    const base = new URL(input instanceof Request ? input.url : String(input)).origin;
    if (!cookies.has(base)) cookies.set(base, signInCookie(base, role));
    const headers = new Headers(init.headers);
    headers.set("cookie", await cookies.get(base)!);
    if (!headers.has("origin")) headers.set("origin", base);
    return globalThis.fetch(input, { ...init, headers });
  }) as typeof fetch;
}
