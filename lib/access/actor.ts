// The one who asks: a signed-in user, an API token (acting for its owner), or the command line (the
// operating-system user). Audit entries name the actor by `actorLabel`, and store `actorRecord` in details.
import { allows, scopeAllows, type Permission, type Role, type TokenScope } from "./roles";

export type Actor =
  | { kind: "user"; userId: string; name: string; email: string; role: Role }
  | { kind: "token"; tokenId: string; tokenName: string; scope: TokenScope; userId: string; name: string; role: Role; monitorId?: string }
  | { kind: "cli"; osUser: string }
  | { kind: "system"; what: string };

/** Whether an actor may do something. The CLI runs with the rights of whoever can open the database file. */
export function actorAllows(actor: Actor, permission: Permission): boolean {
  switch (actor.kind) {
    case "user":
      return allows(actor.role, permission);
    case "token":
      return allows(actor.role, permission) && scopeAllows(actor.scope, permission);
    case "cli":
    case "system":
      return true;
  }
}

/** The audit log's one-line actor: "Ada Reviewer <ada@…>", "token Gateway (of Ada Reviewer)", "cli:ops", "system:demo". */
export function actorLabel(actor: Actor): string {
  switch (actor.kind) {
    case "user":
      return `${actor.name} <${actor.email}>`;
    case "token":
      return `token ${actor.tokenName} (${actor.tokenId}) of ${actor.name}`;
    case "cli":
      return `cli:${actor.osUser}`;
    case "system":
      return `system:${actor.what}`;
  }
}

/** The structured actor kept in an audit entry's details, so an archive can tell users and tokens apart. */
export function actorRecord(actor: Actor): Record<string, string> {
  switch (actor.kind) {
    case "user":
      return { kind: "user", user_id: actor.userId, name: actor.name };
    case "token":
      return { kind: "token", token_id: actor.tokenId, token_name: actor.tokenName, user_id: actor.userId, name: actor.name };
    case "cli":
      return { kind: "cli", os_user: actor.osUser };
    case "system":
      return { kind: "system", what: actor.what };
  }
}

/** The command line's actor: the operating-system user running it ("cli:ops"); USER/LOGNAME when the OS lookup fails. */
export function cliActor(osUser: string): Actor {
  return { kind: "cli", osUser: osUser || "unknown" };
}
