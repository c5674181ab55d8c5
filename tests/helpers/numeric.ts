import { expect } from "vitest";
import { mulberry32 } from "@/lib/uncertainty/random";

/** Seeded uniform generator for repeatable test inputs (the project's own, lib/design/random.ts). */
export const seeded = mulberry32;

/** |actual − expected| ≤ abs + rel·|expected|, with a message that shows both numbers. */
export function expectClose(actual: number, expected: number, { abs = 0, rel = 0 }: { abs?: number; rel?: number }): void {
  const tol = abs + rel * Math.abs(expected);
  if (!(Math.abs(actual - expected) <= tol)) {
    expect.fail(`expected ${actual} to be within ${tol} of ${expected} (difference ${actual - expected})`);
  }
}


/** Irregular sample times from 0 to about `span_s`, gaps between min_s and max_s. */
export function irregularTimes(rand: () => number, span_s: number, min_s: number, max_s: number): Float64Array {
  const t = [0];
  while (t[t.length - 1]! < span_s) t.push(t[t.length - 1]! + min_s + rand() * (max_s - min_s));
  return Float64Array.from(t);
}
