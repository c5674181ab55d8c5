import { parseArgs as nodeParseArgs, type ParseArgsConfig } from "node:util";

/** A value that begins with '-' but is a number or a list of numbers ("-999,9999", "-5", "-.5"), not a flag. */
const NEGATIVE_VALUE = /^-(\d|\.\d)/;

/**
 * Node's parseArgs reads `--missing -999,9999` as two flags and refuses it ("argument is ambiguous");
 * only `--missing=-999,9999` works. For a flag that takes a value, a following negative number is its
 * value: the pair is joined into `--flag=value` before parsing, so both spellings the README shows work.
 */
export function joinNegativeValues(args: readonly string[], options: ParseArgsConfig["options"] = {}): string[] {
  const out: string[] = [];
  for (let i = 0; i < args.length; i++) {
    const a = args[i]!;
    const next = args[i + 1];
    const name = a.startsWith("--") && !a.includes("=") ? a.slice(2) : a.length === 2 && a[0] === "-" ? Object.keys(options).find((k) => options[k]!.short === a[1]) : undefined;
    if (name !== undefined && options[name]?.type === "string" && next !== undefined && NEGATIVE_VALUE.test(next)) {
      out.push(`--${name}=${next}`);
      i++;
    } else out.push(a);
  }
  return out;
}

/** node:util parseArgs, with negative numbers accepted as the values of string flags. */
export function parseArgs<T extends ParseArgsConfig>(config: T): ReturnType<typeof nodeParseArgs<T>> {
  return nodeParseArgs({ ...config, args: joinNegativeValues(config.args ?? [], config.options) } as T);
}
