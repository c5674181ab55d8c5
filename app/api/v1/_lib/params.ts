// Query and path parameters checked with the API's zod schemas; a refusal names the parameter (422).
import type { z } from "zod";
import { ApiProblem, validationProblem, problem, type Problem } from "@/lib/api/problem";
import { definitionKindSchema, type ApiDefinitionKind } from "@/lib/api/schemas";

/** The query string as one value per name; a repeated name is refused. */
export function queryOf<T extends z.ZodType>(req: Request, schema: T): z.infer<T> {
  const raw: Record<string, string> = {};
  for (const [k, v] of new URL(req.url).searchParams) {
    if (k in raw) throw new ApiProblem(problem("invalid-request", `query parameter '${k}' is given more than once`, { field: k }));
    raw[k] = v;
  }
  const parsed = schema.safeParse(raw);
  if (!parsed.success) throw new ApiProblem(validationProblem(parsed.error, "query parameter"));
  return parsed.data;
}

/** A body checked against its schema: 422 naming the first field at fault. */
export function bodyOf<T extends z.ZodType>(body: unknown, schema: T): z.infer<T> {
  const parsed = schema.safeParse(body);
  if (!parsed.success) throw new ApiProblem(validationProblem(parsed.error));
  return parsed.data;
}

/** Throws the problem of a refused service answer; returns its value otherwise. */
export function answered<T>(a: { ok: true; value: T } | { ok: false; problem: Problem }): T {
  if (!a.ok) throw new ApiProblem(a.problem);
  return a.value;
}

/** The definition kind in the path; any other word is a 404 (there is no such collection). */
export function kindOf(kind: string): ApiDefinitionKind {
  const k = definitionKindSchema.safeParse(kind);
  if (!k.success) throw new ApiProblem(problem("not-found", `there are no definitions of kind '${kind}' (kinds: product, pack, limits, profile)`, { field: "kind" }));
  return k.data;
}
