// Accounts (issue 13): users, their credential, roles and the disabled flag, and the refused sign-ins the
// lockout counts. Every change to a user is written with its audit entry in one transaction. Sessions
// themselves are better-auth's (lib/db/auth.ts); disabling a user ends them here.
import { randomUUID } from "node:crypto";
import { db } from "./client";
import { appendAudit } from "./audit";
import type { Actor } from "../access/actor";
import type { Role } from "../access/roles";

export interface UserRow {
  id: string;
  name: string;
  email: string;
  role: string;
  disabled: boolean;
  demo: boolean;
  createdAt: Date;
}

const userSelect = { id: true, name: true, email: true, role: true, disabled: true, demo: true, createdAt: true } as const;

export async function countUsers(): Promise<number> {
  return db.user.count();
}

export async function listUsers(): Promise<UserRow[]> {
  return db.user.findMany({ select: userSelect, orderBy: [{ createdAt: "asc" }, { email: "asc" }] });
}

export async function userById(id: string): Promise<UserRow | null> {
  return db.user.findUnique({ where: { id }, select: userSelect });
}

export async function userByEmail(email: string): Promise<UserRow | null> {
  return db.user.findUnique({ where: { email: email.toLowerCase() }, select: userSelect });
}

/** The stored argon2id hash of a user's password (the credential account), for the sign-off's re-entry. */
export async function credentialHash(userId: string): Promise<string | null> {
  const acc = await db.account.findFirst({ where: { userId, providerId: "credential" }, select: { password: true } });
  return acc?.password ?? null;
}

export interface NewUser {
  email: string;
  name: string;
  role: Role;
  passwordHash: string;
  demo?: boolean;
}

export type CreateUserOutcome = { ok: true; user: UserRow } | { ok: false; reason: "email-taken" | "not-first"; message: string };

/**
 * A user and its e-mail-and-password credential (better-auth's "credential" account), with an audit
 * entry. `onlyIfNone`: the one-time "create the administrator" step, refused once any user exists
 * (checked inside the transaction, so two first visits cannot both create one).
 */
export async function createUser(u: NewUser, actor: Actor, opts: { onlyIfNone?: boolean } = {}): Promise<CreateUserOutcome> {
  const email = u.email.toLowerCase();
  return db.$transaction(async (tx) => {
    if (opts.onlyIfNone && (await tx.user.count()) > 0) return { ok: false, reason: "not-first", message: "an account already exists; sign in, or ask an administrator for one" };
    if (await tx.user.findUnique({ where: { email }, select: { id: true } })) return { ok: false, reason: "email-taken", message: `${email} already has an account` };
    const id = randomUUID();
    const now = new Date();
    const user = await tx.user.create({ data: { id, email, name: u.name, role: u.role, demo: u.demo ?? false, emailVerified: false, createdAt: now, updatedAt: now }, select: userSelect });
    await tx.account.create({ data: { id: randomUUID(), accountId: id, providerId: "credential", userId: id, password: u.passwordHash, createdAt: now, updatedAt: now } });
    await appendAudit(tx, { action: "create", entity: "user", entityId: id, actor, details: { email, name: u.name, role: u.role, demo: u.demo ?? false } });
    return { ok: true, user };
  });
}

export type UserChange = { ok: true; user: UserRow } | { ok: false; reason: "not-found" | "last-admin" | "unchanged"; message: string };

/** Enabled admins other than `exceptId`: the last one cannot be demoted or disabled (no one could manage users). */
async function otherAdmins(tx: Parameters<Parameters<typeof db.$transaction>[0]>[0], exceptId: string): Promise<number> {
  return tx.user.count({ where: { role: "admin", disabled: false, id: { not: exceptId } } });
}

export async function setUserRole(id: string, role: Role, actor: Actor): Promise<UserChange> {
  return db.$transaction(async (tx) => {
    const row = await tx.user.findUnique({ where: { id }, select: userSelect });
    if (!row) return { ok: false, reason: "not-found", message: "that user does not exist" };
    if (row.role === role) return { ok: false, reason: "unchanged", message: `${row.email} already has the ${role} role` };
    if (row.role === "admin" && !row.disabled && (await otherAdmins(tx, id)) === 0) {
      return { ok: false, reason: "last-admin", message: `${row.email} is the only enabled administrator; make someone else an administrator first` };
    }
    const user = await tx.user.update({ where: { id }, data: { role }, select: userSelect });
    await appendAudit(tx, { action: "set-role", entity: "user", entityId: id, actor, details: { email: row.email, from: row.role, to: role } });
    return { ok: true, user };
  });
}

