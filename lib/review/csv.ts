/**
 * One CSV row (RFC 4180 quoting). Text cells that a spreadsheet would read as a formula (starting with
 * =, +, -, @, tab or carriage return) are prefixed with a single quote, the usual defence against
 * formula injection; numbers are written as numbers.
 */
export function csvRow(cells: ReadonlyArray<string | number>): string {
  return cells
    .map((c) => {
      if (typeof c === "number") return String(c);
      let s = c;
      // a cell that is exactly a signed number (e.g. "-3.5000") is data, not a formula
      if (/^[=+\-@\t\r]/.test(s) && !/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(s)) s = `'${s}`;
      return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
    })
    .join(",");
}
