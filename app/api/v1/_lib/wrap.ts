// Inside the access wrapper (app/guard.ts guardRoute), `api` (apiRoute.ts) runs a /api/v1 handler with
// `wrap`: every thrown ApiProblem, a busy database, a full disk and any unexpected error become
// application/problem+json (RFC 9457), so no handler can leak an HTML error page.
import { ApiProblem, PROBLEM_CONTENT_TYPE, problem, type Problem } from "@/lib/api/problem";
import { StorageBusyError } from "@/lib/db/busy";
import { isDiskFull } from "@/lib/db/errors";

export function problemResponse(p: Problem, headers: Record<string, string> = {}): Response {
  return new Response(JSON.stringify(p), { status: p.status, headers: { "content-type": PROBLEM_CONTENT_TYPE, ...headers } });
}

export interface ApiContext<P> {
  params: P;
  /** the request's path, for `instance` */
  instance: string;
}

export type Handler<P, A> = (req: Request, ctx: ApiContext<P> & { actor: A }) => Promise<Response>;

export function wrap<P>(inner: (req: Request, ctx: ApiContext<P>) => Promise<Response>) {
  return async (req: Request, segment: { params: Promise<P> }): Promise<Response> => {
    const instance = new URL(req.url).pathname;
    try {
      return await inner(req, { params: await segment.params, instance });
    } catch (e) {
      if (e instanceof ApiProblem) return problemResponse({ ...e.problem, instance }, e.problem.status === 503 ? { "retry-after": "2" } : {});
      if (e instanceof StorageBusyError) return problemResponse(problem("busy", e.message, { instance }), { "retry-after": "2" });
      if (isDiskFull(e)) return problemResponse(problem("storage-full", "the server's disk is full, so nothing was stored; free some space (or ask the administrator to) and send the request again", { instance }));
      console.error(`${req.method} ${instance}:`, e);
      return problemResponse(problem("internal", "the server failed unexpectedly; nothing more is known here (see the server log)", { instance }));
    }
  };
}
