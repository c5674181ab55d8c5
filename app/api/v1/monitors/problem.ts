// RFC 9457 problem details for the monitor routes, in the shape of the /api/v1 conventions (type URI under
// /api/v1/problems/, title, status, detail, field). Replace with lib/api/problem.ts once that is on main.
export type MonitorProblemKind = "unauthorized" | "forbidden" | "not-found" | "conflict" | "unsupported-media-type" | "invalid-request" | "invalid-readings";

const TITLES: Record<MonitorProblemKind, [number, string]> = {
  unauthorized: [401, "No valid API token"],
  forbidden: [403, "Not allowed for this token"],
  "not-found": [404, "No such record"],
  conflict: [409, "The record is in a state that refuses this"],
  "unsupported-media-type": [415, "The body's content type is not accepted"],
  "invalid-request": [422, "The request does not validate"],
  "invalid-readings": [422, "Readings refused"],
};

export function problemResponse(kind: MonitorProblemKind, detail: string, extra: Record<string, unknown> = {}, instance?: string): Response {
  const [status, title] = TITLES[kind];
  return new Response(JSON.stringify({ type: `/api/v1/problems/${kind}`, title, status, detail, ...extra, ...(instance ? { instance } : {}) }), { status, headers: { "Content-Type": "application/problem+json" } });
}
