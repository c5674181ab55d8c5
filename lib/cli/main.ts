// Corelag command line: `npm run -s corelag -- <command> [options]`. Prints JSON on stdout; on bad input
// prints one line naming the file and the row or field at fault to stderr and exits non-zero.
import { readFileSync } from "node:fs";
import { parseArgs } from "node:util";
import { z } from "zod";
import { importCsv, importOptionsSchema, TraceImportError, sha256Hex } from "../trace";
import { bareProductSchema } from "../thermal/product";
import { limitSetSchema } from "../exposure/limits";
import { runReview } from "../review";

class CliError extends Error {}

const USAGE = `usage: corelag review --trace FILE.csv --product PRODUCT.json --limits LIMITS.json [--time-col NAME] [--air-col NAME] [--unit C|F|K] [--tz ZONE] --format json`;

function readBytes(file: string): Uint8Array {
  try {
    return readFileSync(file);
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

function reviewCommand(argv: string[]): unknown {
  const { values } = parseArgs({
    args: argv,
    options: {
      trace: { type: "string" },
      product: { type: "string" },
      limits: { type: "string" },
      "time-col": { type: "string" },
      "air-col": { type: "string" },
      unit: { type: "string" },
      tz: { type: "string" },
      format: { type: "string", default: "json" },
    },
    strict: true,
  });
  for (const required of ["trace", "product", "limits"] as const) {
    if (!values[required]) throw new CliError(`--${required} is required\n${USAGE}`);
  }
  if (values.format !== "json") throw new CliError(`--format: only 'json' is supported`);
  const opts = importOptionsSchema.safeParse({
    timeColumn: values["time-col"],
    airColumn: values["air-col"],
    unit: values.unit,
    timeZone: values.tz,
  });
  if (!opts.success) {
    const issue = opts.error.issues[0]!;
    const flag = { timeColumn: "--time-col", airColumn: "--air-col", unit: "--unit", timeZone: "--tz" }[String(issue.path[0])] ?? "option";
    throw new CliError(`${flag}: ${issue.message}`);
  }
  const traceFile = values.trace!;
  const bytes = readBytes(traceFile);
  let imported;
  try {
    imported = importCsv(bytes, opts.data);
  } catch (e) {
    if (e instanceof TraceImportError) throw new CliError(`${traceFile}: ${e.message}`);
    throw e;
  }
  const product = readJsonFile(values.product!, bareProductSchema);
  const limits = readJsonFile(values.limits!, limitSetSchema);
  const bad = limits.rules.findIndex((r) => r.channel !== "air" && r.channel !== "core");
  if (bad >= 0) {
    throw new CliError(`${values.limits}: field 'rules.${bad}.channel': '${limits.rules[bad]!.channel}' needs a model this command does not run yet (air and core are available)`);
  }
  const { result } = runReview({ series: imported.series, product, limits });
  return {
    trace: {
      file: traceFile,
      sha256: sha256Hex(bytes),
      samples: imported.series.t_s.length,
      import_settings: imported.settings,
      warnings: imported.warnings,
    },
    ...result,
  };
}

const COMMANDS: Record<string, (argv: string[]) => unknown> = { review: reviewCommand };

function main(argv: string[]): number {
  const [command, ...rest] = argv;
  const run = command ? COMMANDS[command] : undefined;
  if (!run) {
    process.stderr.write(`${command ? `unknown command '${command}'` : "no command given"}\n${USAGE}\n`);
    return 2;
  }
  try {
    process.stdout.write(JSON.stringify(run(rest), null, 2) + "\n");
    return 0;
  } catch (e) {
    if (e instanceof CliError) {
      process.stderr.write(`corelag ${command}: ${e.message}\n`);
      return 2;
    }
    if (e instanceof TypeError && "code" in e && String((e as { code: string }).code).startsWith("ERR_PARSE_ARGS")) {
      process.stderr.write(`corelag ${command}: ${e.message}\n${USAGE}\n`);
      return 2;
    }
    throw e;
  }
}

process.exitCode = main(process.argv.slice(2));
