import { NextResponse, type NextRequest } from "next/server";
import { sessionWithCookies } from "@/lib/services/access";

/**
 * Refuses an oversized request body before Next.js reads it. A server action's body over
 * `serverActions.bodySizeLimit` (next.config.js) otherwise ends in an HTTP 500 with an empty body;
 * here it is a 413 saying what the limit is. The upload route has its own, larger limit.
 * The size comes from Content-Length, which browsers always send for form posts.
 */
const MB = 1024 * 1024;
/** Keep equal to next.config.js experimental.serverActions.bodySizeLimit. */
export const ACTION_BODY_LIMIT_BYTES = 50 * MB;
/** Keep above app/api/traces/route.ts MAX_BYTES (the file) plus room for the form's other fields. */
export const UPLOAD_BODY_LIMIT_BYTES = 201 * MB;

/** Pages anyone may open: signing in, the one-time first administrator, and the health check. */
const PUBLIC_PATHS = new Set(["/sign-in", "/setup", "/api/v1/health"]);
/**
 * Route handlers outside /api/: they answer 401/403 themselves (app/guard.ts guardRoute), so a script gets
 * a status rather than the sign-in page. Everything else is a page, which needs a session here.
 */
const ROUTE_HANDLERS = [/^\/api\//, /^\/traces\/[^/]+\/original$/, /^\/audit\/export\.csv$/, /^\/reviews\/[^/]+\/export\/[^/]+$/, /^\/monitors\/badge$/, /^\/monitors\/[^/]+\/events$/];

export function isRouteHandlerPath(pathname: string): boolean {
  return ROUTE_HANDLERS.some((r) => r.test(pathname));
}

/**
 * Every page needs a signed-in user (a valid session, read fresh from the database: an ended or
 * disabled session counts as none); without one a page request goes to the sign-in page. Server
 * actions and route handlers are let through to their wrappers (app/guard.ts), which refuse them.
 */
export async function proxy(req: NextRequest): Promise<NextResponse> {
  const tooLarge = refuseOversized(req);
  if (tooLarge) return tooLarge;
  const path = req.nextUrl.pathname;
  if (PUBLIC_PATHS.has(path) || isRouteHandlerPath(path) || req.headers.has("next-action")) return NextResponse.next();
  const { actor, setCookies } = await sessionWithCookies(req.headers);
  if (actor) {
    const res = NextResponse.next();
    for (const c of setCookies) res.headers.append("set-cookie", c);
    return res;
  }
  const to = req.nextUrl.clone();
  to.pathname = "/sign-in";
  to.search = path === "/" ? "" : `?next=${encodeURIComponent(path + req.nextUrl.search)}`;
  return NextResponse.redirect(to);
}

function refuseOversized(req: NextRequest): NextResponse | null {
  if (req.method !== "POST") return null;
  const length = Number(req.headers.get("content-length"));
  if (!Number.isFinite(length)) return null;
  const isAction = req.headers.has("next-action");
  const isUpload = req.nextUrl.pathname === "/api/traces" || /^\/api\/shipments\/[^/]+\/batch$/.test(req.nextUrl.pathname);
  const limit = isAction ? ACTION_BODY_LIMIT_BYTES : isUpload ? UPLOAD_BODY_LIMIT_BYTES : undefined;
  if (limit === undefined || length <= limit) return null;
  const what = isAction ? "form" : "upload";
  return NextResponse.json(
    { error: `the ${what} is ${(length / MB).toFixed(1)} MB; at most ${Math.floor(limit / MB)} MB can be sent. Nothing was stored.` },
    { status: 413 },
  );
}

export const config = { matcher: ["/((?!_next/static|_next/image|favicon.ico).*)"] };
