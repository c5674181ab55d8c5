// corelag size: the smallest insulation or coolant (or the warmest start) that keeps every rule passing.
import { modelChoiceSchema, packSchema, productSchema } from "../../thermal/definitions";
import { limitSetSchema } from "../../exposure/limits";
import { unmatchedConsequenceRule } from "../../exposure/consequenceRules";
import { unsupportedRule } from "../../review";
import { CAUTIONS } from "../../review/cautions";
import { profileSchema, profileSeries } from "../../design/profile";
import { parseVariable } from "../../design/vary";
import { size } from "../../design/sizing";
import { CliError, IMPORT_FLAGS, USAGE, importOptionsFrom, importTrace, readJsonFile } from "../common";
import { parseArgs } from "../args";

export async function sizeCommand(argv: string[]): Promise<unknown> {
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
  const unmatched = unmatchedConsequenceRule(limits, product.consequences ?? []);
  if (unmatched) throw new CliError(`${values.limits}: field 'rules.${unmatched.index}': ${unmatched.message} (${values.product})`);
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
