// API tokens: creation (shown once), listing, revocation, and turning an `Authorization: Bearer` header
// into the Actor a request acts as. A token acts with its owner's role narrowed by its scope; a token
// that is unknown, expired or revoked, or whose owner is disabled, is refused (401) with the reason.
import { z } from "zod";
import type { Actor } from "../access/actor";
import { ROLES, type Role, type TokenScope } from "../access/roles";
import { bearerToken, generateToken, hashToken, sameDigest, tokenState } from "../api/token";
import { tokenScopeSchema } from "../api/schemas";
import { getMonitor } from "../db/monitors";
import { apiTokenByHash, createApiToken, listApiTokens, revokeApiToken, tokenOwnerByEmail, touchApiToken, type ApiTokenRow, type RevokeOutcome } from "../db/apiTokens";

export const createTokenSchema = z.strictObject({
  email: z.string().trim().min(3, { message: "give the owner's e-mail address" }).max(320),
  name: z.string().trim().min(1, { message: "give the token a name saying what it is for" }).max(120, { message: "the name is longer than 120 characters" }),
  /** whole days until it expires; none: it lasts until revoked */
  expiresDays: z.number().int({ message: "must be a whole number of days" }).min(1, { message: "must be at least 1 day" }).max(3650, { message: "must be at most 3,650 days (ten years)" }).optional(),
  scope: tokenScopeSchema.default("read"),
  /** a device token's monitor: the one monitor it may post readings to */
  monitorId: z.string().trim().min(1, { message: "give the monitor's id" }).max(64).optional(),
});

export type CreatedToken = { id: string; token: string; scope: TokenScope; expires_at: string | null; prefix: string; owner: string; monitor_id: string | null };
export type CreateTokenOutcome = { ok: true; created: CreatedToken } | { ok: false; field: keyof z.input<typeof createTokenSchema>; message: string };

/** A new token for a user; the token itself is in the answer and nowhere else. */
export async function createToken(input: z.input<typeof createTokenSchema>, actor: Actor, now = new Date()): Promise<CreateTokenOutcome> {
  const parsed = createTokenSchema.safeParse(input);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    return { ok: false, field: String(issue.path[0]) as keyof z.input<typeof createTokenSchema>, message: issue.message };
  }
  const req = parsed.data;
  if (req.monitorId !== undefined && req.scope !== "device") return { ok: false, field: "monitorId", message: "only a device token is bound to a monitor (give the scope device)" };
  // a device token may only post readings to its monitor: one bound to none could do nothing at all
  if (req.monitorId === undefined && req.scope === "device") return { ok: false, field: "monitorId", message: "a device token posts readings to one monitor: choose the monitor it is for" };
  if (req.monitorId !== undefined && !(await getMonitor(req.monitorId))) return { ok: false, field: "monitorId", message: `there is no monitor with id '${req.monitorId}'` };
  const owner = await tokenOwnerByEmail(req.email);
  if (!owner) return { ok: false, field: "email", message: `there is no user with the e-mail address ${req.email}` };
  if (owner.disabled) return { ok: false, field: "email", message: `${owner.email} is disabled; a token of a disabled user could not be used` };
  const t = generateToken();
  const expiresAt = req.expiresDays === undefined ? null : new Date(now.getTime() + req.expiresDays * 86_400_000);
  const row = await createApiToken({ userId: owner.id, name: req.name, scope: req.scope, prefix: t.prefix, tokenSha256: t.sha256, expiresAt, monitorId: req.monitorId ?? null }, actor);
  return { ok: true, created: { id: row.id, token: t.token, scope: req.scope, expires_at: expiresAt?.toISOString() ?? null, prefix: t.prefix, owner: owner.email, monitor_id: row.monitorId } };
}

export interface TokenListItem {
  id: string;
  name: string;
  prefix: string;
  scope: string;
  /** a device token's monitor (null for other tokens) */
  monitor_id: string | null;
  owner: { email: string; name: string; role: string; disabled: boolean };
  created_at: string;
  expires_at: string | null;
  revoked_at: string | null;
  last_used_at: string | null;
  state: "active" | "expired" | "revoked";
}

export function tokenListItem(r: ApiTokenRow, now = new Date()): TokenListItem {
  return {
    id: r.id, name: r.name, prefix: r.prefix, scope: r.scope, monitor_id: r.monitorId,
    owner: { email: r.user.email, name: r.user.name, role: r.user.role, disabled: r.user.disabled },
    created_at: r.createdAt.toISOString(), expires_at: r.expiresAt?.toISOString() ?? null, revoked_at: r.revokedAt?.toISOString() ?? null,
    last_used_at: r.lastUsedAt?.toISOString() ?? null, state: tokenState(r, now),
  };
}

export async function listTokens(filter: { email?: string; includeRevoked?: boolean } = {}): Promise<{ ok: true; tokens: TokenListItem[] } | { ok: false; message: string }> {
  let userId: string | undefined;
  if (filter.email) {
    const owner = await tokenOwnerByEmail(filter.email);
    if (!owner) return { ok: false, message: `there is no user with the e-mail address ${filter.email}` };
    userId = owner.id;
  }
  const now = new Date();
  return { ok: true, tokens: (await listApiTokens({ userId, includeRevoked: filter.includeRevoked })).map((r) => tokenListItem(r, now)) };
}

export async function revokeToken(id: string, actor: Actor): Promise<RevokeOutcome> {
  return revokeApiToken(id, actor);
}

export type AuthorizationOutcome = { ok: true; actor: Actor } | { ok: false; message: string };

const isRole = (r: string): r is Role => (ROLES as readonly string[]).includes(r);

/** The actor of a request's `Authorization` header: a token acting for its owner, or why not. */
export async function actorFromAuthorization(header: string | null, now = new Date()): Promise<AuthorizationOutcome> {
  const b = bearerToken(header);
  if (b.kind === "none") return { ok: false, message: "send an API token as `Authorization: Bearer <token>` (create one with `corelag token create`)" };
  if (b.kind === "malformed") return { ok: false, message: "the Authorization header is not `Bearer <token>` with a Corelag token (clg_ and 43 characters)" };
  const sha256 = hashToken(b.token);
  const row = await apiTokenByHash(sha256);
  if (!row || !sameDigest(row.tokenSha256, sha256)) return { ok: false, message: "this token is not known here (it may be mistyped, or from another installation)" };
  const state = tokenState(row, now);
  if (state === "revoked") return { ok: false, message: `this token ('${row.name}', ${row.prefix}…) was revoked at ${row.revokedAt!.toISOString()}` };
  if (state === "expired") return { ok: false, message: `this token ('${row.name}', ${row.prefix}…) expired at ${row.expiresAt!.toISOString()}` };
  if (row.user.disabled) return { ok: false, message: `the owner of this token (${row.user.email}) is disabled` };
  if (!isRole(row.user.role)) return { ok: false, message: `the owner of this token has an unknown role '${row.user.role}'` };
  const scope = tokenScopeSchema.safeParse(row.scope);
  if (!scope.success) return { ok: false, message: `this token has an unknown scope '${row.scope}'` };
  await touchApiToken(row.id, now);
  return { ok: true, actor: { kind: "token", tokenId: row.id, tokenName: row.name, scope: scope.data, userId: row.user.id, name: row.user.name, role: row.user.role, ...(row.monitorId ? { monitorId: row.monitorId } : {}) } };
}
