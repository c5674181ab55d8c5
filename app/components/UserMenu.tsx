import Link from "next/link";
import type { Actor } from "@/lib/access/actor";
import { SignOutButton } from "./SignOutButton";

/** Who is signed in (name, role, a demo badge) and the way out. */
export function UserMenu({ actor, demo }: { actor: Actor; demo: boolean }) {
  if (actor.kind !== "user") return null;
  return (
    <div className="user-menu" data-testid="user-menu">
      <span data-testid="user-name">{actor.name}</span>
      <span className="role" data-testid="user-role">{actor.role}</span>
      {demo && <span className="badge demo" data-testid="demo-badge" title="a demo account: its password was printed in the start log">demo account</span>}
      {actor.role === "admin" && <Link href="/users">Users</Link>}
      {actor.role === "admin" && <Link href="/tokens">API tokens</Link>}
      <SignOutButton />
    </div>
  );
}
