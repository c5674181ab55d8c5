import { z } from "zod";

// Physical quantities at the boundary: each a finite number inside a plausible range for chilled and
// frozen food in transport, stated in the message so the user sees the range they must keep to.
// The ranges are wide on purpose (they refuse 1e308 kg and 1e-300 m, not unusual products); the
// table in README.md ("Plausible ranges") lists them. Where a bound has a physical reason it is noted.

const fmt = (x: number) => (Math.abs(x) >= 1e6 || (x !== 0 && Math.abs(x) < 1e-6) ? x.toExponential().replace("e+", "e") : String(x));

/**
 * A number in [min, max] (or (0, max] with `exclusiveMin`), named `what` and with its unit in every message:
 * "mass must be between 0.001 and 2000 kg".
 */
export function quantity(what: string, unit: string, min: number, max: number, opts: { exclusiveMin?: boolean } = {}) {
  const u = unit ? ` ${unit}` : "";
  const range = opts.exclusiveMin ? `greater than ${fmt(min)} and at most ${fmt(max)}${u}` : `between ${fmt(min)} and ${fmt(max)}${u}`;
  const msg = `${what} must be ${range}`;
  const base = z.number({ error: `${what} must be a number ${range}` }).finite({ message: msg });
  return (opts.exclusiveMin ? base.gt(min, { message: msg }) : base.min(min, { message: msg })).max(max, { message: msg });
}

/** A count of items in a list, capped so that a file cannot ask for unbounded work. */
export function capped<T extends z.ZodType>(item: T, what: string, max: number, min = 0) {
  const arr = z.array(item).max(max, { message: `at most ${max} ${what} are allowed` });
  return min > 0 ? arr.min(min, { message: `give at least ${min} ${what.replace(/s$/, "")}` }) : arr;
}

/** An object that refuses fields it does not know, naming them ("unknown field 'mass_g'"). */
export function strictObject<S extends z.ZodRawShape>(shape: S) {
  return z.strictObject(shape, {
    error: (iss) =>
      iss.code === "unrecognized_keys"
        ? `unknown field${iss.keys.length > 1 ? "s" : ""} ${iss.keys.map((k) => `'${k}'`).join(", ")}${suggest(iss.keys, Object.keys(shape))}`
        : undefined,
  });
}

/** A hint for a mistyped field: "mass_g" → "(did you mean 'mass_kg'?)" when exactly one known field has the same stem. */
function suggest(unknown: string[], known: string[]): string {
  if (unknown.length !== 1) return "";
  const stem = (k: string) => k.split("_")[0]!.toLowerCase();
  const hits = known.filter((k) => stem(k) === stem(unknown[0]!));
  return hits.length === 1 ? ` (did you mean '${hits[0]}'?)` : "";
}
