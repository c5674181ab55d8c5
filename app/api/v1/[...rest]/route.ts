import { guardRoute } from "@/app/guard";
import { problem } from "@/lib/api/problem";
import { api } from "../_lib/apiRoute";
import { problemResponse } from "../_lib/wrap";

export const dynamic = "force-dynamic";

/** Any other path under /api/v1: a problem+json 404 naming it (after the token check), not the app's HTML page. */
const notFound = api<{ rest: string[] }>(async (req, { instance }) =>
  problemResponse(problem("not-found", `there is no endpoint ${req.method} ${instance}; GET /api/v1/openapi.json lists them`, { instance })),
);
export const GET = guardRoute("read", notFound);
export const POST = guardRoute("read", notFound);
export const PUT = guardRoute("read", notFound);
export const PATCH = guardRoute("read", notFound);
export const DELETE = guardRoute("read", notFound);
