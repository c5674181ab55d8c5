// The one place a request becomes an Actor, and the one check every server action and route handler
// goes through (app/guard.ts wraps this for Next.js). Sessions come from better-auth (cookies); an
// `Authorization: Bearer` header goes to `actorFromBearer`, the hook for API tokens (issue 13's API part).
import { z } from "zod";
import { isAPIError } from "better-auth/api";
import { actorAllows, type Actor } from "../access/actor";
import { ROLES, rolesAllowing, type Permission, type Role } from "../access/roles";
import { authFor, SESSION_ABSOLUTE_S } from "../db/auth";
import { actorFromAuthorization } from "./apiTokens";
import { passwordMatches } from "./users";
import { clearSignInFailures, deleteSession, logSessionEvent, recordSignInFailure, signInFailuresSince, userByEmail, userById } from "../db/users";

/** Lockout: 5 refused sign-ins for one account within 15 minutes lock it for 15 minutes after the last one. */
export const ACCOUNT_FAILURE_LIMIT = 5;
/** Per address: 20 refused sign-ins within 15 minutes (any accounts) refuse that address for 15 minutes. */
export const ADDRESS_FAILURE_LIMIT = 20;
export const LOCKOUT_WINDOW_S = 15 * 60;

const roleSchema = z.enum(ROLES);

/** Whether the request came over https (directly, or through a proxy that says so). */
export function requestIsHttps(headers: Headers): boolean {
  const proto = headers.get("x-forwarded-proto")?.split(",")[0]?.trim().toLowerCase();
  return proto === "https";
}

/** The client's address as this server sees it: the first X-Forwarded-For hop, else X-Real-IP, else "unknown". */
export function clientAddress(headers: Headers): string {
  const fwd = headers.get("x-forwarded-for")?.split(",")[0]?.trim();
  return (fwd || headers.get("x-real-ip")?.trim() || "unknown").slice(0, 100);
}

/**
 * The hook for API tokens: resolve `Authorization: Bearer <token>` to a token Actor (its owner's role,
 * its scope), or null when the token is unknown, revoked or expired, or its owner disabled
 * (lib/services/apiTokens.ts; the API's refusal says which, lib/services/apiRefusal.ts).
 */
export async function actorFromBearer(token: string): Promise<Actor | null> {
  const r = await actorFromAuthorization(`Bearer ${token}`);
  return r.ok ? r.actor : null;
}

/** The signed-in user behind the request's session cookie, or null (no cookie, expired, ended, disabled). */
export async function actorFromSession(headers: Headers): Promise<Extract<Actor, { kind: "user" }> | null> {
  return (await sessionWithCookies(headers)).actor;
}

/**
 * The session check with the cookies better-auth wants to set: using a session slides its idle expiry
 * and renews the cookie, which proxy.ts passes on to the browser (pages cannot set cookies themselves).
 */
export async function sessionWithCookies(headers: Headers): Promise<{ actor: Extract<Actor, { kind: "user" }> | null; setCookies: string[] }> {
  const { headers: out, response: found } = await authFor(requestIsHttps(headers)).api.getSession({ headers, returnHeaders: true });
  const setCookies = out.getSetCookie();
  return { actor: found ? await userOfSession(found) : null, setCookies };
}

async function userOfSession(found: { session: { id: string; createdAt: Date | string }; user: { id: string } }): Promise<Extract<Actor, { kind: "user" }> | null> {
  // Absolute expiry: however active, a session ends SESSION_ABSOLUTE_S after sign-in.
  if (Date.now() - new Date(found.session.createdAt).getTime() > SESSION_ABSOLUTE_S * 1000) {
    await deleteSession(found.session.id);
    return null;
  }
  // Read the user fresh: a role change or a disabling takes effect on the next request.
  const user = await userById(found.user.id);
  if (!user || user.disabled) return null;
  const role = roleSchema.safeParse(user.role);
  if (!role.success) return null;
  return { kind: "user", userId: user.id, name: user.name, email: user.email, role: role.data };
}

