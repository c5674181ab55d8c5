// corelag review: predicts the core and judges a limit set; the same result a stored review holds.
import { sha256Hex } from "../../trace";
import { CHANNELS, limitSetSchema, type Channel } from "../../exposure/limits";
import { unmatchedConsequenceRule } from "../../exposure/consequenceRules";
import { tryRunReview, unsupportedRule } from "../../review";
import { uncertaintySpecSchema } from "../../uncertainty/monteCarlo";
import { CliError, IMPORT_FLAGS, USAGE, importOptionsFrom, importTrace, iso, modelInputs, parseWindow, readJsonFile } from "../common";
import { parseArgs } from "../args";

export async function reviewCommand(argv: string[]): Promise<unknown> {
  const { values } = parseArgs({
    args: argv,
    options: { ...IMPORT_FLAGS, trace: { type: "string" }, product: { type: "string" }, pack: { type: "string" }, limits: { type: "string" }, model: { type: "string" }, window: { type: "string" }, uncertainty: { type: "string" }, "consequence-channels": { type: "string" } },
    strict: true,
  });
  const importOptions = importOptionsFrom(values);
  if (!values.limits) throw new CliError(`--limits is required\n${USAGE}`);
  const { product, pack, model } = modelInputs(values);
  const limits = readJsonFile(values.limits, limitSetSchema);
  const window = values.window === undefined ? undefined : parseWindow(values.window);
  const { imported, bytes } = await importTrace(String(values.trace), importOptions);
  const bad = unsupportedRule(limits, imported.series.probe_C !== undefined);
  if (bad) {
    const why = bad.channel === "probe" ? "the trace has no product-probe column (--product-col)" : "a review does not produce it";
    throw new CliError(`${values.limits}: field 'rules.${bad.index}.channel': '${bad.channel}' is not available: ${why}`);
  }
  const unmatched = unmatchedConsequenceRule(limits, product.consequences ?? []);
  if (unmatched) throw new CliError(`${values.limits}: field 'rules.${unmatched.index}': ${unmatched.message} (${values.product})`);
  const consequenceChannels = parseChannels(values["consequence-channels"], imported.series.probe_C !== undefined);
  const t = imported.series.t_s;
  if (window && (window.start_s < t[0]! || window.end_s > t[t.length - 1]!)) {
    throw new CliError(`--window: ${values.window} is not inside the trace (${iso(t[0]!)}/${iso(t[t.length - 1]!)})`);
  }
  const uncertainty = values.uncertainty ? readJsonFile(values.uncertainty, uncertaintySpecSchema) : undefined;
  const attempt = tryRunReview({ series: imported.series, product, pack, limits, options: { model, window, uncertainty, ...(consequenceChannels.length ? { consequence_channels: consequenceChannels } : {}) }, gapMultiple: imported.settings.gapMultiple });
  if (!attempt.ok) throw new CliError(`${values.product}${pack ? ` with ${values.pack}` : ""}: ${attempt.message}`);
  const { result } = attempt.computation;
  return {
    trace: { file: values.trace, sha256: sha256Hex(bytes), samples: imported.series.t_s.length, import_settings: imported.settings, warnings: imported.warnings },
    ...result,
    // always present in the CLI output (empty without growth or shelf-life models)
    consequences: result.consequences ?? [],
  };
}

/** --consequence-channels air,probe: channels the review produces, each once. */
function parseChannels(text: string | undefined, hasProbe: boolean): Channel[] {
  if (text === undefined) return [];
  const out: Channel[] = [];
  for (const c of text.split(",").map((x) => x.trim()).filter(Boolean)) {
    if (!(CHANNELS as readonly string[]).includes(c)) throw new CliError(`--consequence-channels: '${c}' is not one of ${CHANNELS.join(", ")}`);
    if (c === "probe" && !hasProbe) throw new CliError("--consequence-channels: 'probe' needs a product-probe column in the trace (--product-col)");
    if (!out.includes(c as Channel)) out.push(c as Channel);
  }
  return out;
}
