// The predicted series as CSV, written in chunks straight to a file descriptor: no whole-file string, and
// no Date object per row (a 200,000-row file is written in tens of milliseconds).
import { closeSync, openSync, writeSync } from "node:fs";

const PAD2 = Array.from({ length: 100 }, (_, i) => String(i).padStart(2, "0"));
const PAD3 = Array.from({ length: 1000 }, (_, i) => String(i).padStart(3, "0"));

/** ISO 8601 UTC with milliseconds, identical to Date#toISOString for years 1000–9999. */
export function isoUtc(t_s: number, day: { start_ms: number; text: string }): string {
  const ms = Math.round(t_s * 1000);
  let into = ms - day.start_ms;
  if (!(into >= 0 && into < 86_400_000)) {
    day.start_ms = Math.floor(ms / 86_400_000) * 86_400_000;
    day.text = new Date(day.start_ms).toISOString().slice(0, 11);
    into = ms - day.start_ms;
  }
  const h = Math.floor(into / 3_600_000), m = Math.floor((into % 3_600_000) / 60_000), s = Math.floor((into % 60_000) / 1000);
  return `${day.text}${PAD2[h]}:${PAD2[m]}:${PAD2[s]}.${PAD3[into % 1000]}Z`;
}

export interface SeriesColumns {
  t_s: Float64Array;
  air: Float64Array;
  core: Float64Array;
  surface: Float64Array;
  mean: Float64Array;
  coolant?: Float64Array | null;
}

/** Writes the CSV (CRLF, 4 decimals) to `target`, a path or 1 for standard output. */
export function writeSeriesCsv(target: string | 1, c: SeriesColumns): void {
  const fd = target === 1 ? 1 : openSync(target, "w");
  try {
    const day = { start_ms: NaN, text: "" };
    let chunk = `time_utc,air_C,core_C,surface_C,mean_C${c.coolant ? ",coolant_C" : ""}\r\n`;
    for (let i = 0; i < c.t_s.length; i++) {
      chunk += `${isoUtc(c.t_s[i]!, day)},${c.air[i]!.toFixed(4)},${c.core[i]!.toFixed(4)},${c.surface[i]!.toFixed(4)},${c.mean[i]!.toFixed(4)}${c.coolant ? `,${c.coolant[i]!.toFixed(4)}` : ""}\r\n`;
      if (chunk.length > 1 << 16) {
        writeAll(fd, chunk);
        chunk = "";
      }
    }
    writeAll(fd, chunk);
  } finally {
    if (fd !== 1) closeSync(fd);
  }
}

function writeAll(fd: number, text: string): void {
  const buf = Buffer.from(text, "utf8");
  let off = 0;
  while (off < buf.length) {
    try {
      off += writeSync(fd, buf, off);
    } catch (e) {
      // Standard output can be a non-blocking pipe whose reader is slower than us: wait 5 ms, then go on.
      if ((e as NodeJS.ErrnoException).code !== "EAGAIN") throw e;
      Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 5);
    }
  }
}
