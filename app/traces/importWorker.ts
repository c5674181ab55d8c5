// Runs the import in a worker so a large file does not freeze the page; posts progress, then the preview.
import { importTraceFile } from "@/lib/trace/importFile";
import { TraceImportError } from "@/lib/trace/errors";
import type { ImportOptions } from "@/lib/trace/settings";
import { displaySeries } from "@/lib/display/series";

self.onmessage = async (e: MessageEvent<{ bytes: ArrayBuffer; options: ImportOptions }>) => {
  try {
    const r = await importTraceFile(new Uint8Array(e.data.bytes), e.data.options, (fraction) => self.postMessage({ type: "progress", fraction }));
    // The preview chart draws the extremes of every pixel column (lib/display), so no spike vanishes.
    const n = r.series.t_s.length;
    const chart = displaySeries({ t_s: r.series.t_s, channels: { air: r.series.air_C, probe: r.series.probe_C } });
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
        chart: { t_s: chart.times_ms.map((t) => t / 1000), air_C: chart.channels.air!, probe_C: chart.channels.probe ?? null },
      },
    });
  } catch (err) {
    self.postMessage({ type: "error", message: err instanceof TraceImportError ? err.message : `the preview failed: ${(err as Error).message}` });
  }
};
