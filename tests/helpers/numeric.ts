import { expect } from "vitest";

/** |actual − expected| ≤ abs + rel·|expected|, with a message that shows both numbers. */
export function expectClose(actual: number, expected: number, { abs = 0, rel = 0 }: { abs?: number; rel?: number }): void {
  const tol = abs + rel * Math.abs(expected);
  if (!(Math.abs(actual - expected) <= tol)) {
    expect.fail(`expected ${actual} to be within ${tol} of ${expected} (difference ${actual - expected})`);
  }
}

/** mulberry32: small seeded generator so "random" test inputs are the same on every run. */
export function seeded(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Irregular sample times from 0 to about `span_s`, gaps between min_s and max_s. */
export function irregularTimes(rand: () => number, span_s: number, min_s: number, max_s: number): Float64Array {
  const t = [0];
  while (t[t.length - 1]! < span_s) t.push(t[t.length - 1]! + min_s + rand() * (max_s - min_s));
  return Float64Array.from(t);
}
