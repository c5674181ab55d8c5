// Managing accounts: add, list, change role, disable (the admin page and `corelag user`), the one-time
// first administrator, and the demo accounts `npm start` creates with the demo data.
import { randomBytes } from "node:crypto";
import { z } from "zod";
import { ROLES, type Role } from "../access/roles";
import type { Actor } from "../access/actor";
import { config } from "../config";
import { hashPassword, verifyPassword } from "../db/passwords";
import { countUsers, createUser, credentialHash, listUsers, setUserDisabled, setUserPassword, setUserRole, userByEmail, userById, type CreateUserOutcome, type UserChange, type UserRow } from "../db/users";

export const MIN_PASSWORD_CHARS = 12;

export const newUserSchema = z.object({
  email: z.string().trim().toLowerCase().pipe(z.email({ message: "enter a valid e-mail address" })),
  name: z.string().trim().min(2, { message: "give the person's name (at least 2 characters)" }).max(120, { message: "at most 120 characters" }),
  role: z.enum(ROLES, { error: `choose a role: ${ROLES.join(", ")}` }),
  password: z.string().min(MIN_PASSWORD_CHARS, { message: `at least ${MIN_PASSWORD_CHARS} characters` }).max(256, { message: "at most 256 characters" }),
});
export type NewUserInput = { email: string; name: string; role: string; password: string };

export type AddUserOutcome = CreateUserOutcome | { ok: false; reason: "invalid"; field: string; message: string };

function invalid(error: z.ZodError): AddUserOutcome {
  const i = error.issues[0]!;
  return { ok: false, reason: "invalid", field: String(i.path[0] ?? "form"), message: i.message };
}

export async function addUser(input: NewUserInput, actor: Actor, opts: { demo?: boolean } = {}): Promise<AddUserOutcome> {
  const parsed = newUserSchema.safeParse(input);
  if (!parsed.success) return invalid(parsed.error);
  const u = parsed.data;
  return createUser({ email: u.email, name: u.name, role: u.role, passwordHash: await hashPassword(u.password), demo: opts.demo }, actor);
}

/** Whether the "create the administrator" page is offered: only while there is no user at all. */
export async function needsFirstAdmin(): Promise<boolean> {
  return (await countUsers()) === 0;
}

/** The one-time first administrator (refused once any user exists). */
export async function addFirstAdmin(input: Omit<NewUserInput, "role">, actor: Actor): Promise<AddUserOutcome> {
  const parsed = newUserSchema.safeParse({ ...input, role: "admin" });
  if (!parsed.success) return invalid(parsed.error);
  const u = parsed.data;
  return createUser({ email: u.email, name: u.name, role: "admin", passwordHash: await hashPassword(u.password) }, actor, { onlyIfNone: true });
}

export async function users(): Promise<UserRow[]> {
  return listUsers();
}

/** A user by id, or by e-mail (the CLI names users by e-mail). */
export async function findUser(idOrEmail: string): Promise<UserRow | null> {
  return idOrEmail.includes("@") ? userByEmail(idOrEmail) : userById(idOrEmail);
}

const roleSchema = z.enum(ROLES, { error: `choose a role: ${ROLES.join(", ")}` });

export async function changeRole(idOrEmail: string, role: string, actor: Actor): Promise<UserChange | { ok: false; reason: "invalid"; message: string }> {
  const r = roleSchema.safeParse(role);
  if (!r.success) return { ok: false, reason: "invalid", message: r.error.issues[0]!.message };
  const u = await findUser(idOrEmail);
  if (!u) return { ok: false, reason: "not-found", message: `no user ${idOrEmail}` };
  return setUserRole(u.id, r.data, actor);
}

export async function changeDisabled(idOrEmail: string, disabled: boolean, actor: Actor): Promise<UserChange> {
  const u = await findUser(idOrEmail);
  if (!u) return { ok: false, reason: "not-found", message: `no user ${idOrEmail}` };
  return setUserDisabled(u.id, disabled, actor);
}

const passwordSchema = newUserSchema.shape.password;

/**
 * Sets a new password (an administrator's reset on the Users page, or `corelag user set-password`): the same
 * rules as a new account's; the user's sessions end and a lockout lifts (lib/db/users.ts setUserPassword).
 */
export async function resetPassword(idOrEmail: string, password: string, actor: Actor): Promise<UserChange | { ok: false; reason: "invalid"; message: string }> {
  const p = passwordSchema.safeParse(password);
  if (!p.success) return { ok: false, reason: "invalid", message: p.error.issues[0]!.message };
  const u = await findUser(idOrEmail);
  if (!u) return { ok: false, reason: "not-found", message: `no user ${idOrEmail}` };
  return setUserPassword(u.id, await hashPassword(p.data), actor);
}

/** The password re-entered at signing (the second component of an electronic signature) checked against the stored hash. */
export async function passwordMatches(userId: string, password: string): Promise<boolean> {
  const stored = await credentialHash(userId);
  return stored !== null && password.length > 0 && (await verifyPassword(stored, password));
}

// ---- demo accounts ----

export const DEMO_ACCOUNTS: ReadonlyArray<{ role: Role; email: string; name: string }> = [
  { role: "admin", email: "admin@corelag.test", name: "Ilse Admin (demo)" },
  { role: "reviewer", email: "reviewer@corelag.test", name: "Tomas Reviewer (demo)" },
  { role: "designer", email: "designer@corelag.test", name: "Noor Designer (demo)" },
  { role: "auditor", email: "auditor@corelag.test", name: "Wren Auditor (demo)" },
];

/**
 * One demo account per role, when there is no user yet. Their password is CORELAG_DEMO_PASSWORD when set
 * (tests only), else a random one per account; the caller prints them once. Returns the accounts created.
 */
export async function createDemoAccounts(actor: Actor): Promise<Array<{ role: Role; email: string; name: string; password: string }>> {
  if ((await countUsers()) > 0) return [];
  const fixed = config().CORELAG_DEMO_PASSWORD;
  const made: Array<{ role: Role; email: string; name: string; password: string }> = [];
  for (const a of DEMO_ACCOUNTS) {
    const password = fixed ?? randomBytes(12).toString("base64url");
    const res = await addUser({ ...a, password }, actor, { demo: true });
    if (!res.ok) throw new Error(`demo account ${a.email}: ${res.message}`);
    made.push({ ...a, password });
  }
  return made;
}
