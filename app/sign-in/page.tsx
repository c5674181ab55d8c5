import { redirect } from "next/navigation";
import { headers } from "next/headers";
import { needsFirstAdmin } from "@/lib/services/users";
import { actorFromRequest } from "@/lib/services/access";
import { SignInForm } from "./SignInForm";

export const dynamic = "force-dynamic";

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const sp = await searchParams;
  if (await needsFirstAdmin()) redirect("/setup");
  if (await actorFromRequest(await headers())) redirect(sp.next && sp.next.startsWith("/") && !sp.next.startsWith("//") ? sp.next : "/");
  return (
    <section className="narrow">
      <h1>Sign in</h1>
      {sp.created && <p className="notice" data-testid="admin-created">The administrator account exists. Sign in with it, then add the other users under Users.</p>}
      {sp.signed_out && <p className="notice" data-testid="signed-out">You are signed out.</p>}
      <SignInForm next={sp.next} />
      <p className="hint muted">Accounts are given by an administrator. Sessions end after 30 minutes without use and 12 hours after signing in.</p>
    </section>
  );
}
