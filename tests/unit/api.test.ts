// The HTTP API's pure parts: token format and hashing, bearer parsing, scopes, problem details, the
// import query parameters, and the OpenAPI document against the route files and its own schemas.
import { existsSync, readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { describe, expect, test } from "vitest";
import { bearerToken, generateToken, hashToken, isTokenShaped, sameDigest, tokenPrefix, tokenState } from "@/lib/api/token";
import { PROBLEM_KINDS, problem, validationProblem, type ProblemKind } from "@/lib/api/problem";
import { importOptionsFromQuery } from "@/lib/api/traceQuery";
import { ENDPOINTS, openApiDocument } from "@/lib/api/openapi";
import { apiView } from "@/lib/api/openapiView";
import { reviewRequestSchema, signOffRequestSchema } from "@/lib/api/schemas";
import { actorAllows, actorLabel, type Actor } from "@/lib/access/actor";
import { PERMISSIONS, scopeAllows } from "@/lib/access/roles";
import { documentValidator, type Doc } from "@/tests/helpers/openapi";

const ROOT = path.resolve(__dirname, "..", "..");

describe("API tokens", () => {
  test("generateToken: clg_ + 43 base64url characters of 32 random bytes; the stored hash is SHA-256 of the whole string", () => {
    const t = generateToken((n) => new Uint8Array(n)); // 32 zero bytes
    expect(t.token).toBe("clg_" + "A".repeat(43)); // base64url of 32 zero bytes: 43 'A's (256 bits / 6 bits, rounded up), no padding
    // check value: `printf %s "clg_AAAA…A" | sha256sum` (coreutils), computed outside this code
    expect(t.sha256).toBe("b4de15250cb0908beaf78be342fc82a37188bd5d22a57b4c8a8e490bd924c824");
    expect(t.prefix).toBe("clg_AAAAAAAA");
    expect(hashToken(t.token)).toBe(t.sha256);
  });

  test("generateToken: two tokens from the system's random source differ, and are token-shaped", () => {
    const a = generateToken(), b = generateToken();
    expect(a.token).not.toBe(b.token);
    expect(isTokenShaped(a.token)).toBe(true);
    expect(tokenPrefix(a.token)).toBe(a.token.slice(0, 12));
  });

  test("sameDigest compares hex digests; different lengths or empty are not the same", () => {
    const h = hashToken("x");
    expect(sameDigest(h, h)).toBe(true);
    expect(sameDigest(h, hashToken("y"))).toBe(false);
    expect(sameDigest(h, h.slice(0, 62))).toBe(false);
    expect(sameDigest("", "")).toBe(false);
  });

  test("bearerToken reads `Bearer <token>` and refuses other shapes without a look-up", () => {
    const tok = "clg_" + "b".repeat(43);
    expect(bearerToken(null)).toEqual({ kind: "none" });
    expect(bearerToken("")).toEqual({ kind: "none" });
    expect(bearerToken(`Bearer ${tok}`)).toEqual({ kind: "token", token: tok });
    expect(bearerToken(`bearer  ${tok} `)).toEqual({ kind: "token", token: tok });
    expect(bearerToken(`Basic ${tok}`)).toEqual({ kind: "malformed" });
    expect(bearerToken(`Bearer ${tok.slice(0, -1)}`)).toEqual({ kind: "malformed" });
    expect(bearerToken(`Bearer ${tok} extra`)).toEqual({ kind: "malformed" });
    expect(bearerToken("Bearer clg_" + "b".repeat(42) + "!")).toEqual({ kind: "malformed" });
  });

  test("tokenState: revoked wins over expired; an expiry at exactly now is expired", () => {
    const now = new Date("2026-12-02T10:00:00Z");
    expect(tokenState({ expiresAt: null, revokedAt: null }, now)).toBe("active");
    expect(tokenState({ expiresAt: new Date("2026-12-02T10:00:01Z"), revokedAt: null }, now)).toBe("active");
    expect(tokenState({ expiresAt: now, revokedAt: null }, now)).toBe("expired");
    expect(tokenState({ expiresAt: new Date("2026-12-01T00:00:00Z"), revokedAt: new Date("2026-11-30T00:00:00Z") }, now)).toBe("revoked");
  });
});

describe("token scopes narrow the owner's role", () => {
  const token = (role: "admin" | "reviewer" | "designer" | "auditor", scope: "read" | "write" | "device"): Actor => ({ kind: "token", tokenId: "t1", tokenName: "gateway", scope, userId: "u1", name: "Ada", role });

  test("a read token of an admin may only read", () => {
    const granted = PERMISSIONS.filter((p) => actorAllows(token("admin", "read"), p));
    expect(granted).toEqual(["read"]);
  });

  test("a write token has exactly its owner's role", () => {
    expect(PERMISSIONS.filter((p) => actorAllows(token("designer", "write"), p))).toEqual(["read", "definition:edit", "design:run"]);
    expect(PERMISSIONS.filter((p) => actorAllows(token("auditor", "write"), p))).toEqual(["read"]);
  });

  test("a device token may only post readings, and only if its owner may", () => {
    expect(PERMISSIONS.filter((p) => scopeAllows("device", p))).toEqual(["monitor:post-readings"]);
    expect(PERMISSIONS.filter((p) => actorAllows(token("reviewer", "device"), p))).toEqual(["monitor:post-readings"]);
    expect(PERMISSIONS.filter((p) => actorAllows(token("auditor", "device"), p))).toEqual([]);
  });

  test("the audit log names a token by name, id and owner", () => {
    expect(actorLabel(token("reviewer", "write"))).toBe("token gateway (t1) of Ada");
  });
});

describe("problem details", () => {
  test("problem() gives type, title, status, detail and the place at fault", () => {
    expect(problem("invalid-file", "bad reading", { row: 12, column: "Temp" })).toEqual({
      type: "/api/v1/problems/invalid-file",
      title: "The file was refused",
      status: 422,
      detail: "bad reading",
      row: 12,
      column: "Temp",
    });
  });

  test("the statuses the issue names: 401, 403, 404, 413, 422", () => {
    const status = (k: ProblemKind) => PROBLEM_KINDS[k].status;
    expect([status("unauthorized"), status("forbidden"), status("not-found"), status("too-large"), status("invalid-request"), status("invalid-file")]).toEqual([401, 403, 404, 413, 422, 422]);
  });

  test("validationProblem names the first field's dotted path", () => {
    const r = reviewRequestSchema.safeParse({ trace_id: "t", product_id: "p", limits_id: "", model: "fancy" });
    expect(r.success).toBe(false);
    const p = validationProblem(r.error!);
    expect(p.status).toBe(422);
    expect(p.field).toBe("limits_id");
    expect(p.detail).toBe("body field 'limits_id': give the limit set id");
  });

  test("validationProblem names an unknown field", () => {
    const r = signOffRequestSchema.safeParse({ decision: "accept", password: "x", reviewer: "me" });
    expect(validationProblem(r.error!)).toMatchObject({ field: "reviewer", detail: "body field 'reviewer' is not accepted here" });
  });
});

describe("import options from query parameters", () => {
  test("CLI flag names without dashes map to the import options", () => {
    const r = importOptionsFromQuery(new URLSearchParams("tz=Europe/Berlin&date_order=dmy&air_col=Air&gap_multiple=4&missing=-999,ERR&delimiter=tab&name=Route%207"));
    expect(r).toEqual({ ok: true, name: "Route 7", fileName: undefined, options: { timeZone: "Europe/Berlin", dateOrder: "dmy", airColumn: "Air", gapMultiple: 4, missing: ["-999", "ERR"], delimiter: "\t" } });
  });

  test("a bad value names the query parameter, not the internal field", () => {
    const r = importOptionsFromQuery(new URLSearchParams("tz=Mars/Olympus"));
    expect(r.ok).toBe(false);
    expect(!r.ok && r.problem).toMatchObject({ status: 422, field: "tz", detail: "query parameter 'tz': is not a known IANA time zone (e.g. Europe/Berlin)" });
    const n = importOptionsFromQuery(new URLSearchParams("plausible_min=cold"));
    expect(!n.ok && n.problem).toMatchObject({ field: "plausible_min", detail: "query parameter 'plausible_min': 'cold' is not a number" });
  });

  test("an unknown or repeated parameter is refused by name", () => {
    const u = importOptionsFromQuery(new URLSearchParams("airCol=Air"));
    expect(!u.ok && u.problem.field).toBe("airCol");
    const d = importOptionsFromQuery(new URLSearchParams("tz=UTC&tz=Europe/Berlin"));
    expect(!d.ok && d.problem).toMatchObject({ field: "tz", detail: "query parameter 'tz' is given more than once" });
  });
});

/** Every route.ts under app/api/v1 with the HTTP methods it exports, as OpenAPI paths ([id] → {id}). */
function routeFiles(): Array<{ path: string; method: string }> {
  const base = path.join(ROOT, "app", "api", "v1");
  const out: Array<{ path: string; method: string }> = [];
  if (!existsSync(base)) return out;
  const walk = (dir: string) => {
    for (const name of readdirSync(dir)) {
      const abs = path.join(dir, name);
      if (statSync(abs).isDirectory()) walk(abs);
      else if (name === "route.ts") {
        const rel = path.relative(base, dir).split(path.sep).filter(Boolean);
        const src = readFileSync(abs, "utf8");
        for (const m of src.matchAll(/export (?:const|async function|function) (GET|POST|PUT|PATCH|DELETE)\b/g)) {
          out.push({ path: "/api/v1/" + rel.map((p) => p.replace(/^\[(\w+)\]$/, "{$1}")).join("/"), method: m[1]!.toLowerCase() });
        }
      }
    }
  };
  walk(base);
  return out;
}

describe("the OpenAPI document", () => {
  const doc = openApiDocument("0.0.0-test") as Doc & { openapi: string };
  const v = documentValidator(doc);

  test("is OpenAPI 3.1 and lists every endpoint the issue names", () => {
    expect(doc.openapi).toBe("3.1.0");
    const ops = Object.entries(doc.paths!).flatMap(([p, item]) => Object.keys(item).map((m) => `${m.toUpperCase()} ${p}`));
    for (const op of [
      "GET /api/v1/health",
      "GET /api/v1/openapi.json",
      "POST /api/v1/traces",
      "GET /api/v1/traces/{id}",
      "GET /api/v1/traces/{id}/original",
      "POST /api/v1/definitions/product",
      "POST /api/v1/definitions/pack",
      "POST /api/v1/definitions/limits",
      "POST /api/v1/definitions/profile",
      "PUT /api/v1/definitions/product/{id}",
      "PUT /api/v1/definitions/limits/{id}",
      "POST /api/v1/reviews",
      "GET /api/v1/reviews",
      "GET /api/v1/reviews/{id}",
      "POST /api/v1/reviews/{id}/sign-off",
      "GET /api/v1/audit",
    ]) {
      expect(ops).toContain(op);
    }
  });

  test("every route handler under app/api/v1 is in the document, and every documented operation has a handler", () => {
    const files = routeFiles();
    const documented = new Set(ENDPOINTS.map((e) => `${e.method} ${e.path.replace(/\/definitions\/(product|pack|limits|profile)/, "/definitions/{kind}")}`));
    const served = new Set(files.map((f) => `${f.method} ${f.path}`));
    // the problems route describes problem types; it is linked from every problem, not an operation
    served.delete("get /api/v1/problems/{kind}");
    // the catch-all answers any other path with a problem+json 404
    for (const m of ["get", "post", "put", "patch", "delete"]) served.delete(`${m} /api/v1/[...rest]`);
    expect([...served].sort()).toEqual([...documented].sort());
  });

  test("every authenticated operation documents 401 and 403 as problem+json; health does not need a token", () => {
    for (const e of ENDPOINTS) {
      const op = doc.paths![e.path]![e.method] as { responses: Record<string, { content?: Record<string, unknown> }>; security?: unknown[] };
      if (e.permission) {
        expect(Object.keys(op.responses["401"]!.content!)).toEqual(["application/problem+json"]);
        expect(op.responses["403"]).toBeDefined();
      } else {
        expect(op.security).toEqual([]);
      }
    }
  });

  test("its response schemas accept what the server sends and refuse what it must not", () => {
    expect(v.response("get", "/api/v1/health", 200, { status: "ok", version: "0.1.0", engine_version: "0.4.0", database: "sqlite" })).toBeNull();
    expect(v.response("get", "/api/v1/health", 200, { status: "ok", version: "0.1.0", engine_version: "0.4.0", database: "oracle" })).toMatch(/allowed values/);
    const p = problem("not-found", "no trace with id x", { field: "id" });
    expect(v.response("get", "/api/v1/traces/{id}", 404, p, "application/problem+json")).toBeNull();
    expect(v.response("get", "/api/v1/audit", 200, { entries: [], next_after: null })).toBeNull();
    expect(v.response("get", "/api/v1/audit", 200, { entries: [{ seq: "1" }], next_after: null })).not.toBeNull();
  });

  test("its request schemas are the ones the CLI's JSON files pass: the demo product validates, a misspelt field does not", () => {
    const product = JSON.parse(readFileSync(path.join(ROOT, "public", "demo", "ready-meal.product.json"), "utf8"));
    expect(v.request("post", "/api/v1/definitions/product", product)).toBeNull();
    expect(v.request("post", "/api/v1/definitions/product", { ...product, mass_g: 1 })).not.toBeNull();
    const limits = JSON.parse(readFileSync(path.join(ROOT, "public", "demo", "ready-meal.limits.json"), "utf8"));
    expect(v.request("put", "/api/v1/definitions/limits/{id}", limits)).toBeNull();
    expect(v.request("post", "/api/v1/reviews", { trace_id: "t", product_id: "p", limits_id: "l", window: "2026-06-16T05:00:00Z/2026-06-16T11:00:00Z" })).toBeNull();
    expect(v.request("post", "/api/v1/reviews", { trace_id: "t", product_id: "p" })).toMatch(/limits_id/);
  });

  // An invented fixture with the fields (issue 17): GET /api/v1/monitors/{id} gives exactly these.
  const state = {
    id: "m1",
    last_reading: { t: "2026-06-16T08:00:00.000Z", air_C: 11.5 },
    core_C: 4.2,
    rules: [{ id: "core-above-5C", status_so_far: "pass", cumulative_min: 0, remaining_min: 240 }],
    forecast: { assumed_air_C: 11.5, minutes_to_limit: 42.5, limit_rule: "core-above-5C", horizon_min: 540, reason: "the core reaches 5 °C with the air held at 11.5 °C" },
    stale: false,
  };

  test("the monitor state: the issue's fields validate, surface_C and remaining_min are optional, the forecast may be null", () => {
    expect(v.response("get", "/api/v1/monitors/{id}", 200, state)).toBeNull();
    expect(v.response("get", "/api/v1/monitors/{id}", 200, { ...state, surface_C: 6.1 })).toBeNull();
    expect(v.response("get", "/api/v1/monitors/{id}", 200, { ...state, rules: [{ id: "core-above-5C", status_so_far: "inconclusive", cumulative_min: 307.5 }] })).toBeNull();
    expect(v.response("get", "/api/v1/monitors/{id}", 200, { ...state, last_reading: null, core_C: null, rules: [], forecast: null })).toBeNull();
  });

  test("the monitor state: a field more, a field less or a wrong status is refused (the document holds the server to the issue's shape)", () => {
    expect(v.response("get", "/api/v1/monitors/{id}", 200, { ...state, mean_C: 4 })).toMatch(/additional properties/);
    const { stale: _stale, ...noStale } = state;
    expect(v.response("get", "/api/v1/monitors/{id}", 200, noStale)).toMatch(/stale/);
    expect(v.response("get", "/api/v1/monitors/{id}", 200, { ...state, rules: [{ ...state.rules[0], status_so_far: "ok" }] })).toMatch(/allowed values/);
    expect(v.response("get", "/api/v1/monitors/{id}", 200, { ...state, forecast: { ...state.forecast, minutes_to_limit: "soon" } })).not.toBeNull();
    expect(v.response("get", "/api/v1/monitors/{id}", 200, { ...state, last_reading: { t: state.last_reading.t } })).toMatch(/air_C/);
  });

  test("the other monitor operations: create, readings (JSON and the refused-readings problem), close", () => {
    expect(v.request("post", "/api/v1/monitors", { name: "Route 7 tote 3", product_id: "p", limits_id: "l", alert: { lead_min: 60, webhooks: ["https://example.org/hook"] } })).toBeNull();
    expect(v.request("post", "/api/v1/monitors", { name: "Route 7 tote 3", product_id: "p", limits_id: "l" })).toMatch(/alert/);
    expect(v.response("post", "/api/v1/monitors", 201, { id: "m1", device_token: "clg_" + "A".repeat(43) })).toBeNull();
    expect(v.request("post", "/api/v1/monitors/{id}/readings", { readings: [{ t: "2026-06-16T08:00:00Z", air_C: 3 }, { t: "2026-06-16T08:02:00+02:00", air_C: 3.1, probe_C: 2.9 }] })).toBeNull();
    expect(v.request("post", "/api/v1/monitors/{id}/readings", { readings: [{ t: "2026-06-16T08:00:00Z", air: 3 }] })).not.toBeNull();
    expect(v.response("post", "/api/v1/monitors/{id}/readings", 200, { accepted: 2, duplicates: 0, conflicts: [], refused: [], batch: { id: "b1", sha256: "ab" } })).toBeNull();
    const refused = { ...problem("invalid-readings", "1 reading(s) refused"), refused: [{ index: 1, reason: "t must be an ISO 8601 date-time" }] };
    expect(v.response("post", "/api/v1/monitors/{id}/readings", 422, refused, "application/problem+json")).toBeNull();
    expect(v.response("post", "/api/v1/monitors/{id}/readings", 403, problem("forbidden", "bound to another monitor"), "application/problem+json")).toBeNull();
    expect(v.response("post", "/api/v1/monitors/{id}/close", 200, { trace_id: "t1", review_id: "r1" })).toBeNull();
  });
});

describe("the API page's view of the document", () => {
  const view = apiView(openApiDocument("0.0.0-test") as unknown as Record<string, unknown>);

  test("groups every operation by tag, with its parameters and responses", () => {
    const ops = view.groups.flatMap((g) => g.operations.map((o) => `${o.method} ${o.path}`));
    expect(ops).toHaveLength(ENDPOINTS.length);
    const list = view.groups.find((g) => g.tag === "reviews")!.operations.find((o) => o.method === "GET" && o.path === "/api/v1/reviews")!;
    expect(list.parameters.map((p) => p.name)).toEqual(["status", "outcome", "after", "limit"]);
    expect(list.parameters.find((p) => p.name === "status")!.limits).toBe('one of "open", "signed"');
    expect(list.responses.map((r) => r.status)).toEqual(["200", "401", "403", "422"]);
  });

  test("flattens a body schema into dotted rows with required flags", () => {
    const post = view.groups.find((g) => g.tag === "reviews")!.operations.find((o) => o.method === "POST" && o.path === "/api/v1/reviews")!;
    const schema = view.schemas.find((s) => s.name === "ReviewRequest")!;
    expect(post.body[0]!.rows[0]!.ref).toBe("ReviewRequest");
    const rows = Object.fromEntries(schema.rows.filter((r) => r.path).map((r) => [r.path, r]));
    expect(rows["trace_id"]).toMatchObject({ type: "string", required: true });
    expect(rows["pack_id"]).toMatchObject({ required: false });
    expect(rows["model"]!.limits).toBe('one of "auto", "lumped", "conduction", "conduction-1d"');
  });
});
