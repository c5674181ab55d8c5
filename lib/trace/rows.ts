import Papa from "papaparse";

/**
 * One row of a delimited text: its cells, the offset just past it (for progress), and the parser's
 * complaint about it (an unclosed or malformed quote), if any.
 */
export type RowHandler = (cells: string[], cursor: number, problem: string | undefined) => void;

interface PapaInternals {
  ParserHandle?: new (config: object) => { guessLineEndings?: (input: string, quoteChar: string) => string };
}

/** The line break Papa Parse would use for this text (its own guess, from its first megabyte), or null if it offers none. */
function papaLineBreak(text: string): "\n" | "\r" | "\r\n" | null {
  const Handle = (Papa as unknown as PapaInternals).ParserHandle;
  const guess = Handle ? new Handle({}).guessLineEndings?.(text, '"') : undefined;
  return guess === "\n" || guess === "\r" || guess === "\r\n" ? guess : null;
}

/**
 * Calls `onRow` for every row of `text`, in order, exactly as `Papa.parse(text, { delimiter, step })`
 * would hand them over; a throw from `onRow` stops the pass and propagates.
 *
 * Text without a quote character is split here by the same rule Papa Parse applies to it (papaparse
 * 5.7.1, `Parser.parse` "fast mode": a leading BOM dropped, the text split at its guessed line break,
 * each line split at the delimiter), without Papa's per-row result objects: on a million rows those
 * cost as much as the splitting itself. Text with quotes goes through Papa Parse.
 * tests/unit/rows.test.ts checks both paths give the same rows on line-break and BOM variants.
 */
export function forEachRow(text: string, delimiter: string, onRow: RowHandler): void {
  const input = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  const newline = input.indexOf('"') === -1 ? papaLineBreak(input) : null;
  if (newline === null) {
    papaRows(text, delimiter, onRow);
    return;
  }
  if (input === "") return;
  const step = newline.length;
  let from = 0;
  for (;;) {
    const at = input.indexOf(newline, from);
    const line = at === -1 ? input.slice(from) : input.slice(from, at);
    const cursor = at === -1 ? input.length : at + step;
    onRow(line.split(delimiter), cursor, undefined);
    if (at === -1) return;
    from = cursor;
  }
}

/** The rows as Papa Parse's step callback gives them (any text, quotes included). */
export function papaRows(text: string, delimiter: string, onRow: RowHandler): void {
  let err: unknown = null;
  let failed = false;
  Papa.parse<string[]>(text, {
    delimiter,
    skipEmptyLines: false,
    step: (res, parser) => {
      try {
        onRow(res.data, res.meta.cursor, res.errors.length > 0 ? res.errors[0]!.message : undefined);
      } catch (e) {
        err = e;
        failed = true;
        parser.abort();
      }
    },
  });
  if (failed) throw err;
}
