// Corelag command line: `npm run -s corelag -- <command> [options]`. Prints JSON on stdout; on bad input
// prints one line naming the file and the row or field at fault to stderr and exits 2. Each command lives
// in its own module (lib/cli/commands/) and is loaded only when it is run, so a command pays only for
// the engine parts it uses.
import { existsSync, statSync } from "node:fs";
import path from "node:path";
import { CliError, USAGE } from "./common";
import { RECORD_COMMANDS, RecordsUsageError } from "./records";

/**
 * The record commands (verify, anchor, key, seal) read and extend existing records; they must never
 * create a database. SQLite creates a missing file on open, so a mistyped DATABASE_URL would be
 * "verified" as an empty database: refuse it first, in one line (PostgreSQL: a database without tables).
 */
async function requireExistingDatabase(): Promise<void> {
  const { config } = await import("../config");
  let url: string;
  try {
    url = config().DATABASE_URL;
  } catch (e) {
    throw new CliError((e as Error).message);
  }
  if (/^postgres(ql)?:/.test(url)) {
    const { postgresDatabaseProblem } = await import("../services/verify");
    const problem = await postgresDatabaseProblem(url);
    if (problem) throw new CliError(problem);
    return;
  }
  const file = path.resolve(url.replace(/^file:/, ""));
  if (!existsSync(file)) throw new CliError(`DATABASE_URL: there is no database at ${file}; check the path (verify never creates one)`);
  if (!statSync(file).isFile() || statSync(file).size === 0) throw new CliError(`DATABASE_URL: ${file} is not a Corelag database (${statSync(file).isFile() ? "an empty file" : "not a file"})`);
}

type Command = (argv: string[]) => Promise<unknown>;
const COMMANDS: Record<string, () => Promise<Command>> = {
  import: async () => (await import("./commands/import")).importCommand,
  predict: async () => (await import("./commands/predict")).predictCommand,
  review: async () => (await import("./commands/review")).reviewCommand,
  calibrate: async () => (await import("./commands/calibrate")).calibrateCommand,
  size: async () => (await import("./commands/size")).sizeCommand,
  simulate: async () => (await import("./commands/simulate")).simulateCommand,
  shipment: async () => (await import("./commands/shipment")).shipmentCommand,
  profile: async () => (await import("./commands/profile")).profileCommand,
  user: async () => (await import("./commands/user")).userCommand,
  token: async () => (await import("./commands/token")).tokenCommand,
};
/** Commands that work on the database: it must already exist (npm start creates and migrates it). */
const DATABASE_COMMANDS = new Set(["user", "token"]);

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
      // restore writes into an empty database, which is the one kind it must not refuse
      if (command !== "restore") await requireExistingDatabase();
      // verify: exit 1 on any finding, the JSON lists each with its kind, row and audit entry.
      const r = await records(rest);
      process.stdout.write(r.stdout);
      if (r.stderr) process.stderr.write(r.stderr);
      return r.code;
    }
    if (DATABASE_COMMANDS.has(command!)) await requireExistingDatabase();
    const output = await (await run!())(rest);
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
