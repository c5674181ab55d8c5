// Errors of the HTTP API as RFC 9457 problem details (application/problem+json). Each kind of problem
// has a stable `type` URI under /api/v1/problems/ (described there and on the API page), the HTTP
// status, a one-line `title` that never changes, a `detail` that says what was wrong with this request,
// and, where known, the part of the request at fault: `field` (a body field path, a query parameter or
// a path parameter), or `row` and `column` of an uploaded file.
import type { z } from "zod";

export const PROBLEM_CONTENT_TYPE = "application/problem+json";

export const PROBLEM_KINDS = {
  unauthorized: { status: 401, title: "No valid API token", about: "The request has no `Authorization: Bearer <token>` header, or the token is unknown, expired or revoked, or its owner is disabled." },
  forbidden: { status: 403, title: "Not allowed for this token", about: "The token's owner's role, or the token's scope, does not allow this request." },
  "not-found": { status: 404, title: "No such record", about: "The id in the path names no stored record of that kind." },
  conflict: { status: 409, title: "The record is in a state that refuses this", about: "For example, a review that is already signed off cannot be signed again; a correction is a new review." },
  "too-large": { status: 413, title: "The request body is over the limit", about: "The body was refused as it streamed in, once it passed the limit; nothing was stored." },
  "unsupported-media-type": { status: 415, title: "The body's content type is not accepted", about: "JSON endpoints take application/json." },
  "invalid-request": { status: 422, title: "The request does not validate", about: "A body field, query parameter or path parameter is missing or wrong; `field` names it. Nothing was stored." },
  "invalid-file": { status: 422, title: "The file was refused", about: "The uploaded logger file could not be imported; `row` and `column` name the first problem where known. Nothing was stored." },
  "signature-refused": { status: 422, title: "The signature was refused", about: "The password (the second signature component) did not match, or the decision needs a comment." },
  "invalid-readings": { status: 422, title: "Readings refused", about: "A monitor's batch of readings was refused; `refused` lists each reading at fault. Without ?partial=true nothing was stored." },
  busy: { status: 503, title: "The database is busy", about: "Other writes held the database through every retry; nothing was stored. Send the request again after the Retry-After seconds." },
  "storage-full": { status: 507, title: "The server's disk is full", about: "Nothing was stored; ask the administrator to free space and send the request again." },
  internal: { status: 500, title: "Unexpected failure", about: "The server failed in a way it did not expect; the server log has the details." },
} as const satisfies Record<string, { status: number; title: string; about: string }>;

export type ProblemKind = keyof typeof PROBLEM_KINDS;

export const problemTypeUri = (kind: ProblemKind) => `/api/v1/problems/${kind}`;

export interface Problem {
  type: string;
  title: string;
  status: number;
  detail: string;
  /** the body field path (dotted), query parameter or path parameter at fault */
  field?: string;
  /** 1-based row of an uploaded file */
  row?: number;
  /** column (header name) of an uploaded file */
  column?: string;
  /** invalid-readings: each refused reading of a monitor's batch, by its 0-based index in the request */
  refused?: Array<{ index: number; reason: string }>;
  /** the request path this problem answers */
  instance?: string;
}

export function problem(kind: ProblemKind, detail: string, where: { field?: string; row?: number; column?: string; instance?: string } = {}): Problem {
  const k = PROBLEM_KINDS[kind];
  return {
    type: problemTypeUri(kind),
    title: k.title,
    status: k.status,
    detail,
    ...(where.field !== undefined ? { field: where.field } : {}),
    ...(where.row !== undefined ? { row: where.row } : {}),
    ...(where.column !== undefined ? { column: where.column } : {}),
    ...(where.instance !== undefined ? { instance: where.instance } : {}),
  };
}

/** A problem thrown inside a handler; the route wrapper answers it as problem+json. */
export class ApiProblem extends Error {
  constructor(readonly problem: Problem) {
    super(problem.detail);
    this.name = "ApiProblem";
  }
}

/**
 * 422 for the first zod issue, naming its path: `where` is what the path is in ("body field", "query
 * parameter", "path parameter"); `rename` maps an internal path to the name the caller used.
 */
export function validationProblem(error: z.ZodError, where = "body field", rename: (path: string) => string = (p) => p): Problem {
  const issue = error.issues[0]!;
  if (issue.code === "unrecognized_keys" && issue.keys.length > 0) {
    const prefix = issue.path.map(String).join(".");
    const field = rename(prefix ? `${prefix}.${issue.keys[0]}` : issue.keys[0]!);
    return problem("invalid-request", `${where} '${field}' is not accepted here`, { field });
  }
  const path = issue.path.map(String).join(".");
  const field = path ? rename(path) : where.split(" ")[0]!;
  return problem("invalid-request", path ? `${where} '${field}': ${issue.message}` : `${field}: ${issue.message}`, { field });
}
