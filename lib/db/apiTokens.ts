// API tokens (issue 13): stored as the SHA-256 of the token, never the token. Creating and revoking one
// are audited in the same transaction; a token is revoked, never deleted (a trigger refuses both a
// delete and an un-revoke).
import { randomUUID } from "node:crypto";
import { db } from "./client";
import { appendAudit, type Tx } from "./audit";
import type { Actor } from "../access/actor";

export interface ApiTokenRow {
  id: string;
  name: string;
  scope: string;
  prefix: string;
  createdAt: Date;
  expiresAt: Date | null;
  revokedAt: Date | null;
  lastUsedAt: Date | null;
  /** a device token's monitor (the only one it may post readings to) */
  monitorId: string | null;
  user: { id: string; email: string; name: string; role: string; disabled: boolean };
}

const tokenSelect = {
  id: true, name: true, scope: true, prefix: true, createdAt: true, expiresAt: true, revokedAt: true, lastUsedAt: true, monitorId: true,
  user: { select: { id: true, email: true, name: true, role: true, disabled: true } },
} as const;

export async function tokenOwnerByEmail(email: string): Promise<{ id: string; email: string; name: string; role: string; disabled: boolean } | null> {
  return db.user.findUnique({ where: { email: email.trim().toLowerCase() }, select: { id: true, email: true, name: true, role: true, disabled: true } });
}

export interface NewApiToken {
  userId: string;
  name: string;
  scope: string;
  prefix: string;
  tokenSha256: string;
  expiresAt: Date | null;
  /** a device token's monitor */
  monitorId?: string | null;
}

export async function createApiToken(t: NewApiToken, actor: Actor): Promise<ApiTokenRow> {
  return db.$transaction((tx) => insertApiToken(tx, t, actor));
}

/** Stores a token and its "create" entry inside the caller's transaction (a monitor and its device token are one write). */
export async function insertApiToken(tx: Tx, t: NewApiToken, actor: Actor): Promise<ApiTokenRow> {
  const row = await tx.apiToken.create({ data: { id: randomUUID().replace(/-/g, ""), ...t, monitorId: t.monitorId ?? null, createdAt: new Date() }, select: tokenSelect });
  await appendAudit(tx, {
    action: "create",
    entity: "token",
    entityId: row.id,
    actor,
    details: {
      name: row.name, scope: row.scope, prefix: row.prefix, owner: { user_id: row.user.id, email: row.user.email, name: row.user.name }, expires_at: row.expiresAt?.toISOString() ?? null,
      ...(row.monitorId ? { monitor_id: row.monitorId } : {}),
    },
  });
  return row;
}

/**
 * The owner of a device token made by an actor that is not a person (the demo loader, the command line): the
 * first administrator, i.e. the oldest enabled admin account (a token needs an owner whose role it acts with,
 * and whom a list or an audit entry can name). Null when there is none.
 */
export async function firstAdministrator(): Promise<{ id: string; email: string } | null> {
  return db.user.findFirst({ where: { role: "admin", disabled: false }, orderBy: [{ createdAt: "asc" }, { id: "asc" }], select: { id: true, email: true } });
}

export async function listApiTokens(filter: { userId?: string; includeRevoked?: boolean } = {}): Promise<ApiTokenRow[]> {
  return db.apiToken.findMany({
    where: { userId: filter.userId, ...(filter.includeRevoked === false ? { revokedAt: null } : {}) },
    select: tokenSelect,
    orderBy: [{ createdAt: "desc" }, { id: "asc" }],
  });
}

export async function apiTokenById(id: string): Promise<ApiTokenRow | null> {
  return db.apiToken.findUnique({ where: { id }, select: tokenSelect });
}

export type RevokeOutcome = { ok: true; token: ApiTokenRow } | { ok: false; reason: "not-found" | "revoked"; message: string };

/** Revokes a token at once: the next request made with it is refused (401). */
export async function revokeApiToken(id: string, actor: Actor): Promise<RevokeOutcome> {
  return db.$transaction(async (tx) => {
    const row = await tx.apiToken.findUnique({ where: { id }, select: { revokedAt: true } });
    if (!row) return { ok: false, reason: "not-found", message: `there is no API token with id '${id}'` };
    if (row.revokedAt) return { ok: false, reason: "revoked", message: `the token was already revoked at ${row.revokedAt.toISOString()}` };
    const token = await tx.apiToken.update({ where: { id }, data: { revokedAt: new Date() }, select: tokenSelect });
    await appendAudit(tx, { action: "revoke", entity: "token", entityId: id, actor, details: { name: token.name, prefix: token.prefix, owner: { user_id: token.user.id, email: token.user.email } } });
    return { ok: true, token };
  });
}

/** The token with this hash and its owner, for authenticating a request. */
export async function apiTokenByHash(tokenSha256: string): Promise<(ApiTokenRow & { tokenSha256: string }) | null> {
  return db.apiToken.findUnique({ where: { tokenSha256 }, select: { ...tokenSelect, tokenSha256: true } });
}

/** Notes a use, at most once a minute per token, so that reads do not each cost a write. */
export async function touchApiToken(id: string, now: Date): Promise<void> {
  const minuteAgo = new Date(now.getTime() - 60_000);
  await db.apiToken.updateMany({ where: { id, OR: [{ lastUsedAt: null }, { lastUsedAt: { lt: minuteAgo } }] }, data: { lastUsedAt: now } });
}
