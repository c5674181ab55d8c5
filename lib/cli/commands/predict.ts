// corelag predict: the core, surface and mean temperature through the recorded air.
import { bridgeGaps } from "../../trace";
import { predict } from "../../thermal/predict";
import { CAUTIONS } from "../../review/cautions";
import { CliError, IMPORT_FLAGS, importOptionsFrom, importTrace, iso, modelInputs } from "../common";
import { parseArgs } from "../args";
import { writeSeriesCsv } from "../seriesCsv";

export async function predictCommand(argv: string[]): Promise<unknown> {
  const { values } = parseArgs({
    args: argv,
    options: { ...IMPORT_FLAGS, trace: { type: "string" }, product: { type: "string" }, pack: { type: "string" }, model: { type: "string" }, out: { type: "string" } },
    strict: true,
  });
  const importOptions = importOptionsFrom(values);
  const { product, pack, model } = modelInputs(values);
  const { imported } = await importTrace(String(values.trace), importOptions);
  const { series } = imported;
  const air = bridgeGaps(series);
  let p;
  try {
    p = predict(product, pack, series.t_s, air, { model });
  } catch (e) {
    throw new CliError(`${values.product}${pack ? ` with ${values.pack}` : ""}: the engine could not compute a prediction: ${(e as Error).message}`);
  }
  const gaps = imported.gaps.map((g) => ({ start: iso(g.start_s), end: iso(g.end_s), duration_s: g.duration_s }));
  const screening = { ...p.screening, lumped_vs_conduction_K: p.lumped_vs_conduction_K };
  if (values.out) {
    const toStdout = values.out === "-";
    try {
      writeSeriesCsv(toStdout ? 1 : String(values.out), { t_s: series.t_s, air, core: p.core, surface: p.surface, mean: p.mean, coolant: p.coolant });
    } catch (e) {
      throw new CliError(`${values.out}: cannot be written (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})`);
    }
    if (toStdout) return undefined;
    return { screening, solver: p.solver, gaps, out: values.out, cautions: CAUTIONS };
  }
  const arr = (a: Float64Array) => Array.from(a, (x) => Number(x.toFixed(4)));
  return {
    screening,
    solver: p.solver,
    gaps,
    series: {
      t: Array.from(series.t_s, iso),
      air: arr(air),
      core: arr(p.core),
      surface: arr(p.surface),
      mean: arr(p.mean),
      ...(p.coolant ? { coolant: arr(p.coolant) } : {}),
    },
    cautions: CAUTIONS,
  };
}
