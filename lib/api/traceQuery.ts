// POST /api/v1/traces takes the import options as query parameters named like the CLI flags without
// dashes. They are checked by the same schema as the CLI's flags and the upload form's options, and a
// refusal names the query parameter, not the internal field.
import { importOptionsSchema, type ImportOptions } from "../trace/settings";
import { problem, validationProblem, type Problem } from "./problem";
import { traceImportQuerySchema } from "./schemas";

/** internal option field → query parameter */
const PARAM_OF: Record<string, string> = {
  sheet: "sheet", timeColumn: "time_col", dateColumn: "date_col", airColumn: "air_col", productColumn: "product_col", unit: "unit",
  timeZone: "tz", dateOrder: "date_order", timeFormat: "time_format", startTime: "start", decimal: "decimal", delimiter: "delimiter",
  missing: "missing", plausibleMin_C: "plausible_min", plausibleMax_C: "plausible_max", gapMultiple: "gap_multiple",
};

export type TraceQueryOutcome = { ok: true; options: ImportOptions; name?: string; fileName?: string } | { ok: false; problem: Problem };

export function importOptionsFromQuery(params: URLSearchParams): TraceQueryOutcome {
  const raw: Record<string, string> = {};
  for (const [k, v] of params) {
    if (k in raw) return { ok: false, problem: problem("invalid-request", `query parameter '${k}' is given more than once`, { field: k }) };
    raw[k] = v;
  }
  const q = traceImportQuerySchema.safeParse(raw);
  if (!q.success) {
    const issue = q.error.issues[0]!;
    const unknown = issue.code === "unrecognized_keys" ? issue.keys[0] : undefined;
    if (unknown) return { ok: false, problem: problem("invalid-request", `query parameter '${unknown}' is not an import option (see GET /api/v1/openapi.json)`, { field: unknown }) };
    return { ok: false, problem: validationProblem(q.error, "query parameter") };
  }
  const v = q.data;
  const num = (s: string | undefined, param: string): number | undefined | Problem => {
    if (s === undefined) return undefined;
    const n = Number(s);
    return s.trim() !== "" && Number.isFinite(n) ? n : problem("invalid-request", `query parameter '${param}': '${s}' is not a number`, { field: param });
  };
  const plausibleMin_C = num(v.plausible_min, "plausible_min");
  const plausibleMax_C = num(v.plausible_max, "plausible_max");
  const gapMultiple = num(v.gap_multiple, "gap_multiple");
  for (const n of [plausibleMin_C, plausibleMax_C, gapMultiple]) if (typeof n === "object") return { ok: false, problem: n };
  const opts = importOptionsSchema.safeParse({
    sheet: v.sheet,
    timeColumn: v.time_col,
    dateColumn: v.date_col,
    airColumn: v.air_col,
    productColumn: v.product_col,
    unit: v.unit,
    timeZone: v.tz,
    dateOrder: v.date_order,
    timeFormat: v.time_format,
    startTime: v.start,
    decimal: v.decimal,
    delimiter: v.delimiter === "tab" ? "\t" : v.delimiter,
    missing: v.missing?.split(",").map((x) => x.trim()),
    plausibleMin_C,
    plausibleMax_C,
    gapMultiple,
  });
  if (!opts.success) return { ok: false, problem: validationProblem(opts.error, "query parameter", (p) => PARAM_OF[p.split(".")[0]!] ?? p) };
  return { ok: true, options: opts.data, name: v.name, fileName: v.file_name };
}
