// corelag import: reads a logger file and prints what was read.
import { medianInterval_s } from "../../trace";
import { CliError, IMPORT_FLAGS, USAGE, importOptionsFrom, importTrace, iso } from "../common";
import { parseArgs } from "../args";

export async function importCommand(argv: string[]): Promise<unknown> {
  const { values, positionals } = parseArgs({ args: argv, options: IMPORT_FLAGS, allowPositionals: true, strict: true });
  if (positionals.length !== 1) throw new CliError(`give exactly one FILE to import\n${USAGE}`);
  const file = positionals[0]!;
  const { imported } = await importTrace(file, importOptionsFrom(values));
  const { series, warnings } = imported;
  const n = series.t_s.length;
  return {
    samples: n,
    channels: imported.channels,
    start: iso(series.t_s[0]!),
    end: iso(series.t_s[n - 1]!),
    median_interval_s: medianInterval_s(series.t_s),
    gaps: imported.gaps.map((g) => ({ start: iso(g.start_s), end: iso(g.end_s), duration_s: g.duration_s })),
    warnings,
    settings: imported.settings,
  };
}
