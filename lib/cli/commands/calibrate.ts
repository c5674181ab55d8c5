// corelag calibrate: fits the lumped time constant to a probe test.
import { bridgeGaps } from "../../trace";
import { packSchema, productSchema } from "../../thermal/definitions";
import { calibrateLumped } from "../../design/calibrate";
import { CliError, IMPORT_FLAGS, USAGE, importOptionsFrom, importTrace, readJsonFile } from "../common";
import { parseArgs } from "../args";

export async function calibrateCommand(argv: string[]): Promise<unknown> {
  const { values } = parseArgs({
    args: argv,
    options: { ...IMPORT_FLAGS, trace: { type: "string" }, product: { type: "string" }, pack: { type: "string" }, "fit-initial": { type: "boolean" }, "fit-offset": { type: "boolean" }, "mismatch-factor": { type: "string" } },
    strict: true,
  });
  const importOptions = importOptionsFrom(values);
  if (!values.trace) throw new CliError(`--trace is required\n${USAGE}`);
  const factor = values["mismatch-factor"] === undefined ? 2 : Number(values["mismatch-factor"]);
  if (!(factor > 1)) throw new CliError("--mismatch-factor: must be a number greater than 1");
  const product = values.product ? readJsonFile(values.product, productSchema) : undefined;
  const pack = values.pack ? readJsonFile(values.pack, packSchema) : undefined;
  if (pack && !product) throw new CliError("--pack: give the --product too");
  if (product && !pack && product.h_W_m2K === undefined) throw new CliError(`${values.product}: field 'h_W_m2K': give the product's surface coefficient, or a --pack`);
  const { imported } = await importTrace(values.trace, importOptions);
  const probe = imported.series.probe_C;
  if (!probe) throw new CliError(`${values.trace}: no product-probe column was found; name it with --product-col`);
  let r;
  try {
    r = calibrateLumped(imported.series.t_s, bridgeGaps(imported.series), probe, { fitInitial: values["fit-initial"] ?? false, fitOffset: values["fit-offset"] ?? false, mismatchFactor: factor }, product ? { product, pack } : undefined);
  } catch (e) {
    throw new CliError(`${values.trace}: ${(e as Error).message}`);
  }
  return {
    tau_s: r.tau_s,
    tau_ci95_s: r.tau_ci95_s,
    ...(r.offset_K !== undefined ? { offset_K: r.offset_K, offset_ci95_K: r.offset_ci95_K } : {}),
    initial_C: r.initial_C,
    ...(r.initial_ci95_C ? { initial_ci95_C: r.initial_ci95_C } : {}),
    rmse_K: r.rmse_K,
    samples: r.samples,
    residual_lag1: r.residual_lag1,
    ...(r.r_total_K_W !== undefined ? { r_total_K_W: r.r_total_K_W, h_eff_W_m2K: r.h_eff_W_m2K, r_total_from_definition_K_W: r.r_total_from_definition_K_W } : {}),
    warnings: [...imported.warnings, ...r.warnings],
  };
}
