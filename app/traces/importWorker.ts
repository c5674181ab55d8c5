// Runs the import in a worker so a large file does not freeze the page; posts progress, then the preview.
import { importTraceFile } from "@/lib/trace/importFile";
import { TraceImportError } from "@/lib/trace/errors";
import type { ImportOptions } from "@/lib/trace/settings";

self.onmessage = async (e: MessageEvent<{ bytes: ArrayBuffer; options: ImportOptions }>) => {
  try {
    const r = await importTraceFile(new Uint8Array(e.data.bytes), e.data.options, (fraction) => self.postMessage({ type: "progress", fraction }));
    // A thinned series is enough for the preview chart (at most about 2,000 points).
    const n = r.series.t_s.length;
    const step = Math.max(1, Math.floor(n / 2000));
    const pick = (a: Float64Array) => Array.from({ length: Math.ceil(n / step) }, (_, i) => a[i * step]!);
    self.postMessage({
      type: "done",
      result: {
        samples: n,
        start_s: r.series.t_s[0],
        end_s: r.series.t_s[n - 1],
        settings: r.settings,
        channels: r.channels,
        warnings: r.warnings,
        gaps: r.gaps.length,
        preview: r.preview,
        first: Array.from({ length: Math.min(10, n) }, (_, i) => ({ t_s: r.series.t_s[i]!, air_C: r.series.air_C[i]!, probe_C: r.series.probe_C?.[i] ?? null })),
        chart: { t_s: pick(r.series.t_s), air_C: pick(r.series.air_C), probe_C: r.series.probe_C ? pick(r.series.probe_C) : null },
      },
    });
  } catch (err) {
    self.postMessage({ type: "error", message: err instanceof TraceImportError ? err.message : `the preview failed: ${(err as Error).message}` });
  }
};
