// How the access wrapper (app/guard.ts) words a refusal under /api/v1: an RFC 9457 problem that says
// why, so a client developer can act on it (which token check failed, or which scope or role is short).
import type { Actor } from "../access/actor";
import { rolesAllowing, type Permission } from "../access/roles";
import { problem, type Problem } from "../api/problem";
import { actorFromAuthorization } from "./apiTokens";

export const isApiPath = (req: Request) => new URL(req.url).pathname.startsWith("/api/v1/");

/** Why an actor may not do something, in words a client developer can act on. */
export function forbiddenDetail(actor: Actor | null, permission: Permission, fallback: string): string {
  if (actor?.kind === "token" && actor.scope !== "write") {
    return `this token's scope is '${actor.scope}'${actor.scope === "read" ? ", which only reads" : ", which only posts readings"}; '${permission}' needs a write token`;
  }
  if (actor?.kind === "token" || actor?.kind === "user") return `the role '${actor.role}' does not allow '${permission}' (roles that do: ${rolesAllowing(permission).join(", ")})`;
  return fallback;
}

export async function apiRefusal(req: Request, auth: { status: 401 | 403; message: string; actor: Actor | null }, permission: Permission): Promise<Problem> {
  const instance = new URL(req.url).pathname;
  if (auth.status === 403) return problem("forbidden", forbiddenDetail(auth.actor, permission, auth.message), { instance });
  const header = req.headers.get("authorization");
  if (header === null) return problem("unauthorized", "send an API token as `Authorization: Bearer <token>` (create one with `corelag token create`), or sign in", { instance });
  const why = await actorFromAuthorization(header);
  return problem("unauthorized", why.ok ? auth.message : why.message, { instance });
}
