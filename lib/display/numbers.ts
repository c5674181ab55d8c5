/**
 * Numbers as people read them. Temperatures to 0.01 °C (enough to see a value against a limit and
 * its guard band; loggers resolve 0.1 °C at best); other quantities to three significant figures,
 * which is finer than any input a user gives (a surface coefficient, a thickness) is known to.
 * JSON and CSV exports keep full precision: this is for display only.
 */

const MINUS = "-";

/** "7.65 °C" */
export function formatC(x: number, digits = 2): string {
  return Number.isFinite(x) ? `${fixed(x, digits)} °C` : "–";
}

/** x to `digits` decimals, never "-0.00". */
export function fixed(x: number, digits: number): string {
  if (!Number.isFinite(x)) return "–";
  const s = x.toFixed(digits);
  return /^-0(\.0*)?$/.test(s) ? s.slice(1) : s.replace(/^-/, MINUS);
}

/**
 * x to `sig` significant figures, in plain notation for everyday magnitudes ("2.90", "0.0337",
 * "3,600") and in scientific notation outside 1e-4…1e7.
 */
export function sig(x: number, significant = 3): string {
  if (!Number.isFinite(x)) return "–";
  if (x === 0) return "0";
  const a = Math.abs(x);
  if (a < 1e-4 || a >= 1e7) return x.toExponential(significant - 1).replace("e+", "e");
  const rounded = Number(x.toPrecision(significant));
  const decimals = Math.max(0, significant - 1 - Math.floor(Math.log10(Math.abs(rounded))));
  return rounded.toLocaleString("en", { minimumFractionDigits: decimals, maximumFractionDigits: decimals });
}

/** "2.90 W/m²·K" */
export function quantity(x: number, unit: string, significant = 3): string {
  return `${sig(x, significant)} ${unit}`;
}

/** Like sig, without trailing zeros: 0.5 → "0.5", 1.8345 → "1.8" (for values given as round numbers, e.g. a guard band). */
export function sigTrim(x: number, significant = 2): string {
  if (!Number.isFinite(x)) return "–";
  const a = Math.abs(x);
  if (a !== 0 && (a < 1e-4 || a >= 1e7)) return sig(x, significant);
  return String(Number(x.toPrecision(significant)));
}
