// The OpenAPI document turned into what the API page shows: operations grouped by tag, their
// parameters, bodies and responses, and every JSON Schema flattened into rows (dotted field path, type,
// required, limits, description). Pure, so the page stays a plain renderer.

type Json = Record<string, unknown>;

export interface SchemaRow {
  /** dotted path; `[]` marks an array's items; empty for the schema itself */
  path: string;
  depth: number;
  type: string;
  required: boolean;
  /** ranges, lengths, patterns, allowed values, default */
  limits: string;
  description: string;
  /** a named component this row points at */
  ref?: string;
}

export interface ParameterView {
  name: string;
  in: string;
  required: boolean;
  type: string;
  limits: string;
  description: string;
}

export interface OperationView {
  method: string;
  path: string;
  summary: string;
  description: string;
  /** anchor id */
  anchor: string;
  parameters: ParameterView[];
  body: Array<{ contentType: string; rows: SchemaRow[] }>;
  responses: Array<{ status: string; description: string; contentType: string | null; ref: string | null; rows: SchemaRow[] }>;
}

export interface ApiView {
  title: string;
  version: string;
  description: string;
  groups: Array<{ tag: string; operations: OperationView[] }>;
  schemas: Array<{ name: string; description: string; rows: SchemaRow[] }>;
}

const refName = (ref: unknown) => (typeof ref === "string" ? ref.replace(/^#\/components\/schemas\//, "") : undefined);

function typeOf(s: Json): string {
  if (s.$ref) return refName(s.$ref)!;
  if (s.const !== undefined) return JSON.stringify(s.const);
  if (Array.isArray(s.enum)) return "enum";
  if (Array.isArray(s.type)) return s.type.join(" | ");
  if (typeof s.type === "string") {
    if (s.type === "array") return `array of ${s.items ? typeOf(s.items as Json) : "any"}`;
    return s.format ? `${s.type} (${s.format})` : s.type;
  }
  const alts = (s.anyOf ?? s.oneOf) as Json[] | undefined;
  if (alts) return alts.map(typeOf).join(" | ");
  return "any";
}

/** The limits of a schema in words: range, length, pattern, allowed values, default. Integer bounds at ±2^53 are left out. */
function limitsOf(s: Json): string {
  const out: string[] = [];
  const big = (n: unknown) => typeof n === "number" && Math.abs(n) >= Number.MAX_SAFE_INTEGER;
  if (Array.isArray(s.enum)) out.push(`one of ${s.enum.map((v) => JSON.stringify(v)).join(", ")}`);
  if (s.minimum !== undefined && !big(s.minimum)) out.push(`≥ ${s.minimum}`);
  if (s.exclusiveMinimum !== undefined) out.push(`> ${s.exclusiveMinimum}`);
  if (s.maximum !== undefined && !big(s.maximum)) out.push(`≤ ${s.maximum}`);
  if (s.exclusiveMaximum !== undefined) out.push(`< ${s.exclusiveMaximum}`);
  const n = (k: number, what: string) => `${k} ${what}${k === 1 ? "" : "s"}`;
  if (typeof s.minLength === "number" && s.minLength !== 0) out.push(`at least ${n(s.minLength, "character")}`);
  if (typeof s.maxLength === "number") out.push(`at most ${n(s.maxLength, "character")}`);
  if (typeof s.minItems === "number" && s.minItems !== 0) out.push(`at least ${n(s.minItems, "item")}`);
  if (typeof s.maxItems === "number") out.push(`at most ${n(s.maxItems, "item")}`);
  if (s.pattern !== undefined) out.push(`matches ${s.pattern}`);
  if (s.default !== undefined) out.push(`default ${JSON.stringify(s.default)}`);
  if (s.additionalProperties === false) out.push("no other fields");
  return out.join("; ");
}

/** Rows for a schema and everything inside it; named components are referenced, not expanded. */
export function schemaRows(schema: Json, path = "", depth = 0, required = true, out: SchemaRow[] = []): SchemaRow[] {
  const description = typeof schema.description === "string" ? schema.description : "";
  out.push({ path, depth, type: typeOf(schema), required, limits: limitsOf(schema), description, ...(schema.$ref ? { ref: refName(schema.$ref) } : {}) });
  if (schema.$ref || depth > 8) return out;
  const props = schema.properties as Record<string, Json> | undefined;
  if (props) {
    const req = new Set((schema.required as string[] | undefined) ?? []);
    for (const [k, v] of Object.entries(props)) schemaRows(v, path ? `${path}.${k}` : k, depth + 1, req.has(k), out);
  }
  if (schema.type === "array" && schema.items && !(schema.items as Json).$ref && ((schema.items as Json).properties || (schema.items as Json).anyOf || (schema.items as Json).oneOf)) {
    schemaRows(schema.items as Json, `${path}[]`, depth + 1, true, out);
  }
  const alts = (schema.anyOf ?? schema.oneOf) as Json[] | undefined;
  if (alts && alts.some((a) => a.properties)) {
    alts.forEach((a, i) => schemaRows(a, `${path}${path ? " " : ""}(variant ${i + 1})`, depth + 1, true, out));
  }
  return out;
}

const METHOD_ORDER = ["get", "post", "put", "patch", "delete"];

export function apiView(doc: Json): ApiView {
  const info = (doc.info ?? {}) as Json;
  const groups = new Map<string, OperationView[]>();
  for (const [path, item] of Object.entries((doc.paths ?? {}) as Record<string, Record<string, Json>>)) {
    for (const method of METHOD_ORDER) {
      const op = item[method];
      if (!op) continue;
      const parameters = ((op.parameters ?? []) as Json[]).map((p) => {
        const s = (p.schema ?? {}) as Json;
        return { name: String(p.name), in: String(p.in), required: p.required === true, type: typeOf(s), limits: limitsOf(s), description: String(s.description ?? p.description ?? "") };
      });
      const bodyContent = ((op.requestBody as Json | undefined)?.content ?? {}) as Record<string, Json>;
      const body = Object.entries(bodyContent).map(([contentType, c]) => ({ contentType, rows: schemaRows((c.schema ?? {}) as Json) }));
      const responses = Object.entries((op.responses ?? {}) as Record<string, Json>).map(([status, r]) => {
        const [contentType, c] = Object.entries((r.content ?? {}) as Record<string, Json>)[0] ?? [null, null];
        const schema = (c?.schema ?? null) as Json | null;
        return { status, description: String(r.description ?? ""), contentType, ref: schema ? (refName(schema.$ref) ?? null) : null, rows: schema && !schema.$ref ? schemaRows(schema) : [] };
      });
      const tag = ((op.tags as string[] | undefined) ?? ["other"])[0]!;
      const view: OperationView = {
        method: method.toUpperCase(), path, summary: String(op.summary ?? ""), description: String(op.description ?? ""),
        anchor: `${method}-${path.replace(/[^a-zA-Z0-9]+/g, "-").replace(/^-|-$/g, "")}`, parameters, body, responses,
      };
      groups.set(tag, [...(groups.get(tag) ?? []), view]);
    }
  }
  const components = (((doc.components ?? {}) as Json).schemas ?? {}) as Record<string, Json>;
  return {
    title: String(info.title ?? "API"),
    version: String(info.version ?? ""),
    description: String(info.description ?? ""),
    groups: [...groups].map(([tag, operations]) => ({ tag, operations })),
    schemas: Object.entries(components).map(([name, s]) => ({ name, description: String(s.description ?? ""), rows: schemaRows(s) })),
  };
}
