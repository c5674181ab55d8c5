// Who may do what. One role per user (issue 13); a token acts with its owner's role narrowed by its scope.
// Pure: the wrapper that every server action and route handler goes through (lib/services/access.ts)
// asks `allows` before it does anything.

export const ROLES = ["admin", "reviewer", "designer", "auditor"] as const;
export type Role = (typeof ROLES)[number];

/** Everything a request can ask to do. Reads are one permission; each kind of write is its own. */
export const PERMISSIONS = [
  "read", // open any page or record, export, re-check (the audit entries a read causes are not writes)
  "trace:import",
  "definition:edit",
  "review:run",
  "review:sign",
  "design:run",
  "shipment:edit",
  "monitor:edit",
  "monitor:post-readings",
  "user:admin", // users, roles, tokens, settings
] as const;
export type Permission = (typeof PERMISSIONS)[number];

const GRANTS: Record<Role, readonly Permission[]> = {
  admin: PERMISSIONS,
  reviewer: ["read", "trace:import", "definition:edit", "review:run", "review:sign", "shipment:edit", "monitor:edit", "monitor:post-readings"],
  designer: ["read", "definition:edit", "design:run"],
  auditor: ["read"],
};

export function allows(role: Role, permission: Permission): boolean {
  return GRANTS[role].includes(permission);
}

/** The smallest role names that hold a permission, for "needs the reviewer or admin role" messages. */
export function rolesAllowing(permission: Permission): Role[] {
  return ROLES.filter((r) => allows(r, permission));
}

export const TOKEN_SCOPES = ["read", "write", "device"] as const;
export type TokenScope = (typeof TOKEN_SCOPES)[number];

/**
 * What a token may do: `read` only reads; `write` all its owner's role allows; `device` only posts readings
 * to the monitors it is bound to (the binding is checked where the monitor is known).
 */
export function scopeAllows(scope: TokenScope, permission: Permission): boolean {
  if (scope === "read") return permission === "read";
  if (scope === "device") return permission === "monitor:post-readings";
  return true;
}
