// Corelag command line: `npm run -s corelag -- <command> [options]`. Prints JSON on stdout; on bad input
// prints one line naming the file and the row or field at fault to stderr and exits 2.
import { existsSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { writeSeriesCsv } from "./seriesCsv";
import { parseArgs } from "./args";
import { z } from "zod";
import { importTraceFile, importOptionsSchema, medianInterval_s, sha256Hex, TraceImportError, bridgeGaps, type ImportOptions, type TraceImport } from "../trace";
import { modelChoiceSchema, packSchema, productSchema, type Pack, type Product } from "../thermal/definitions";
import { predict } from "../thermal/predict";
import { limitSetSchema } from "../exposure/limits";
import { tryRunReview, unsupportedRule } from "../review";
import { CAUTIONS } from "../review/cautions";
import { calibrateLumped } from "../design/calibrate";
import { profileSchema, profileSeries } from "../design/profile";
import { parseVariable } from "../design/vary";
import { size } from "../design/sizing";
import { uncertaintySpecSchema } from "../uncertainty/monteCarlo";
import { RECORD_COMMANDS, RecordsUsageError } from "./records";

class CliError extends Error {}

const USAGE = `usage:
  corelag import FILE [--sheet NAME] [--time-col NAME] [--date-col NAME] [--air-col NAME] [--product-col NAME] [--unit C|F|K] [--tz ZONE]
                      [--date-order dmy|mdy|ymd] [--time-format datetime|unix-s|unix-ms|elapsed-s|elapsed-min|elapsed-h] [--start ISO]
                      [--decimal .|,] [--delimiter ,|;|tab||] [--missing CODE,CODE] [--plausible-min C] [--plausible-max C] [--gap-multiple N] [--format json]
  corelag predict --trace FILE --product P.json [--pack K.json] [--model auto|lumped|conduction|conduction-1d] [--out FILE.csv] [import options] [--format json]
  corelag review --trace FILE --product P.json [--pack K.json] --limits L.json [--model auto|lumped|conduction|conduction-1d] [--window START/END] [import options] [--format json]
  corelag calibrate --trace FILE [--air-col NAME] [--product-col NAME] [--product P.json] [--pack K.json] [--fit-initial] [--fit-offset] [--mismatch-factor F] [import options] --format json
  corelag size --profile FILE(.csv|.json) --product P.json --pack K.json --limits L.json --vary layer:N:thickness_m|coolant:N:mass_kg|product:initial_C --min X --max Y [--model M] --format json
  corelag verify [--review ID] [--anchor FILE_OR_JSON] [--json]   (storage, audit chain, signatures, every row against the chain, re-runs stored reviews; exit 1 on any finding; uses DATABASE_URL)
  corelag anchor                        (prints the chain head as one JSON line to keep outside the database)
  corelag key rotate                    (a new signing key, endorsed in the chain by the old one)
  corelag seal                          (once after upgrading: content hashes for rows recorded before them)
  review also takes --uncertainty U.json (Monte Carlo: inputs, samples, seed, use_in_guard_band)`;

const IMPORT_FLAGS = {
  sheet: { type: "string" },
  "time-col": { type: "string" },
  "date-col": { type: "string" },
  "air-col": { type: "string" },
  "product-col": { type: "string" },
  unit: { type: "string" },
  tz: { type: "string" },
  "date-order": { type: "string" },
  "time-format": { type: "string" },
  start: { type: "string" },
  decimal: { type: "string" },
  delimiter: { type: "string" },
  missing: { type: "string" },
  "plausible-min": { type: "string" },
  "plausible-max": { type: "string" },
  "gap-multiple": { type: "string" },
  format: { type: "string", default: "json" },
} as const;

const FLAG_OF: Record<string, string> = {
  sheet: "--sheet", timeColumn: "--time-col", dateColumn: "--date-col", airColumn: "--air-col", productColumn: "--product-col", unit: "--unit", timeZone: "--tz",
  dateOrder: "--date-order", timeFormat: "--time-format", startTime: "--start", decimal: "--decimal", delimiter: "--delimiter", missing: "--missing",
  plausibleMin_C: "--plausible-min", plausibleMax_C: "--plausible-max", gapMultiple: "--gap-multiple",
};

/** A file's bytes; `-` reads standard input. */
function readBytes(file: string): Uint8Array {
  try {
    return readFileSync(file === "-" ? 0 : file);
  } catch (e) {
    throw new CliError(`${file}: cannot be read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})`);
  }
}

function readJsonFile<T>(file: string, schema: z.ZodType<T>): T {
  let raw: unknown;
  try {
    raw = JSON.parse(Buffer.from(readBytes(file)).toString("utf8"));
  } catch (e) {
    if (e instanceof CliError) throw e;
    throw new CliError(`${file}: is not valid JSON (${(e as Error).message})`);
  }
  const parsed = schema.safeParse(raw);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    const where = issue.path.length ? `field '${issue.path.join(".")}'` : "the document";
    throw new CliError(`${file}: ${where}: ${issue.message}`);
  }
  return parsed.data;
}