/** Who is asking: a bearer token when the request carries one (never falling back to a cookie), else the session. */
export async function actorFromRequest(headers: Headers): Promise<Actor | null> {
  const authz = headers.get("authorization");
  if (authz !== null) {
    const m = /^Bearer\s+(\S+)$/i.exec(authz.trim());
    return m ? actorFromBearer(m[1]!) : null;
  }
  return actorFromSession(headers);
}

export type Authorization =
  | { ok: true; actor: Actor }
  | { ok: false; status: 401 | 403; message: string; actor: Actor | null };

/** The sentence shown (and sent) when a role is too small. */
export function refusalMessage(permission: Permission, actor: Actor | null): string {
  if (!actor) return "Not signed in: sign in to do this.";
  const who = actor.kind === "user" || actor.kind === "token" ? `your role (${actor.role})` : "you";
  return `Not allowed: ${who} cannot do this; it needs the ${rolesAllowing(permission).join(" or ")} role.`;
}

/** Resolves the actor and checks the permission, before anything else is done for the request. */
export async function authorize(headers: Headers, permission: Permission): Promise<Authorization> {
  const actor = await actorFromRequest(headers);
  if (!actor) return { ok: false, status: 401, message: refusalMessage(permission, null), actor: null };
  if (!actorAllows(actor, permission)) return { ok: false, status: 403, message: refusalMessage(permission, actor), actor };
  return { ok: true, actor };
}

// ---- signing in and out ----

export const signInSchema = z.object({
  email: z.string().trim().toLowerCase().pipe(z.email({ message: "enter the e-mail address of your account" })),
  password: z.string().min(1, { message: "enter your password" }).max(256, { message: "at most 256 characters" }),
});

export type SignInOutcome = { ok: true; actor: Extract<Actor, { kind: "user" }> } | { ok: false; field?: "email" | "password"; message: string; locked?: boolean };

const signInSystem: Actor = { kind: "system", what: "sign-in" };

const untilText = (d: Date) => `${d.toISOString().slice(11, 16)} UTC`;

/**
 * Signs in with e-mail and password. Refused sign-ins are counted per account and per address and
 * audited; past the limits the account (or address) is locked for a while and is told so, whatever
 * the password. The session cookie is set by better-auth (through next/headers when called from a
 * server action).
 */
export async function signIn(input: { email: string; password: string }, headers: Headers): Promise<SignInOutcome> {
  const { email, password } = input;
  const address = clientAddress(headers);
  const now = Date.now();
  const since = new Date(now - LOCKOUT_WINDOW_S * 1000);
  const f = await signInFailuresSince(email, address, since);
  const user = await userByEmail(email);
  const refuse = async (reason: string, message: string, extra: { locked?: boolean; count?: boolean } = {}): Promise<SignInOutcome> => {
    if (extra.count !== false) await recordSignInFailure(email, address);
    await logSessionEvent("sign-in-refused", user?.id ?? email, signInSystem, { email, address, reason });
    return { ok: false, message, locked: extra.locked };
  };
  if (f.byAccount >= ACCOUNT_FAILURE_LIMIT && f.lastAccountAt) {
    const until = new Date(f.lastAccountAt.getTime() + LOCKOUT_WINDOW_S * 1000);
    return refuse("locked", `This account is locked after ${ACCOUNT_FAILURE_LIMIT} failed sign-ins; try again after ${untilText(until)}, or ask an administrator.`, { locked: true, count: false });
  }
  if (f.byAddress >= ADDRESS_FAILURE_LIMIT && f.lastAddressAt) {
    const until = new Date(f.lastAddressAt.getTime() + LOCKOUT_WINDOW_S * 1000);
    return refuse("address-locked", `Too many failed sign-ins from this address; try again after ${untilText(until)}.`, { locked: true, count: false });
  }
  if (user?.disabled) return refuse("disabled", "This account is disabled; ask an administrator.", { count: false });
  try {
    await authFor(requestIsHttps(headers)).api.signInEmail({ body: { email, password, rememberMe: true }, headers });
  } catch (e) {
    if (!isAPIError(e)) throw e;
    const left = ACCOUNT_FAILURE_LIMIT - f.byAccount - 1;
    return refuse(
      user ? "wrong-password" : "unknown-email",
      left > 0 ? "The e-mail address or the password is wrong." : `The e-mail address or the password is wrong. This account is now locked for ${LOCKOUT_WINDOW_S / 60} minutes.`,
      { locked: left <= 0 },
    );
  }
  await clearSignInFailures(email);
  const role = roleSchema.parse(user!.role);
  const actor = { kind: "user" as const, userId: user!.id, name: user!.name, email: user!.email, role };
  await logSessionEvent("sign-in", actor.userId, actor, { address });
  return { ok: true, actor };
}

