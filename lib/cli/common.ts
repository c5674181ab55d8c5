// What every command of the CLI shares: the usage text, the import flags and their checking, reading a
// file (or standard input) and a JSON definition with its schema, and the one error type for bad input
// (exit 2, one line naming the file and the row, column or field).
import { readFileSync } from "node:fs";
import { userInfo } from "node:os";
import { cliActor, type Actor } from "../access/actor";
import { z } from "zod";
import { importTraceFile, importOptionsSchema, TraceImportError, type ImportOptions, type TraceImport } from "../trace";
import { modelChoiceSchema, packSchema, productSchema, type Pack, type Product } from "../thermal/definitions";

export class CliError extends Error {}

/** Who runs this command, for the audit log: the operating-system user (`cli:<user>`). */
export function currentCliActor(): Actor {
  let name = "";
  try {
    name = userInfo().username;
  } catch {
    name = process.env.USER ?? process.env.LOGNAME ?? "";
  }
  return cliActor(name);
}

export const USAGE = `usage:
  corelag import FILE [--sheet NAME] [--time-col NAME] [--date-col NAME] [--air-col NAME] [--product-col NAME] [--unit C|F|K] [--tz ZONE]
                      [--date-order dmy|mdy|ymd] [--time-format datetime|unix-s|unix-ms|elapsed-s|elapsed-min|elapsed-h] [--start ISO]
                      [--decimal .|,] [--delimiter ,|;|tab||] [--missing CODE,CODE] [--plausible-min C] [--plausible-max C] [--gap-multiple N] [--format json]
  corelag predict --trace FILE --product P.json [--pack K.json] [--model auto|lumped|conduction|conduction-1d] [--out FILE.csv] [import options] [--format json]
  corelag review --trace FILE --product P.json [--pack K.json] --limits L.json [--model auto|lumped|conduction|conduction-1d] [--window START/END] [--consequence-channels LIST] [import options] [--format json]
  corelag calibrate --trace FILE [--air-col NAME] [--product-col NAME] [--product P.json] [--pack K.json] [--fit-initial] [--fit-offset] [--mismatch-factor F] [import options] --format json
  corelag size --profile FILE(.csv|.json) --product P.json --pack K.json --limits L.json --vary layer:N:thickness_m|coolant:N:mass_kg|product:initial_C --min X --max Y [--model M] --format json
  corelag simulate --monitor ID --trace FILE --speed 600 [--url http://127.0.0.1:3000] --token T [--quiet] [import options]   (replays a file's rows as live readings)
  corelag shipment review --manifest M.json [--model M] [import options] --format json
  corelag profile from-traces FILE... --percentile P --step-min M [--align departure|time-of-day] [--smooth-steps N] [--name NAME] [import options] --format json
  corelag verify [--review ID] [--anchor FILE_OR_JSON] [--json]   (storage, audit chain, signatures, every row against the chain, re-runs stored reviews; exit 1 on any finding; uses DATABASE_URL)
  corelag anchor                        (prints the chain head as one JSON line to keep outside the database)
  corelag key rotate                    (a new signing key, endorsed in the chain by the old one)
  corelag seal                          (once after upgrading: content hashes for rows recorded before them)
  corelag backup --out FILE             (a consistent copy while the app runs: SQLite online backup, or pg_dump)
  corelag restore FILE                  (a backup into the empty database DATABASE_URL names; then run verify)
  corelag user add --email E --name N --role R --password-stdin | user list | user set-role --email E --role R | user disable|enable --email E
  corelag token create --user EMAIL --name NAME [--expires-days N] [--scope read|write|device] [--format json] | token list [--user EMAIL] [--all] | token revoke ID
  review also takes --uncertainty U.json (Monte Carlo: inputs, samples, seed, use_in_guard_band)`;

export const IMPORT_FLAGS = {
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

export const FLAG_OF: Record<string, string> = {
  sheet: "--sheet", timeColumn: "--time-col", dateColumn: "--date-col", airColumn: "--air-col", productColumn: "--product-col", unit: "--unit", timeZone: "--tz",
  dateOrder: "--date-order", timeFormat: "--time-format", startTime: "--start", decimal: "--decimal", delimiter: "--delimiter", missing: "--missing",
  plausibleMin_C: "--plausible-min", plausibleMax_C: "--plausible-max", gapMultiple: "--gap-multiple",
};

/** A file's bytes; `-` reads standard input. */
export function readBytes(file: string): Uint8Array {
  try {
    return readFileSync(file === "-" ? 0 : file);
  } catch (e) {
    throw new CliError(`${file}: cannot be read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})`);
  }
}

export function readJsonFile<T>(file: string, schema: z.ZodType<T>): T {
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

export type Values = Record<string, string | boolean | undefined>;

/** Import flags, checked before any file is read so a bad flag is reported as such. */
export function importOptionsFrom(values: Values): ImportOptions {
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

export async function importTrace(file: string, options: ImportOptions): Promise<{ imported: TraceImport; bytes: Uint8Array }> {
  const bytes = readBytes(file);
  try {
    return { imported: await importTraceFile(bytes, options), bytes };
  } catch (e) {
    if (e instanceof TraceImportError) throw new CliError(`${file}: ${e.message}`);
    throw e;
  }
}

export const iso = (t_s: number) => new Date(Math.round(t_s * 1000)).toISOString();

export function modelInputs(values: Values): { product: Product; pack: Pack | undefined; model: z.infer<typeof modelChoiceSchema> } {
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

/** START/END as two ISO 8601 date-times with Z or an offset. */
export function parseWindow(text: string): { start_s: number; end_s: number } {
  const parts = text.split("/");
  const iso8601 = z.iso.datetime({ offset: true });
  if (parts.length !== 2 || !iso8601.safeParse(parts[0]).success || !iso8601.safeParse(parts[1]).success) {
    throw new CliError(`--window: '${text}' is not START/END with ISO 8601 date-times (e.g. 2026-06-16T05:00:00Z/2026-06-16T11:00:00Z)`);
  }
  const start_s = Date.parse(parts[0]!) / 1000, end_s = Date.parse(parts[1]!) / 1000;
  if (!(end_s > start_s)) throw new CliError(`--window: the end must come after the start`);
  return { start_s, end_s };
}

