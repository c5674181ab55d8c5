// Every authenticated /api/v1 route handler is made as
//   export const GET = guardRoute("read", api<{ id: string }>(async (req, { params, actor, instance }) => …));
// guardRoute (app/guard.ts) is the one access wrapper of the app: it resolves the caller (an API token, or
// a session) and checks the permission before the handler runs, answering refusals under /api/v1 as
// problem+json. `api` then turns every thrown ApiProblem into problem+json (lib/api/problem.ts).
import type { Actor } from "@/lib/access/actor";
import { wrap, type Handler } from "./wrap";

export function api<P = Record<string, never>>(handler: Handler<P, Actor>) {
  return (req: Request, segment: { params: Promise<P> }, actor: Actor): Promise<Response> => wrap<P>((r, ctx) => handler(r, { ...ctx, actor }))(req, segment);
}
