// Help texts of the command line. Kept free of engine imports so that `--help` and `--version` start at once.

const IMPORT_OPTIONS = `import options (every command that reads a trace):
  --sheet NAME            sheet of an .xlsx workbook (default: the first)
  --time-col NAME         column with the date-time (or the time, with --date-col)
  --date-col NAME         separate date column
  --air-col NAME          air-temperature column
  --product-col NAME      product-probe (or simulant) column
  --unit C|F|K            temperature unit when the headers do not say
  --tz ZONE               IANA time zone of local times without an offset (e.g. Europe/Lisbon)
  --date-order dmy|mdy|ymd
  --time-format datetime|unix-s|unix-ms|elapsed-s|elapsed-min|elapsed-h
  --start ISO             start time for elapsed times
  --decimal .|,           decimal separator
  --delimiter ,|;|tab||   field delimiter
  --missing CODE,CODE     codes that mean "no reading" (e.g. --missing -999,9999)
  --plausible-min C       readings below are flagged and left out (default -60)
  --plausible-max C       readings above are flagged and left out (default 80)
  --gap-multiple N        a pause longer than N × the median interval is a gap (default 3)
FILE may be - for standard input.`;

export const COMMAND_HELP: Record<string, string> = {
  import: `corelag import FILE [import options] [--format json]
Reads a logger file and prints what was read: samples, channels, start, end, median interval, gaps, warnings, settings.

${IMPORT_OPTIONS}`,
  predict: `corelag predict --trace FILE --product P.json [--pack K.json] [--model auto|lumped|conduction] [--out FILE.csv|-] [import options]
Predicts the core, surface and mean temperature through the recorded air. Prints the screening (Biot number, tau,
resistances, model and why) and the series as JSON; with --out the series go to a CSV file (--out - : CSV on standard
output, and nothing else is printed there).

${IMPORT_OPTIONS}`,
  review: `corelag review --trace FILE --product P.json [--pack K.json] --limits L.json [--model auto|lumped|conduction]
               [--window START/END] [--uncertainty U.json] [--consequence-channels air,probe] [import options] [--format json]
Predicts the core and judges every rule of the limit set (pass, fail or inconclusive under the guard band); prints the
review as JSON with the suggested outcome and its cautions. The product's growth and shelf-life models
("consequences") are applied to the core, to the channels --consequence-channels names and to those their rules
name; "consequences" in the output lists each, with its guard band (lower, upper).

${IMPORT_OPTIONS}`,
  calibrate: `corelag calibrate --trace FILE [--product-col NAME] [--product P.json] [--pack K.json] [--fit-initial] [--fit-offset]
                  [--mismatch-factor F] [import options] --format json
Fits the lumped time constant (and optionally the initial temperature and a sensor offset) to a probe test.

${IMPORT_OPTIONS}`,
  size: `corelag size --profile FILE(.csv|.json) --product P.json --pack K.json --limits L.json
             --vary layer:N:thickness_m|coolant:N:mass_kg|product:initial_C --min X --max Y [--model M] --format json
Finds the smallest insulation thickness or coolant mass (or the warmest start) that keeps every rule passing.`,
  simulate: `corelag simulate --monitor ID --trace FILE --speed 600 [--url http://127.0.0.1:3000] --token T [--quiet] [import options]
Replays a trace file's rows as live readings to a monitor (POST /api/v1/monitors/ID/readings with the device token T),
--speed times faster than real time (default 600: a 10-minute interval every second). Readings keep the file's times.
Progress goes to stderr; at the end prints JSON with the readings sent, accepted, duplicates and conflicts.

${IMPORT_OPTIONS}`,
  shipment: `corelag shipment review --manifest M.json [--model auto|lumped|conduction] [import options] --format json
Reviews every logger × product of a shipment and gives the shipment an outcome. The manifest (paths relative to it):
  {"reference", "lane"?, "limits": "L.json", "loggers": [{"trace": "FILE", "position"?, "serial"?,
   "products": [{"product": "P.json", "pack": "K.json"?, "governing"?: true}]}]}
A product is governed by the logger marked governing, else by the worst of the loggers covering it; the shipment is
rejected if any governing review rejects, held if any holds, accepted only if all accept. Every trace is imported
first: a refused file stops the command, naming the file, row and column.

${IMPORT_OPTIONS}`,
  profile: `corelag profile from-traces FILE... --percentile P --step-min M [--align departure|time-of-day] [--smooth-steps N]
                         [--name NAME] [import options] --format json
Builds a design profile from several air traces: aligned by time since departure (the first sample) or by time of
day (midnight in --tz, default UTC), resampled on a grid of M minutes by linear interpolation over the span all traces
cover, and at each step the P-th percentile across the traces (numpy's default linear definition), optionally
smoothed by a centred moving average over N steps (odd). Prints the stored profile format with percentile, step_min
and sources added, ready for size --profile. A per-step percentile is not the history of any real shipment and is more
severe than most of them.

${IMPORT_OPTIONS}`,
  verify: `corelag verify [--review ID] [--anchor FILE_OR_JSON] [--json]
Checks the database file (integrity check, foreign keys), the audit chain and its Ed25519 signatures, every trace,
definition and review against the content hash its latest audit entry recorded (and every entry against its row),
and re-runs stored reviews (all, or one) to confirm they reproduce bit for bit. With --anchor (a line printed by
corelag anchor, or a file holding it) it also fails when the chain no longer contains that head or was signed by
another key. Prints JSON listing every finding with its kind, table, row and audit entry; exits 1 on any finding.
Reads the database named by DATABASE_URL (environment, else .env).`,
  anchor: `corelag anchor [--post]
Prints the audit chain's head as one JSON line: {seq, hash, at, key_fingerprint, chain, anchored_at}. Keep it outside
this machine (mail it, print it, commit it elsewhere); corelag verify --anchor then detects removed or rewritten entries.
--post also sends the line to the URL in CORELAG_ANCHOR_WEBHOOK (exit 1 if that fails); run it daily from cron.`,
  key: `corelag key rotate
Makes a new signing key, records it in the audit chain signed by the outgoing key, and deletes the old private key.`,
  backup: `corelag backup --out FILE
A consistent copy of the database named by DATABASE_URL, taken while the app keeps running: SQLite's online backup
API (the copy passes SQLite's integrity check before it is kept), or pg_dump's custom format for PostgreSQL (pg_dump
must be installed). Never overwrites FILE. The signing key is not in the backup: keep the key file apart.
Prints {database, out, bytes, sha256, head_seq}.`,
  restore: `corelag restore FILE
Restores a backup made by corelag backup into the database named by DATABASE_URL, which must be empty (a SQLite path
that does not exist yet; a PostgreSQL database without tables, created when missing). All or nothing. Then run
corelag verify on it, with the original's signing key (CORELAG_SIGNING_KEY_FILE).`,
  user: `corelag user add --email E --name N --role admin|reviewer|designer|auditor --password-stdin
corelag user list
corelag user set-role --email E --role R
corelag user set-password --email E --password-stdin   (a new password: the user's sessions end, a lockout lifts)
corelag user disable --email E      (and user enable --email E)
Accounts of the web app. The password is read from standard input (first line), never from the command line.
Every change is recorded in the audit log as cli:<operating-system user>. An administrator cannot be demoted or
disabled while they are the only enabled one.`,
  seal: `corelag seal
Once after upgrading: records the content hash of every row whose audit entries were written before entries carried one.`,
  token: `corelag token create --user EMAIL --name NAME [--expires-days N] [--scope read|write|device] [--monitor ID] [--format json]
corelag token list [--user EMAIL] [--all]
corelag token revoke ID
API tokens for /api/v1 (Authorization: Bearer <token>). create prints the token once (with --format json:
{"id", "token", "scope", "expires_at"}); only its SHA-256 is stored. A token acts with its owner's role narrowed by
its scope: read (GET only, the default), write (everything the owner's role allows), device (posting readings only,
to the one monitor given with --monitor: each monitor is made with one, and this makes a replacement).
list prints the tokens (not revoked ones unless --all) with owner, scope, expiry and last use; revoke refuses the
token from the next request on. Each create and revoke is audited with the operating-system user.`,
};