type Values = Record<string, string | boolean | undefined>;

/** Import flags, checked before any file is read so a bad flag is reported as such. */
function importOptionsFrom(values: Values): ImportOptions {
  if (values.format !== undefined && values.format !== "json") throw new CliError(`--format: only 'json' is supported`);
  const str = (k: string) => (values[k] === undefined ? undefined : String(values[k]));
  const num = (k: string) => (values[k] === undefined ? undefined : Number(values[k]));
  const delimiter = str("delimiter");
  const opts = importOptionsSchema.safeParse({
    sheet: str("sheet"),
    timeColumn: str("time-col"),
    dateColumn: str("date-col"),
    airColumn: str("air-col"),
    productColumn: str("product-col"),
    unit: str("unit"),
    timeZone: str("tz"),
    dateOrder: str("date-order"),
    timeFormat: str("time-format"),
    startTime: str("start"),
    decimal: str("decimal"),
    delimiter: delimiter === "tab" ? "\t" : delimiter,
    missing: str("missing")?.split(",").map((x) => x.trim()),
    plausibleMin_C: num("plausible-min"),
    plausibleMax_C: num("plausible-max"),
    gapMultiple: num("gap-multiple"),
  });
  if (!opts.success) {
    const issue = opts.error.issues[0]!;
    throw new CliError(`${FLAG_OF[String(issue.path[0])] ?? "option"}: ${issue.message}`);
  }
  return opts.data;
}

async function importTrace(file: string, options: ImportOptions): Promise<{ imported: TraceImport; bytes: Uint8Array }> {
  const bytes = readBytes(file);
  try {
    return { imported: await importTraceFile(bytes, options), bytes };
  } catch (e) {
    if (e instanceof TraceImportError) throw new CliError(`${file}: ${e.message}`);
    throw e;
  }
}

const iso = (t_s: number) => new Date(Math.round(t_s * 1000)).toISOString();

async function importCommand(argv: string[]): Promise<unknown> {
  const { values, positionals } = parseArgs({ args: argv, options: IMPORT_FLAGS, allowPositionals: true, strict: true });
  if (positionals.length !== 1) throw new CliError(`give exactly one FILE to import\n${USAGE}`);
  const file = positionals[0]!;
  const { imported } = await importTrace(file, importOptionsFrom(values));
  const { series, warnings } = imported;
  const n = series.t_s.length;
  return {
    samples: n,
    channels: imported.channels,
    start: iso(series.t_s[0]!),
    end: iso(series.t_s[n - 1]!),
    median_interval_s: medianInterval_s(series.t_s),
    gaps: imported.gaps.map((g) => ({ start: iso(g.start_s), end: iso(g.end_s), duration_s: g.duration_s })),
    warnings,
    settings: imported.settings,
  };
}

function modelInputs(values: Values): { product: Product; pack: Pack | undefined; model: z.infer<typeof modelChoiceSchema> } {
  if (!values.trace) throw new CliError(`--trace is required\n${USAGE}`);
  if (!values.product) throw new CliError(`--product is required\n${USAGE}`);
  const product = readJsonFile(String(values.product), productSchema);
  const pack = values.pack ? readJsonFile(String(values.pack), packSchema) : undefined;
  const model = modelChoiceSchema.safeParse(values.model ?? "auto");
  if (!model.success) throw new CliError(`--model: ${model.error.issues[0]!.message}`);
  if (!pack && product.h_W_m2K === undefined) throw new CliError(`${values.product}: field 'h_W_m2K': give the product's surface coefficient, or a --pack`);
  if ((model.data === "conduction" || model.data === "conduction-1d") && (!product.shape || (!product.composition && product.properties?.k_W_mK === undefined))) {
    throw new CliError(`${values.product}: field 'shape': the conduction model needs the product's shape and conductivity`);
  }
  return { product, pack, model: model.data };
}

