// corelag simulate: replays a trace file's rows as live readings to a monitor, faster than real time, so a
// newcomer can watch a monitor, its forecast and its alerts with the demo data. Readings keep the file's own
// times (so closing the monitor reviews the same readings as the file); they are sent as the replay clock
// reaches them: a 2-minute interval at --speed 600 is 0.2 s.
import { z } from "zod";
import { CliError, IMPORT_FLAGS, importOptionsFrom, importTrace, iso } from "../common";
import { parseArgs } from "../args";

const flagsSchema = z.object({
  monitor: z.string({ error: "--monitor ID is required" }).trim().min(1, { message: "--monitor ID is required" }),
  trace: z.string({ error: "--trace FILE is required" }).min(1, { message: "--trace FILE is required" }),
  token: z.string({ error: "--token T (the monitor's device token) is required" }).trim().min(1, { message: "--token T is required" }),
  speed: z.coerce.number({ error: "--speed must be a number" }).finite({ message: "--speed must be a number" }).positive({ message: "--speed must be above 0" }).max(1e7, { message: "--speed must be at most 10 000 000" }).default(600),
  url: z.url({ protocol: /^https?$/, message: "--url must be an http(s) URL, e.g. http://127.0.0.1:3000" }).default("http://127.0.0.1:3000"),
});
const FLAG: Record<string, string> = { monitor: "--monitor", trace: "--trace", token: "--token", speed: "--speed", url: "--url" };

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

export async function simulateCommand(argv: string[]): Promise<unknown> {
  const { values } = parseArgs({ args: argv, options: { ...IMPORT_FLAGS, monitor: { type: "string" }, trace: { type: "string" }, token: { type: "string" }, speed: { type: "string" }, url: { type: "string" }, quiet: { type: "boolean" } }, strict: true });
  const parsed = flagsSchema.safeParse(values);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    const flag = FLAG[String(issue.path[0])];
    throw new CliError(issue.message.startsWith("--") || !flag ? issue.message : `${flag}: ${issue.message}`);
  }
  const f = parsed.data;
  const { imported } = await importTrace(f.trace, importOptionsFrom(values));
  const { t_s, air_C, probe_C } = imported.series;
  const rows = Array.from(t_s, (t, i) => ({ t, air: air_C[i]!, probe: probe_C?.[i] })).filter((r) => !Number.isNaN(r.air));
  if (rows.length === 0) throw new CliError(`${f.trace}: no air readings to replay`);
  const endpoint = `${f.url.replace(/\/$/, "")}/api/v1/monitors/${encodeURIComponent(f.monitor)}/readings`;
  const totals = { sent: 0, accepted: 0, duplicates: 0, conflicts: 0 };
  const started = Date.now();
  const t0 = rows[0]!.t;
  let i = 0;
  while (i < rows.length) {
    // every row whose replay time has come goes in one request
    const due = t0 + ((Date.now() - started) / 1000) * f.speed;
    const batch = [rows[i]!];
    while (i + batch.length < rows.length && rows[i + batch.length]!.t <= due) batch.push(rows[i + batch.length]!);
    const body = JSON.stringify({ readings: batch.map((r) => ({ t: iso(r.t), air_C: r.air, ...(r.probe !== undefined && !Number.isNaN(r.probe) ? { probe_C: r.probe } : {}) })) });
    let res: Response;
    try {
      res = await fetch(endpoint, { method: "POST", headers: { "Content-Type": "application/json", Authorization: `Bearer ${f.token}` }, body });
    } catch (e) {
      throw new CliError(`--url: cannot reach ${f.url} (${e instanceof Error ? (e.cause instanceof Error ? e.cause.message : e.message) : String(e)}); is the app running?`);
    }
    const answer = (await res.json().catch(() => ({}))) as { detail?: string; accepted?: number; duplicates?: number; conflicts?: unknown[] };
    if (!res.ok) throw new CliError(`the server refused readings ${i + 1}–${i + batch.length} (HTTP ${res.status}): ${answer.detail ?? "no detail"}`);
    totals.sent += batch.length;
    totals.accepted += answer.accepted ?? 0;
    totals.duplicates += answer.duplicates ?? 0;
    totals.conflicts += answer.conflicts?.length ?? 0;
    i += batch.length;
    if (!values.quiet) process.stderr.write(`\r${i}/${rows.length} readings sent (${iso(batch[batch.length - 1]!.t)})`);
    if (i < rows.length) {
      const wait = ((rows[i]!.t - t0) / f.speed) * 1000 - (Date.now() - started);
      if (wait > 0) await sleep(wait);
    }
  }
  if (!values.quiet) process.stderr.write("\n");
  return { monitor: f.monitor, url: f.url, speed: f.speed, first: iso(t0), last: iso(rows[rows.length - 1]!.t), ...totals, wall_s: (Date.now() - started) / 1000 };
}
