import { NextResponse, type NextRequest } from "next/server";

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

export function proxy(req: NextRequest): NextResponse {
  if (req.method !== "POST") return NextResponse.next();
  const length = Number(req.headers.get("content-length"));
  if (!Number.isFinite(length)) return NextResponse.next();
  const isAction = req.headers.has("next-action");
  const isUpload = req.nextUrl.pathname === "/api/traces" || /^\/api\/shipments\/[^/]+\/batch$/.test(req.nextUrl.pathname);
  const limit = isAction ? ACTION_BODY_LIMIT_BYTES : isUpload ? UPLOAD_BODY_LIMIT_BYTES : undefined;
  if (limit === undefined || length <= limit) return NextResponse.next();
  const what = isAction ? "form" : "upload";
  return NextResponse.json(
    { error: `the ${what} is ${(length / MB).toFixed(1)} MB; at most ${Math.floor(limit / MB)} MB can be sent. Nothing was stored.` },
    { status: 413 },
  );
}

export const config = { matcher: ["/((?!_next/static|_next/image|favicon.ico).*)"] };