/** Failures at signing are counted under this "address": they lock the account, never a network address. */
export const SIGNATURE_FAILURE_ADDRESS = "signature";

export type Reauthentication = { ok: true } | { ok: false; locked: boolean; message: string };

/**
 * The password re-entered for an electronic signature, checked like a sign-in: a wrong one counts toward the
 * account's lockout (so a signature form cannot be used to guess a password when a session is left open), a
 * locked account cannot sign even with the right one, and each refusal is audited. A right one clears nothing:
 * only a successful sign-in resets the count.
 */
export async function reauthenticate(userId: string, password: string, attempt: { actor: Actor; signing: string } = { actor: { kind: "system", what: "signature" }, signing: "" }): Promise<Reauthentication> {
  const user = await userById(userId);
  if (!user) return { ok: false, locked: false, message: "the signer's account does not exist" };
  const since = new Date(Date.now() - LOCKOUT_WINDOW_S * 1000);
  const f = await signInFailuresSince(user.email, SIGNATURE_FAILURE_ADDRESS, since);
  // the entry is made by the signed-in person (or token) who tried, and says what they tried to sign
  const by = attempt.actor;
  const signing = attempt.signing ? { signing: attempt.signing } : {};
  if (f.byAccount >= ACCOUNT_FAILURE_LIMIT && f.lastAccountAt) {
    const until = new Date(f.lastAccountAt.getTime() + LOCKOUT_WINDOW_S * 1000);
    await logSessionEvent("signature-refused", user.id, by, { email: user.email, reason: "locked", ...signing });
    return { ok: false, locked: true, message: `this account is locked after ${ACCOUNT_FAILURE_LIMIT} wrong passwords; nothing was signed. Try again after ${untilText(until)}, or ask an administrator` };
  }
  if (await passwordMatches(user.id, password)) return { ok: true };
  await recordSignInFailure(user.email, SIGNATURE_FAILURE_ADDRESS);
  await logSessionEvent("signature-refused", user.id, by, { email: user.email, reason: "wrong-password", ...signing });
  const left = ACCOUNT_FAILURE_LIMIT - f.byAccount - 1;
  return left > 0
    ? { ok: false, locked: false, message: `the password is wrong; nothing was signed (${left} more wrong password${left === 1 ? " locks" : "s lock"} the account for ${LOCKOUT_WINDOW_S / 60} minutes)` }
    : { ok: false, locked: true, message: `the password is wrong; nothing was signed. This account is now locked for ${LOCKOUT_WINDOW_S / 60} minutes` };
}

/** Ends the request's session (its cookie is cleared by better-auth) and records it. */
export async function signOut(headers: Headers): Promise<void> {
  const actor = await actorFromSession(headers);
  await authFor(requestIsHttps(headers)).api.signOut({ headers }).catch((e: unknown) => {
    if (!isAPIError(e)) throw e;
  });
  if (actor) await logSessionEvent("sign-out", actor.userId, actor, {});
}

export type { Role };
