// better-auth on our Prisma client: e-mail and password sign-in, sessions in the database, cookies.
// Only lib/db constructs it (it needs the client); lib/services/access.ts is the one place that uses it.
// Users are created, given roles and disabled by lib/db/users.ts (audited, in one transaction with the
// audit entry); better-auth's own sign-up is off.
import { betterAuth } from "better-auth";
import { prismaAdapter } from "better-auth/adapters/prisma";
import { nextCookies } from "better-auth/next-js";
import { db } from "./client";
import { databaseKind } from "./env";
import { authSecret } from "./authSecret";
import { hashPassword, verifyPassword } from "./passwords";

/**
 * Idle expiry: a session unused for this long ends (better-auth slides `expiresAt` by this much when the
 * session is used and was last refreshed more than SESSION_REFRESH_S ago). 30 minutes: the inactivity
 * timeout commonly asked of systems holding electronic records (a site policy may differ).
 */
export const SESSION_IDLE_S = 30 * 60;
const SESSION_REFRESH_S = 60;
/** Absolute expiry: a session ends this long after sign-in however active (checked in lib/services/access.ts). */
export const SESSION_ABSOLUTE_S = 12 * 60 * 60;

function makeAuth(secure: boolean) {
  return betterAuth({
    appName: "Corelag",
    secret: authSecret(),
    database: prismaAdapter(db, { provider: databaseKind() === "postgres" ? "postgresql" : "sqlite" }),
    emailAndPassword: {
      enabled: true,
      disableSignUp: true,
      minPasswordLength: 12,
      maxPasswordLength: 256,
      password: { hash: hashPassword, verify: ({ hash, password }) => verifyPassword(hash, password) },
    },
    user: {
      additionalFields: {
        role: { type: "string", input: false, required: false, defaultValue: "auditor" },
        disabled: { type: "boolean", input: false, required: false, defaultValue: false },
        demo: { type: "boolean", input: false, required: false, defaultValue: false },
      },
    },
    session: { expiresIn: SESSION_IDLE_S, updateAge: SESSION_REFRESH_S, cookieCache: { enabled: false } },
    // Our own lockout (per account and per address, audited) runs before every sign-in: lib/services/access.ts.
    rateLimit: { enabled: false },
    advanced: {
      // Secure cookies when the request came over https (behind a proxy: X-Forwarded-Proto); never over plain http.
      useSecureCookies: secure,
      // The cookie lives as long as the idle expiry; each refresh of the session renews it (proxy.ts passes it on).
      cookies: { session_token: { attributes: { httpOnly: true, sameSite: "lax" } } },
    },
    telemetry: { enabled: false },
    plugins: [nextCookies()],
  });
}

type Auth = ReturnType<typeof makeAuth>;
const globalForAuth = globalThis as unknown as { corelagAuth?: { plain?: Auth; secure?: Auth } };
const instances = (globalForAuth.corelagAuth ??= {});

/** The better-auth instance for a request: cookies marked Secure (and "__Secure-" named) over https. */
export function authFor(secure: boolean): Auth {
  if (secure) return (instances.secure ??= makeAuth(true));
  return (instances.plain ??= makeAuth(false));
}
