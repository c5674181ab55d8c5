// corelag token create|list|revoke: API tokens, through lib/services/apiTokens. The token is printed once,
// when created; only its SHA-256 is stored. The audit log names the operating-system user who ran it.
import { parseArgs } from "node:util";
import { CliError, currentCliActor } from "../common";

export const TOKEN_USAGE = `usage:
  corelag token create --user EMAIL --name NAME [--expires-days N] [--scope read|write|device] [--monitor ID] [--format json]
  corelag token list [--user EMAIL] [--all]
  corelag token revoke ID`;

const FLAG_OF: Record<string, string> = { email: "--user", name: "--name", expiresDays: "--expires-days", scope: "--scope", monitorId: "--monitor" };

async function create(argv: string[]): Promise<string> {
  const { values, positionals } = parseArgs({
    args: argv,
    options: { user: { type: "string" }, name: { type: "string" }, "expires-days": { type: "string" }, scope: { type: "string" }, monitor: { type: "string" }, format: { type: "string" } },
    allowPositionals: true,
    strict: true,
  });
  if (positionals.length > 0) throw new CliError(`unexpected '${positionals[0]}'\n${TOKEN_USAGE}`);
  if (!values.user) throw new CliError(`--user is required (the owner's e-mail address)\n${TOKEN_USAGE}`);
  if (!values.name) throw new CliError(`--name is required (what the token is for, e.g. "warehouse gateway")\n${TOKEN_USAGE}`);
  if (values.format !== undefined && values.format !== "json" && values.format !== "text") throw new CliError("--format: json or text");
  let expiresDays: number | undefined;
  if (values["expires-days"] !== undefined) {
    if (!/^\d+$/.test(values["expires-days"])) throw new CliError(`--expires-days: '${values["expires-days"]}' is not a whole number of days`);
    expiresDays = Number(values["expires-days"]);
  }
  const { createToken } = await import("../../services/apiTokens");
  const r = await createToken({ email: values.user, name: values.name, expiresDays, scope: values.scope as "read" | undefined, monitorId: values.monitor }, currentCliActor());
  if (!r.ok) throw new CliError(`${FLAG_OF[r.field] ?? r.field}: ${r.message}`);
  const c = r.created;
  if (values.format === "json") return JSON.stringify({ id: c.id, token: c.token, scope: c.scope, expires_at: c.expires_at, ...(c.monitor_id ? { monitor_id: c.monitor_id } : {}) }) + "\n";
  return [
    c.token,
    "",
    `id ${c.id} · owner ${c.owner} · scope ${c.scope}${c.monitor_id ? ` (monitor ${c.monitor_id})` : ""} · ${c.expires_at ? `expires ${c.expires_at}` : "does not expire (revoke it with corelag token revoke)"}`,
    "This is the only time the token is shown; only its SHA-256 is stored. Keep it in a secret store.",
    "Send it as the header  Authorization: Bearer <the token above>  (e.g. curl -H \"Authorization: Bearer $TOKEN\" http://HOST/api/v1/reviews).",
    "",
  ].join("\n");
}

async function list(argv: string[]): Promise<string> {
  const { values, positionals } = parseArgs({ args: argv, options: { user: { type: "string" }, all: { type: "boolean" }, format: { type: "string" } }, allowPositionals: true, strict: true });
  if (positionals.length > 0) throw new CliError(`unexpected '${positionals[0]}'\n${TOKEN_USAGE}`);
  if (values.format !== undefined && values.format !== "json") throw new CliError("--format: only 'json' is supported");
  const { listTokens } = await import("../../services/apiTokens");
  const r = await listTokens({ email: values.user, includeRevoked: values.all ? true : false });
  if (!r.ok) throw new CliError(`--user: ${r.message}`);
  return JSON.stringify(r.tokens, null, 2) + "\n";
}

async function revoke(argv: string[]): Promise<string> {
  const { positionals } = parseArgs({ args: argv, options: {}, allowPositionals: true, strict: true });
  if (positionals.length !== 1) throw new CliError(`give exactly one token ID to revoke (corelag token list shows them)\n${TOKEN_USAGE}`);
  const { revokeToken, tokenListItem } = await import("../../services/apiTokens");
  const r = await revokeToken(positionals[0]!, currentCliActor());
  if (!r.ok) throw new CliError(r.message);
  return JSON.stringify({ revoked: tokenListItem(r.token) }, null, 2) + "\n";
}

/** Prints its own output (the token once, or JSON) and returns nothing; bad input throws CliError (exit 2). */
export async function tokenCommand(argv: string[]): Promise<undefined> {
  const [sub, ...rest] = argv;
  const run = sub === "create" ? create : sub === "list" ? list : sub === "revoke" ? revoke : undefined;
  if (!run) throw new CliError(`${sub ? `unknown subcommand '${sub}'` : "give a subcommand"}\n${TOKEN_USAGE}`);
  process.stdout.write(await run(rest));
  return undefined;
}
