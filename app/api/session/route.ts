import { publicRoute, guardRoute } from "@/app/guard";
import { signIn, signInSchema, signOut } from "@/lib/services/access";

export const dynamic = "force-dynamic";

/**
 * Sign in from a script or a test: JSON `{ "email", "password" }` → 200 `{ user }` with the session
 * cookie, 401 when refused, 429 when the account or address is locked, 422 for a body that does not
 * validate. The same lockout and audit as the sign-in page (lib/services/access.ts signIn).
 */
export const POST = publicRoute("signing in is what an anonymous caller does", async (req: Request) => {
  let body: unknown;
  try {
    body = await req.json();
  } catch {
    return Response.json({ error: "the body is not valid JSON" }, { status: 400 });
  }
  const parsed = signInSchema.safeParse(body);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    return Response.json({ error: `${issue.path.join(".") || "body"}: ${issue.message}`, field: issue.path.join(".") }, { status: 422 });
  }
  const res = await signIn(parsed.data, req.headers);
  if (!res.ok) return Response.json({ error: res.message, locked: res.locked ?? false }, { status: res.locked ? 429 : 401 });
  const { kind: _k, ...user } = res.actor;
  return Response.json({ user });
});

/** Sign out: ends the session of the request's cookie. */
export const DELETE = guardRoute("read", async (req: Request) => {
  await signOut(req.headers);
  return new Response(null, { status: 204 });
});
