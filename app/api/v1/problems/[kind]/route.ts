import { guardRoute } from "@/app/guard";
import { PROBLEM_KINDS, problem, type ProblemKind } from "@/lib/api/problem";
import { api } from "../../_lib/apiRoute";
import { problemResponse } from "../../_lib/wrap";

export const dynamic = "force-dynamic";

/** What a problem `type` URI means: every problem the API answers links here. */
export const GET = guardRoute("read", api<{ kind: string }>(async (_req, { params, instance }) => {
  const k = PROBLEM_KINDS[params.kind as ProblemKind];
  if (!Object.hasOwn(PROBLEM_KINDS, params.kind) || !k) return problemResponse(problem("not-found", `there is no problem type '${params.kind}'`, { field: "kind", instance }));
  return Response.json({ type: instance, status: k.status, title: k.title, description: k.about });
}));
