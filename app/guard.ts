// The wrappers every server action and route handler is made with (tests/integration/access.test.ts
// enumerates app/ and checks that each refuses an anonymous caller and a caller with too small a role).
// The permission is checked before the handler runs; the handler receives the Actor to record.
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { actorAllows, type Actor } from "@/lib/access/actor";
import type { Permission } from "@/lib/access/roles";
import { actorFromRequest, authorize, type Authorization } from "@/lib/services/access";
import { apiRefusal, isApiPath } from "@/lib/services/apiRefusal";

/** A server action's state always has room for a message; a refusal is one. */
type WithMessage = { message?: string };

/**
 * A server action that needs `permission`. Export it from a "use server" file:
 *   export const saveProduct = guardAction("definition:edit", async (actor, prev: FormState, form: FormData) => …);
 * A refused caller gets `{ message: "Not signed in: …" | "Not allowed: …" }` and nothing else happens.
 */
export function guardAction<A extends unknown[], R extends WithMessage>(permission: Permission, handler: (actor: Actor, ...args: A) => Promise<R>): (...args: A) => Promise<R> {
  return async (...args: A): Promise<R> => {
    const auth = await authorize(await headers(), permission);
    if (!auth.ok) return { message: auth.message, refused: auth.status } as unknown as R;
    return handler(auth.actor, ...args);
  };
}

/** A server action anyone may call (signing in, creating the first administrator). Say why in `reason`. */
export function publicAction<A extends unknown[], R>(reason: string, handler: (...args: A) => Promise<R>): (...args: A) => Promise<R> {
  void reason;
  return handler;
}

type RouteHandler<C> = (req: Request, ctx: C) => Promise<Response>;

/**
 * Whether a cookie-authenticated write came from this site: the Origin header must name the host the
 * request was sent to. (Server actions get the same check from Next.js; route handlers do not.)
 * Requests with `Authorization: Bearer` carry no ambient credential and are not checked.
 */
function sameOrigin(req: Request): boolean {
  const origin = req.headers.get("origin");
  if (!origin) return false;
  const host = req.headers.get("x-forwarded-host")?.split(",")[0]?.trim() ?? req.headers.get("host");
  try {
    return host !== null && new URL(origin).host === host;
  } catch {
    return false;
  }
}

/**
 * A route handler that needs `permission`:
 *   export const GET = guardRoute("read", async (req, ctx: { params: Promise<{ id: string }> }, actor) => …);
 * 401 without a valid session or token, 403 with too small a role or from another origin; JSON `{ error }`.
 */
export function guardRoute<C = unknown>(permission: Permission, handler: (req: Request, ctx: C, actor: Actor) => Promise<Response>): RouteHandler<C> {
  return async (req: Request, ctx: C): Promise<Response> => {
    const write = req.method !== "GET" && req.method !== "HEAD";
    // Only a request that carries a cookie has an ambient credential to misuse; without one it is simply anonymous (401).
    if (write && !req.headers.has("authorization") && req.headers.has("cookie") && !sameOrigin(req)) {
      const message = "refused: this request did not come from a page of this site (the Origin header is missing or names another site)";
      return isApiPath(req) ? refusalResponse(req, { ok: false, status: 403, message, actor: null }, permission) : Response.json({ error: message }, { status: 403 });
    }
    const auth = await authorize(req.headers, permission);
    if (!auth.ok) return refusalResponse(req, auth, permission);
    return handler(req, ctx, auth.actor);
  };
}

/** A refusal: `{ error }` JSON, or under /api/v1 an RFC 9457 problem saying why the token was refused. */
async function refusalResponse(req: Request, auth: Extract<Authorization, { ok: false }>, permission: Permission): Promise<Response> {
  const headers: Record<string, string> = auth.status === 401 ? { "www-authenticate": 'Bearer realm="corelag"' } : {};
  if (!isApiPath(req)) return Response.json({ error: auth.message }, { status: auth.status, headers });
  const p = await apiRefusal(req, auth, permission);
  return new Response(JSON.stringify(p), { status: p.status, headers: { ...headers, "content-type": "application/problem+json" } });
}

/**
 * A route handler anyone may call (signing in). Say why in `reason`. A cookie-less request is fine; a
 * request that names an Origin must name this site's.
 */
export function publicRoute<C = unknown>(reason: string, handler: (req: Request, ctx: C) => Promise<Response>): RouteHandler<C> {
  void reason;
  return async (req: Request, ctx: C): Promise<Response> => {
    if (req.headers.has("origin") && !sameOrigin(req)) return Response.json({ error: "refused: the Origin header names another site" }, { status: 403 });
    return handler(req, ctx);
  };
}

/** The signed-in actor for a page, or a redirect to the sign-in page (proxy.ts has already checked). */
export async function pageActor(): Promise<Actor> {
  const actor = await actorFromRequest(await headers());
  if (!actor) redirect("/sign-in");
  return actor;
}

/** Whether the page's actor may do something (to show or hide a write control; the action checks again). */
export function can(actor: Actor, permission: Permission): boolean {
  return actorAllows(actor, permission);
}