/** Disables (and ends every session of) or re-enables a user. */
export async function setUserDisabled(id: string, disabled: boolean, actor: Actor): Promise<UserChange> {
  return db.$transaction(async (tx) => {
    const row = await tx.user.findUnique({ where: { id }, select: userSelect });
    if (!row) return { ok: false, reason: "not-found", message: "that user does not exist" };
    if (row.disabled === disabled) return { ok: false, reason: "unchanged", message: `${row.email} is already ${disabled ? "disabled" : "enabled"}` };
    if (disabled && row.role === "admin" && (await otherAdmins(tx, id)) === 0) {
      return { ok: false, reason: "last-admin", message: `${row.email} is the only enabled administrator; make someone else an administrator first` };
    }
    const user = await tx.user.update({ where: { id }, data: { disabled }, select: userSelect });
    if (disabled) await tx.session.deleteMany({ where: { userId: id } });
    await appendAudit(tx, { action: disabled ? "disable" : "enable", entity: "user", entityId: id, actor, details: { email: row.email } });
    return { ok: true, user };
  });
}

/**
 * A new password for a user (an administrator's reset, or the CLI's): the credential's hash is replaced, every
 * session of the user ends (whoever knew the old password is out), refused sign-ins are forgotten (the lockout
 * lifts), and the change is audited without the password or its hash.
 */
export async function setUserPassword(id: string, passwordHash: string, actor: Actor): Promise<UserChange> {
  return db.$transaction(async (tx) => {
    const row = await tx.user.findUnique({ where: { id }, select: userSelect });
    if (!row) return { ok: false, reason: "not-found", message: "that user does not exist" };
    const changed = await tx.account.updateMany({ where: { userId: id, providerId: "credential" }, data: { password: passwordHash, updatedAt: new Date() } });
    if (changed.count !== 1) return { ok: false, reason: "not-found", message: `${row.email} has no password credential` };
    const ended = await tx.session.deleteMany({ where: { userId: id } });
    await tx.signInFailure.deleteMany({ where: { email: row.email } });
    await appendAudit(tx, { action: "set-password", entity: "user", entityId: id, actor, details: { email: row.email, sessions_ended: ended.count } });
    return { ok: true, user: row };
  });
}

/** Ends one session (the absolute expiry, or a disabled user's). */
export async function deleteSession(id: string): Promise<void> {
  await db.session.deleteMany({ where: { id } });
}

// ---- sign-in lockout and its audit entries ----

export async function recordSignInFailure(email: string, address: string): Promise<void> {
  await db.signInFailure.create({ data: { email: email.toLowerCase(), address } });
}

/** Refused sign-ins since `since`, for one account and for one address, and the newest of each. */
export async function signInFailuresSince(email: string, address: string, since: Date) {
  const [byAccount, byAddress, lastAccount, lastAddress] = await Promise.all([
    db.signInFailure.count({ where: { email: email.toLowerCase(), at: { gte: since } } }),
    db.signInFailure.count({ where: { address, at: { gte: since } } }),
    db.signInFailure.findFirst({ where: { email: email.toLowerCase(), at: { gte: since } }, orderBy: { at: "desc" }, select: { at: true } }),
    db.signInFailure.findFirst({ where: { address, at: { gte: since } }, orderBy: { at: "desc" }, select: { at: true } }),
  ]);
  return { byAccount, byAddress, lastAccountAt: lastAccount?.at ?? null, lastAddressAt: lastAddress?.at ?? null };
}

/** A successful sign-in clears the account's count (the lockout counts failures in a row). */
export async function clearSignInFailures(email: string): Promise<void> {
  await db.signInFailure.deleteMany({ where: { email: email.toLowerCase() } });
}

/** Audit entries of the session life: "sign-in", "sign-in-refused" (entity id: the user's, or the address typed), "sign-out", "signature-refused". */
export async function logSessionEvent(action: "sign-in" | "sign-in-refused" | "sign-out" | "signature-refused", entityId: string, actor: Actor, details: Record<string, unknown>): Promise<void> {
  await db.$transaction((tx) => appendAudit(tx, { action, entity: "user", entityId, actor, details }));
}