async function predictCommand(argv: string[]): Promise<unknown> {
  const { values } = parseArgs({
    args: argv,
    options: { ...IMPORT_FLAGS, trace: { type: "string" }, product: { type: "string" }, pack: { type: "string" }, model: { type: "string" }, out: { type: "string" } },
    strict: true,
  });
  const importOptions = importOptionsFrom(values);
  const { product, pack, model } = modelInputs(values);
  const { imported } = await importTrace(String(values.trace), importOptions);
  const { series } = imported;
  const air = bridgeGaps(series);
  let p;
  try {
    p = predict(product, pack, series.t_s, air, { model });
  } catch (e) {
    throw new CliError(`${values.product}${pack ? ` with ${values.pack}` : ""}: the engine could not compute a prediction: ${(e as Error).message}`);
  }
  const gaps = imported.gaps.map((g) => ({ start: iso(g.start_s), end: iso(g.end_s), duration_s: g.duration_s }));
  const screening = { ...p.screening, lumped_vs_conduction_K: p.lumped_vs_conduction_K };
  if (values.out) {
    const toStdout = values.out === "-";
    try {
      writeSeriesCsv(toStdout ? 1 : String(values.out), { t_s: series.t_s, air, core: p.core, surface: p.surface, mean: p.mean, coolant: p.coolant });
    } catch (e) {
      throw new CliError(`${values.out}: cannot be written (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})`);
    }
    if (toStdout) return undefined;
    return { screening, solver: p.solver, gaps, out: values.out, cautions: CAUTIONS };
  }
  const arr = (a: Float64Array) => Array.from(a, (x) => Number(x.toFixed(4)));
  return {
    screening,
    solver: p.solver,
    gaps,
    series: {
      t: Array.from(series.t_s, iso),
      air: arr(air),
      core: arr(p.core),
      surface: arr(p.surface),
      mean: arr(p.mean),
      ...(p.coolant ? { coolant: arr(p.coolant) } : {}),
    },
    cautions: CAUTIONS,
  };
}

async function reviewCommand(argv: string[]): Promise<unknown> {
  const { values } = parseArgs({
    args: argv,
    options: { ...IMPORT_FLAGS, trace: { type: "string" }, product: { type: "string" }, pack: { type: "string" }, limits: { type: "string" }, model: { type: "string" }, window: { type: "string" }, uncertainty: { type: "string" } },
    strict: true,
  });
  const importOptions = importOptionsFrom(values);
  if (!values.limits) throw new CliError(`--limits is required\n${USAGE}`);
  const { product, pack, model } = modelInputs(values);
  const limits = readJsonFile(values.limits, limitSetSchema);
  const window = values.window === undefined ? undefined : parseWindow(values.window);
  const { imported, bytes } = await importTrace(String(values.trace), importOptions);
  const bad = unsupportedRule(limits, imported.series.probe_C !== undefined);
  if (bad) {
    const why = bad.channel === "probe" ? "the trace has no product-probe column (--product-col)" : "a review does not produce it";
    throw new CliError(`${values.limits}: field 'rules.${bad.index}.channel': '${bad.channel}' is not available: ${why}`);
  }
  const t = imported.series.t_s;
  if (window && (window.start_s < t[0]! || window.end_s > t[t.length - 1]!)) {
    throw new CliError(`--window: ${values.window} is not inside the trace (${iso(t[0]!)}/${iso(t[t.length - 1]!)})`);
  }
  const uncertainty = values.uncertainty ? readJsonFile(values.uncertainty, uncertaintySpecSchema) : undefined;
  const attempt = tryRunReview({ series: imported.series, product, pack, limits, options: { model, window, uncertainty }, gapMultiple: imported.settings.gapMultiple });
  if (!attempt.ok) throw new CliError(`${values.product}${pack ? ` with ${values.pack}` : ""}: ${attempt.message}`);
  const { result } = attempt.computation;
  return {
    trace: { file: values.trace, sha256: sha256Hex(bytes), samples: imported.series.t_s.length, import_settings: imported.settings, warnings: imported.warnings },
    ...result,
  };
}

