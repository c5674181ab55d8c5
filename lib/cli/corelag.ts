// The command line's entry point. `--help` and `--version` are answered here, before any engine module is
// loaded, so that they return at once; every command is loaded on demand (a separate chunk in the bundle).
import { COMMAND_HELP, PROGRAM_HELP } from "./help";

declare const __CORELAG_VERSION__: string | undefined;
declare const __CORELAG_ENGINE_VERSION__: string | undefined;

async function versions(): Promise<{ version: string; engine: string }> {
  // The bundle has both baked in at build time (scripts/build-cli.mjs); from source, read them.
  if (typeof __CORELAG_VERSION__ === "string" && typeof __CORELAG_ENGINE_VERSION__ === "string") {
    return { version: __CORELAG_VERSION__, engine: __CORELAG_ENGINE_VERSION__ };
  }
  const { readFileSync } = await import("node:fs");
  const path = await import("node:path");
  const pkg = JSON.parse(readFileSync(path.join(__dirname, "..", "..", "package.json"), "utf8")) as { version: string };
  const { ENGINE_VERSION } = await import("../review/runReview");
  return { version: pkg.version, engine: ENGINE_VERSION };
}

async function entry(argv: string[]): Promise<void> {
  const [command] = argv;
  if (argv.includes("--version") && (command === "--version" || argv.length === 1)) {
    const v = await versions();
    process.stdout.write(`corelag ${v.version} (engine ${v.engine})\n`);
    return;
  }
  if (command === undefined || command === "--help" || command === "-h" || command === "help") {
    process.stdout.write(PROGRAM_HELP + "\n");
    return;
  }
  if ((argv.includes("--help") || argv.includes("-h")) && COMMAND_HELP[command]) {
    process.stdout.write(COMMAND_HELP[command] + "\n");
    return;
  }
  const { runCli } = await import("./main");
  process.exitCode = await runCli(argv);
}

entry(process.argv.slice(2)).catch((e: unknown) => {
  process.stderr.write(`corelag: ${e instanceof Error ? e.message : String(e)}\n`);
  process.exitCode = 3;
});
