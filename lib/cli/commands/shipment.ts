// corelag shipment review: every logger × product review of one shipment, and the shipment's outcome.
// Every trace is imported before anything is computed, so a refused file fails the command first,
// naming the file, row and column.
import path from "node:path";
import { limitSetSchema } from "../../exposure/limits";
import { packSchema, productSchema, modelChoiceSchema, type Pack, type Product } from "../../thermal/definitions";
import { tryRunReview, unsupportedRule } from "../../review";
import { CAUTIONS } from "../../review/cautions";
import { combineShipment, manifestSchema, type LoggerReviews } from "../../shipment";
import type { TraceImport } from "../../trace";
import { CliError, IMPORT_FLAGS, USAGE, importOptionsFrom, importTrace, readJsonFile } from "../common";
import { parseArgs } from "../args";

export async function shipmentCommand(argv: string[]): Promise<unknown> {
  const [sub, ...rest] = argv;
  if (sub !== "review") throw new CliError(`${sub ? `unknown subcommand '${sub}'` : "no subcommand given"}: use 'shipment review --manifest M.json'\n${USAGE}`);
  const { values } = parseArgs({ args: rest, options: { ...IMPORT_FLAGS, manifest: { type: "string" }, model: { type: "string" } }, strict: true });
  const importOptions = importOptionsFrom(values);
  if (!values.manifest) throw new CliError(`--manifest is required\n${USAGE}`);
  const model = modelChoiceSchema.safeParse(values.model ?? "auto");
  if (!model.success) throw new CliError(`--model: ${model.error.issues[0]!.message}`);
  const manifestFile = values.manifest;
  const manifest = readJsonFile(manifestFile, manifestSchema);
  const dir = path.dirname(manifestFile);
  const at = (p: string) => (path.isAbsolute(p) ? p : path.join(dir, p));
  const limitsFile = at(manifest.limits);
  const limits = readJsonFile(limitsFile, limitSetSchema);

  const products = new Map<string, Product>(), packs = new Map<string, Pack>();
  const productOf = (p: string) => products.get(p) ?? products.set(p, readJsonFile(at(p), productSchema)).get(p)!;
  const packOf = (p: string) => packs.get(p) ?? packs.set(p, readJsonFile(at(p), packSchema)).get(p)!;
  manifest.loggers.forEach((l, i) => l.products.forEach((e, j) => {
    const product = productOf(e.product);
    if (e.pack) packOf(e.pack);
    else if (product.h_W_m2K === undefined) throw new CliError(`${manifestFile}: field 'loggers.${i}.products.${j}.pack': ${e.product} has no surface coefficient h_W_m2K; give the pack used`);
  }));

  const imported: TraceImport[] = [];
  for (const l of manifest.loggers) imported.push((await importTrace(at(l.trace), importOptions)).imported);
  imported.forEach((imp, i) => {
    const bad = unsupportedRule(limits, imp.series.probe_C !== undefined);
    if (bad) throw new CliError(`${limitsFile}: field 'rules.${bad.index}.channel': '${bad.channel}' is not available for ${manifest.loggers[i]!.trace}`);
  });

  const loggers: LoggerReviews[] = [];
  const out = manifest.loggers.map((l, i) => {
    const reviews = l.products.map((e) => {
      const attempt = tryRunReview({ series: imported[i]!.series, product: productOf(e.product), pack: e.pack ? packOf(e.pack) : undefined, limits, options: { model: model.data }, gapMultiple: imported[i]!.settings.gapMultiple });
      if (!attempt.ok) throw new CliError(`${l.trace} with ${e.product}: ${attempt.message}`);
      return { product: e.product, governing: e.governing, result: attempt.computation.result };
    });
    loggers.push({ key: l.trace, position: l.position, reviews });
    return reviews;
  });
  const combined = combineShipment(loggers);
  return {
    reference: manifest.reference,
    outcome: combined.outcome,
    products: combined.products.map((p) => ({ product: p.product, outcome: p.outcome, governing_logger: p.governing_logger })),
    loggers: manifest.loggers.map((l, i) => ({
      trace: l.trace,
      position: l.position ?? null,
      outcome: combined.loggers[i]!.outcome,
      reviews: out[i]!.map((r) => ({ product: r.product, outcome: r.result.outcome, rules: r.result.rules })),
    })),
    cautions: [
      ...CAUTIONS,
      "The shipment is rejected if any product's governing review rejects, held if any holds, and accepted only if all accept; a product without a named governing logger is governed by the worst of the loggers covering it.",
      "Each logger stands for the products listed with it; a product's position in the load away from every logger is not covered.",
      ...combined.notes,
    ],
  };
}