async function calibrateCommand(argv: string[]): Promise<unknown> {
  const { values } = parseArgs({
    args: argv,
    options: { ...IMPORT_FLAGS, trace: { type: "string" }, product: { type: "string" }, pack: { type: "string" }, "fit-initial": { type: "boolean" }, "fit-offset": { type: "boolean" }, "mismatch-factor": { type: "string" } },
    strict: true,
  });
  const importOptions = importOptionsFrom(values);
  if (!values.trace) throw new CliError(`--trace is required\n${USAGE}`);
  const factor = values["mismatch-factor"] === undefined ? 2 : Number(values["mismatch-factor"]);
  if (!(factor > 1)) throw new CliError("--mismatch-factor: must be a number greater than 1");
  const product = values.product ? readJsonFile(values.product, productSchema) : undefined;
  const pack = values.pack ? readJsonFile(values.pack, packSchema) : undefined;
  if (pack && !product) throw new CliError("--pack: give the --product too");
  if (product && !pack && product.h_W_m2K === undefined) throw new CliError(`${values.product}: field 'h_W_m2K': give the product's surface coefficient, or a --pack`);
  const { imported } = await importTrace(values.trace, importOptions);
  const probe = imported.series.probe_C;
  if (!probe) throw new CliError(`${values.trace}: no product-probe column was found; name it with --product-col`);
  let r;
  try {
    r = calibrateLumped(imported.series.t_s, bridgeGaps(imported.series), probe, { fitInitial: values["fit-initial"] ?? false, fitOffset: values["fit-offset"] ?? false, mismatchFactor: factor }, product ? { product, pack } : undefined);
  } catch (e) {
    throw new CliError(`${values.trace}: ${(e as Error).message}`);
  }
  return {
    tau_s: r.tau_s,
    tau_ci95_s: r.tau_ci95_s,
    ...(r.offset_K !== undefined ? { offset_K: r.offset_K, offset_ci95_K: r.offset_ci95_K } : {}),
    initial_C: r.initial_C,
    ...(r.initial_ci95_C ? { initial_ci95_C: r.initial_ci95_C } : {}),
    rmse_K: r.rmse_K,
    samples: r.samples,
    residual_lag1: r.residual_lag1,
    ...(r.r_total_K_W !== undefined ? { r_total_K_W: r.r_total_K_W, h_eff_W_m2K: r.h_eff_W_m2K, r_total_from_definition_K_W: r.r_total_from_definition_K_W } : {}),
    warnings: [...imported.warnings, ...r.warnings],
  };
}

async function sizeCommand(argv: string[]): Promise<unknown> {
  const { values } = parseArgs({
    args: argv,
    options: { ...IMPORT_FLAGS, profile: { type: "string" }, product: { type: "string" }, pack: { type: "string" }, limits: { type: "string" }, vary: { type: "string" }, min: { type: "string" }, max: { type: "string" }, model: { type: "string" } },
    strict: true,
  });
  const importOptions = importOptionsFrom(values);
  for (const k of ["profile", "product", "limits", "vary", "min", "max"] as const) if (values[k] === undefined) throw new CliError(`--${k} is required\n${USAGE}`);
  const variable = parseVariable(values.vary!);
  if (!variable) throw new CliError(`--vary: '${values.vary}' is not layer:N:thickness_m, coolant:N:mass_kg or product:initial_C (N counts from 1)`);
  const min = Number(values.min), max = Number(values.max);
  if (!Number.isFinite(min)) throw new CliError(`--min: '${values.min}' is not a number`);
  if (!Number.isFinite(max) || !(max > min)) throw new CliError(`--max: must be a number greater than --min`);
  const product = readJsonFile(values.product!, productSchema);
  const pack = values.pack ? readJsonFile(values.pack, packSchema) : undefined;
  const limits = readJsonFile(values.limits!, limitSetSchema);
  const model = modelChoiceSchema.safeParse(values.model ?? "auto");
  if (!model.success) throw new CliError(`--model: ${model.error.issues[0]!.message}`);
  const bad = unsupportedRule(limits);
  if (bad) throw new CliError(`${values.limits}: field 'rules.${bad.index}.channel': '${bad.channel}' is not available in a design study`);
  const profileFile = values.profile!;
  const series = /\.json$/i.test(profileFile) ? profileSeries(readJsonFile(profileFile, profileSchema)) : (await importTrace(profileFile, importOptions)).imported.series;
  let r;
  try {
    r = size({ series, product, pack, limits, variable, min, max, model: model.data });
  } catch (e) {
    throw new CliError(`--vary: ${(e as Error).message}`);
  }
  return {
    variable: r.variable,
    // on the grid of the search precision (0.0337 m for 0.1 mm), numeric
    value: r.value,
    label: r.display.label,
    value_display: r.value === null ? null : Number((r.value * r.display.factor).toFixed(r.display.decimals)),
    feasible: r.feasible,
    metric_at_value: r.metric_at_value,
    metric: r.metric,
    precision: r.precision,
    reason: r.reason,
    governing: r.governing,
    rule_notes: r.rule_notes,
    curve: r.curve.map((c) => ({ x: c.x, metric: c.metric, feasible: c.feasible, failing: c.failing })),
    cautions: CAUTIONS,
  };
}

