import { redirect } from "next/navigation";
import { needsFirstAdmin } from "@/lib/services/users";
import { SetupForm } from "./SetupForm";

export const dynamic = "force-dynamic";

/** Offered once: while the database has no user at all (CORELAG_DEMO=0 on a new database). */
export default async function SetupPage() {
  if (!(await needsFirstAdmin())) redirect("/sign-in");
  return (
    <section className="narrow">
      <h1>Create the administrator</h1>
      <p>This installation has no accounts yet. The first account is an administrator, who then adds the other users and gives each a role. This page disappears once an account exists.</p>
      <p className="hint muted">From a shell instead: <code>npm run -s corelag -- user add --email E --name N --role admin --password-stdin</code></p>
      <SetupForm />
    </section>
  );
}
