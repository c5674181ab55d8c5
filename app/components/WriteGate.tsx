import type { ReactNode } from "react";
import { rolesAllowing, type Permission } from "@/lib/access/roles";
import { can, pageActor } from "@/app/guard";

/**
 * Shows a write control only to those whose role may use it; others read a line saying who can. The
 * server still refuses the write itself (app/guard.ts): this only keeps controls a role cannot use off its pages.
 */
export async function WriteGate({ permission, children }: { permission: Permission; children: ReactNode }) {
  const actor = await pageActor();
  if (can(actor, permission)) return <>{children}</>;
  const role = actor.kind === "user" || actor.kind === "token" ? actor.role : actor.kind;
  return (
    <p className="muted" data-testid="read-only">
      Your role ({role}) reads this page; this needs the {rolesAllowing(permission).join(" or ")} role.
    </p>
  );
}