/** START/END as two ISO 8601 date-times with Z or an offset. */
function parseWindow(text: string): { start_s: number; end_s: number } {
  const parts = text.split("/");
  const iso8601 = z.iso.datetime({ offset: true });
  if (parts.length !== 2 || !iso8601.safeParse(parts[0]).success || !iso8601.safeParse(parts[1]).success) {
    throw new CliError(`--window: '${text}' is not START/END with ISO 8601 date-times (e.g. 2026-06-16T05:00:00Z/2026-06-16T11:00:00Z)`);
  }
  const start_s = Date.parse(parts[0]!) / 1000, end_s = Date.parse(parts[1]!) / 1000;
  if (!(end_s > start_s)) throw new CliError(`--window: the end must come after the start`);
  return { start_s, end_s };
}

/**
 * The record commands (verify, anchor, key, seal) read and extend existing records; they must never
 * create a database. SQLite creates a missing file on open, so a mistyped DATABASE_URL would be
 * "verified" as an empty database: refuse it first, in one line.
 */
async function requireExistingDatabase(): Promise<void> {
  const { config } = await import("../config");
  let url: string;
  try {
    url = config().DATABASE_URL;
  } catch (e) {
    throw new CliError((e as Error).message);
  }
  const file = path.resolve(url.replace(/^file:/, ""));
  if (!existsSync(file)) throw new CliError(`DATABASE_URL: there is no database at ${file}; check the path (verify never creates one)`);
  if (!statSync(file).isFile() || statSync(file).size === 0) throw new CliError(`DATABASE_URL: ${file} is not a Corelag database (${statSync(file).isFile() ? "an empty file" : "not a file"})`);
}

const COMMANDS: Record<string, (argv: string[]) => Promise<unknown>> = {
  import: importCommand,
  predict: predictCommand,
  review: reviewCommand,
  calibrate: calibrateCommand,
  size: sizeCommand,
};

/** Runs one command; returns the exit code (0 done, 1 verify found a problem, 2 bad input, 3 unexpected failure). */
export async function runCli(args: string[]): Promise<number> {
  const debug = args.includes("--debug");
  const argv = args.filter((a) => a !== "--debug");
  const [command, ...rest] = argv;
  const run = command ? COMMANDS[command] : undefined;
  const records = command ? RECORD_COMMANDS[command] : undefined;
  if (!run && !records) {
    process.stderr.write(`${command ? `unknown command '${command}'` : "no command given"}\n${USAGE}\n`);
    return 2;
  }
  try {
    if (records) {
      await requireExistingDatabase();
      // verify: exit 1 on any finding, the JSON lists each with its kind, row and audit entry.
      const r = await records(rest);
      process.stdout.write(r.stdout);
      if (r.stderr) process.stderr.write(r.stderr);
      return r.code;
    }
    const output = await run!(rest);
    if (output !== undefined) process.stdout.write(JSON.stringify(output, null, 2) + "\n");
    return 0;
  } catch (e) {
    if (e instanceof CliError || e instanceof RecordsUsageError) {
      process.stderr.write(`corelag ${command}: ${e.message}\n`);
      return 2;
    }
    if (e instanceof TypeError && "code" in e && String((e as { code: string }).code).startsWith("ERR_PARSE_ARGS")) {
      process.stderr.write(`corelag ${command}: ${e.message}\n${USAGE}\n`);
      return 2;
    }
    // Unexpected: one line, and the stack only when asked for.
    const message = e instanceof Error ? e.message.split("\n")[0] : String(e);
    process.stderr.write(`corelag ${command}: unexpected failure: ${message}${debug ? `\n${e instanceof Error ? e.stack : ""}` : " (rerun with --debug for the stack trace)"}\n`);
    return 3;
  }
}

// Run directly from source (`tsx lib/cli/main.ts …`); the installed command starts at lib/cli/corelag.ts.
if (typeof require !== "undefined" && typeof module !== "undefined" && require.main === module) {
  runCli(process.argv.slice(2)).then((code) => {
    process.exitCode = code;
  });
}
