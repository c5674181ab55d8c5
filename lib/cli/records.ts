// The record commands: verify, anchor, key rotate, seal. Each returns the text to print and the exit
// code; a bad flag or an unreadable anchor throws RecordsUsageError (exit 2).
import { existsSync, readFileSync } from "node:fs";
import { parseArgs } from "node:util";
import { anchorSchema, type Anchor } from "../review/anchor";
import { currentCliActor } from "./common";

export class RecordsUsageError extends Error {}

export interface CommandResult {
  stdout: string;
  stderr?: string;
  code: number;
}

/** An anchor given as a JSON string or as a file holding one (the last non-empty line counts). */
export function parseAnchorArg(arg: string): Anchor {
  const text = arg.trim().startsWith("{") ? arg : existsSync(arg) ? readFileSync(arg, "utf8") : null;
  if (text === null) throw new RecordsUsageError(`--anchor: '${arg}' is neither anchor JSON nor a file that exists`);
  const line = text.split("\n").map((l) => l.trim()).filter(Boolean).at(-1) ?? "";
  let raw: unknown;
  try {
    raw = JSON.parse(line);
  } catch (e) {
    throw new RecordsUsageError(`--anchor: is not valid JSON (${(e as Error).message})`);
  }
  const parsed = anchorSchema.safeParse(raw);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    throw new RecordsUsageError(`--anchor: field '${issue.path.join(".") || "(anchor)"}': ${issue.message}`);
  }
  return parsed.data;
}

/** Exit 0 when everything holds, 1 with every finding listed otherwise; never 3 on a damaged database. */
export async function verifyCommand(argv: string[]): Promise<CommandResult> {
  const { values } = parseArgs({ args: argv, options: { review: { type: "string" }, anchor: { type: "string" }, json: { type: "boolean" }, format: { type: "string", default: "json" } }, strict: true });
  if (values.format !== "json") throw new RecordsUsageError("--format: only 'json' is supported");
  const anchor = values.anchor === undefined ? undefined : parseAnchorArg(values.anchor);
  const { verifyRecords } = await import("../services/verify");
  const report = await verifyRecords({ reviewId: values.review, anchor });
  return { stdout: JSON.stringify(report, null, 2) + "\n", code: report.ok ? 0 : 1 };
}

/** One JSON line: the chain's head, to be kept outside the database; --post also sends it to CORELAG_ANCHOR_WEBHOOK. */
export async function anchorCommand(argv: string[]): Promise<CommandResult> {
  const { values } = parseArgs({ args: argv, options: { post: { type: "boolean" } }, strict: true });
  const { takeAnchor, postAnchor } = await import("../services/verify");
  const r = await takeAnchor();
  if (!r.anchor) return { stdout: "", stderr: `corelag anchor: nothing to anchor: ${r.reason}\n`, code: 1 };
  const line = JSON.stringify(r.anchor) + "\n";
  if (!values.post) return { stdout: line, code: 0 };
  const { config } = await import("../config");
  const posted = await postAnchor(r.anchor, config().CORELAG_ANCHOR_WEBHOOK);
  return { stdout: line, stderr: posted.ok ? undefined : `corelag anchor: ${posted.message}\n`, code: posted.ok ? 0 : 1 };
}

/** `key rotate`: a new signing key, endorsed in the chain by the outgoing one. */
export async function keyCommand(argv: string[]): Promise<CommandResult> {
  const { positionals } = parseArgs({ args: argv, options: {}, allowPositionals: true, strict: true });
  if (positionals[0] !== "rotate" || positionals.length !== 1) throw new RecordsUsageError("usage: corelag key rotate");
  const { rotateKey } = await import("../services/verify");
  const r = await rotateKey(currentCliActor());
  if (!r.ok) return { stdout: "", stderr: `corelag key: ${r.message}\n`, code: 1 };
  return { stdout: JSON.stringify({ rotated: true, from_key_fingerprint: r.from, key_fingerprint: r.to, entry: r.seq }) + "\n", code: 0 };
}

/** `seal`: once after upgrading, content hashes for rows whose entries predate them. */
export async function sealCommand(argv: string[]): Promise<CommandResult> {
  parseArgs({ args: argv, options: {}, strict: true });
  const { sealRows } = await import("../services/verify");
  return { stdout: JSON.stringify({ sealed: await sealRows(currentCliActor()) }) + "\n", code: 0 };
}

/** `backup --out FILE`: a consistent copy while the app runs; prints what was written. */
export async function backupCommand(argv: string[]): Promise<CommandResult> {
  const { values } = parseArgs({ args: argv, options: { out: { type: "string" } }, strict: true });
  if (!values.out) throw new RecordsUsageError("--out FILE is required: where to write the backup");
  const { config } = await import("../config");
  const { backupDatabase, BackupError } = await import("../services/verify");
  try {
    return { stdout: JSON.stringify(await backupDatabase(config().DATABASE_URL, values.out), null, 2) + "\n", code: 0 };
  } catch (e) {
    if (e instanceof BackupError) throw new RecordsUsageError(e.message);
    throw e;
  }
}

/** `restore FILE`: a backup into the empty database DATABASE_URL names; run verify on it afterwards. */
export async function restoreCommand(argv: string[]): Promise<CommandResult> {
  const { positionals } = parseArgs({ args: argv, options: {}, allowPositionals: true, strict: true });
  if (positionals.length !== 1) throw new RecordsUsageError("usage: corelag restore FILE (into the empty database DATABASE_URL names)");
  const { config } = await import("../config");
  const { restoreDatabase, BackupError } = await import("../services/verify");
  try {
    const r = await restoreDatabase(config().DATABASE_URL, positionals[0]!);
    return { stdout: JSON.stringify({ restored: true, ...r, next: "run corelag verify on the restored database (with the signing key of the original)" }, null, 2) + "\n", code: 0 };
  } catch (e) {
    if (e instanceof BackupError) throw new RecordsUsageError(e.message);
    throw e;
  }
}

export const RECORD_COMMANDS: Record<string, (argv: string[]) => Promise<CommandResult>> = {
  backup: backupCommand,
  restore: restoreCommand,
  verify: verifyCommand,
  anchor: anchorCommand,
  key: keyCommand,
  seal: sealCommand,
};