const SUMMARY: Record<string, string> = {
  import: "read a logger file and show what was read",
  predict: "predict the core temperature through the recorded air",
  review: "predict the core and judge a limit set; suggest an outcome",
  calibrate: "fit the time constant to a probe test",
  size: "size insulation or coolant against a profile and a limit set",
  simulate: "replay a trace file as live readings to a monitor",
  shipment: "review a shipment: every logger × product, and the shipment's outcome",
  profile: "build a design profile from several air traces at a percentile per time step",
  verify: "check the database, the signed audit chain, every record against it; re-run reviews",
  anchor: "print the chain head as one JSON line to keep elsewhere",
  key: "rotate the audit signing key (key rotate)",
  seal: "record content hashes for rows written before they existed",
  backup: "a consistent copy of the database while the app runs",
  restore: "restore a backup into an empty database",
  user: "add, list, change the role or password of, disable or enable web accounts",
  token: "create, list and revoke API tokens (token create|list|revoke)",
};

export const PROGRAM_HELP = `corelag: predicts product core temperature from cold-chain logger traces and judges it against your limits.

usage: corelag <command> [options]     (npm run -s corelag -- <command> …, or npx corelag …)

commands:
${Object.entries(SUMMARY)
  .map(([name, text]) => `  ${name.padEnd(10)} ${text}`)
  .join("\n")}

global options:
  --help, -h        this text, or a command's (corelag review --help)
  --version         program and engine version
  --debug           on an unexpected failure, print the stack trace

exit codes: 0 done; 1 verify found a problem; 2 bad input (one line on stderr naming the file and the row, column
or field); 3 unexpected failure (one line on stderr; rerun with --debug for the stack).

Predictions are model estimates: food-safety decisions follow local regulations and a responsible professional.`;
