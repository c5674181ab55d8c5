import { notFound } from "next/navigation";
import { can, pageActor } from "@/app/guard";
import { users } from "@/lib/services/users";
import { formatTime } from "@/lib/display/time";
import { displayZone } from "@/app/displayZone";
import { AddUserForm, DisableForm, PasswordForm, RoleForm } from "./UserForms";

export const dynamic = "force-dynamic";

const ROLE_WORDS: Record<string, string> = {
  admin: "users, roles and settings; everything below",
  reviewer: "import traces, edit definitions, run and sign off reviews",
  designer: "edit definitions and run design studies; cannot sign off",
  auditor: "read and export everything, re-check; writes nothing",
};

export default async function UsersPage() {
  const actor = await pageActor();
  if (!can(actor, "user:admin")) notFound();
  const [rows, zone] = [await users(), await displayZone()];
  return (
    <section>
      <h1>Users</h1>
      <p className="hint">Each person has one role. Role changes, new passwords, disabling and enabling are recorded in the audit log (never the password). A disabled user cannot sign in and their sessions end at once; so do the sessions of a user given a new password, whose lockout also lifts.</p>
      <ul className="hint">
        {Object.entries(ROLE_WORDS).map(([r, w]) => <li key={r}><strong>{r}</strong>: {w}</li>)}
      </ul>
      <table data-testid="user-list">
        <thead><tr><th>Name</th><th>E-mail</th><th>Role</th><th>Status</th><th>Added</th><th /></tr></thead>
        <tbody>
          {rows.map((u) => (
            <tr key={u.id} data-testid={`user-${u.email}`}>
              <td>{u.name} {u.demo && <span className="badge demo" title="created with the demo data; its password was printed in the start log">demo</span>}</td>
              <td>{u.email}</td>
              <td><RoleForm userId={u.id} role={u.role} /></td>
              <td>{u.disabled ? "disabled" : "active"}</td>
              <td>{formatTime(u.createdAt, zone)}</td>
              <td><DisableForm userId={u.id} disabled={u.disabled} /> <PasswordForm userId={u.id} email={u.email} /></td>
            </tr>
          ))}
        </tbody>
      </table>
      <h2>Add a user</h2>
      <AddUserForm />
    </section>
  );
}
