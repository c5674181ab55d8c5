// corelag profile from-traces: a design profile at a chosen percentile per time step of several air traces,
// aligned by departure or time of day; printed in the stored profile format, ready for `size --profile`.
import path from "node:path";
import { z } from "zod";
import { sha256Hex } from "../../trace";
import { profileSchema } from "../../design/profile";
import { envelopeProfile, historyEnvelope, HISTORY_PROFILE_CAUTION } from "../../shipment";
import { CliError, IMPORT_FLAGS, USAGE, importOptionsFrom, importTrace } from "../common";
import { parseArgs } from "../args";

const flags = z.object({
  percentile: z.coerce.number({ error: "must be a number between 0 and 100" }).min(0, { message: "must be between 0 and 100" }).max(100, { message: "must be between 0 and 100" }),
  step: z.coerce.number({ error: "must be a number of minutes" }).refine((m) => Number.isInteger(Math.round(m * 60 * 1e6) / 1e6) && m * 60 >= 10 && m <= 1440, { message: "must be a whole number of seconds from 10 s (0.1667 min) to 1440 min" }),
  align: z.enum(["departure", "time-of-day"], { error: "must be departure or time-of-day" }),
  smooth: z.coerce.number().int({ message: "must be an odd whole number of steps" }).min(1).max(999).refine((k) => k % 2 === 1, { message: "must be an odd whole number of steps" }),
});

export async function profileCommand(argv: string[]): Promise<unknown> {
  const [sub, ...rest] = argv;
  if (sub !== "from-traces") throw new CliError(`${sub ? `unknown subcommand '${sub}'` : "no subcommand given"}: use 'profile from-traces FILE... --percentile P --step-min M'\n${USAGE}`);
  const { values, positionals } = parseArgs({
    args: rest,
    options: { ...IMPORT_FLAGS, percentile: { type: "string" }, "step-min": { type: "string" }, align: { type: "string" }, "smooth-steps": { type: "string" }, name: { type: "string" } },
    strict: true,
    allowPositionals: true,
  });
  const importOptions = importOptionsFrom(values);
  if (positionals.length === 0) throw new CliError(`give at least one trace FILE\n${USAGE}`);
  if (values.percentile === undefined) throw new CliError(`--percentile is required\n${USAGE}`);
  if (values["step-min"] === undefined) throw new CliError(`--step-min is required\n${USAGE}`);
  const check = <K extends keyof typeof flags.shape>(k: K, flag: string, v: unknown) => {
    const r = flags.shape[k].safeParse(v);
    if (!r.success) throw new CliError(`${flag}: '${String(v)}' ${r.error.issues[0]!.message}`);
    return r.data as z.infer<(typeof flags.shape)[K]>;
  };
  const percentile = check("percentile", "--percentile", values.percentile);
  const step_min = check("step", "--step-min", values["step-min"]);
  const align = check("align", "--align", values.align ?? "departure");
  const smooth_steps = check("smooth", "--smooth-steps", values["smooth-steps"] ?? "1");
  const step_s = Math.round(step_min * 60);

  const sources: Array<{ file: string; sha256: string }> = [];
  const traces = [];
  for (const file of positionals) {
    const { imported, bytes } = await importTrace(file, importOptions);
    sources.push({ file: path.basename(file), sha256: sha256Hex(bytes) });
    traces.push({ t_s: imported.series.t_s, air_C: imported.series.air_C });
  }
  let env;
  try {
    env = historyEnvelope(traces, { percentile, step_s, align, smooth_steps, timeZone: importOptions.timeZone });
  } catch (e) {
    throw new CliError(`${e instanceof Error ? e.message : String(e)}`);
  }
  const name = values.name ?? `P${percentile} of ${positionals.length} trace${positionals.length === 1 ? "" : "s"}, ${step_min} min steps, aligned by ${align}`;
  const profile = { ...envelopeProfile(env, step_s, name.slice(0, 120)), percentile, step_min, sources };
  const valid = profileSchema.safeParse(profile);
  if (!valid.success) {
    const issue = valid.error.issues[0]!;
    throw new CliError(`the profile cannot be stored: field '${issue.path.join(".")}': ${issue.message}${issue.path[0] === "segments" ? " (choose a longer --step-min)" : ""}`);
  }
  process.stderr.write(`note: ${HISTORY_PROFILE_CAUTION}\n`);
  return profile;
}
