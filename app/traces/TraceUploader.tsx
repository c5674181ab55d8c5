"use client";

import { useEffect, useRef, useState } from "react";
import { useRouter } from "next/navigation";
import type { ImportOptions, ResolvedImportSettings } from "@/lib/trace/settings";
import type { ImportedChannel } from "@/lib/trace/importCsv";
import { TemperatureChart } from "@/app/components/TemperatureChart";
import { formatTime } from "@/lib/display/time";
import { MetadataList } from "@/app/components/MetadataList";
import { DuplicateWarning } from "./DuplicateWarning";

interface PreviewResult {
  samples: number;
  start_s: number;
  end_s: number;
  settings: ResolvedImportSettings;
  channels: ImportedChannel[];
  warnings: string[];
  gaps: number;
  preview: { header: string[]; rows: string[][]; metadata: Array<{ row: number; key: string; value: string }> };
  first: Array<{ t_s: number; air_C: number; probe_C: number | null }>;
  chart: { t_s: number[]; air_C: number[]; probe_C: number[] | null };
}

type Phase =
  | { kind: "idle" }
  | { kind: "reading"; fraction: number }
  | { kind: "parsing"; fraction: number }
  | { kind: "preview"; result: PreviewResult }
  | { kind: "refused"; message: string }
  | { kind: "uploading"; fraction: number; result: PreviewResult };

/** Preview times in the import zone the user chose (the zone the file's times are read in), else UTC. */
const at = (t_s: number, zone: string, seconds = false) => formatTime(t_s * 1000, zone, { seconds });
const pct = (f: number) => `${Math.round(f * 100)} %`;

/**
 * Choose a file → it is read and imported in the browser (in a worker, with progress) → the preview
 * shows the detected settings, the first rows as written and as read, the warnings and a chart; the
 * user may change settings (the import runs again) → "Upload and import" sends the bytes and the
 * chosen settings; the server repeats the import and stores it, or refuses it as a whole.
 */
export function TraceUploader() {
  const router = useRouter();
  const [file, setFile] = useState<File | null>(null);
  const [bytes, setBytes] = useState<ArrayBuffer | null>(null);
  const [name, setName] = useState("");
  const [options, setOptions] = useState<ImportOptions>({});
  const [phase, setPhase] = useState<Phase>({ kind: "idle" });
  const [serverError, setServerError] = useState<string | null>(null);
  const worker = useRef<Worker | null>(null);

  useEffect(() => () => worker.current?.terminate(), []);

  // Re-run the preview whenever the file or the settings change.
  useEffect(() => {
    if (!bytes) return;
    worker.current?.terminate();
    const w = new Worker(new URL("./importWorker.ts", import.meta.url));
    worker.current = w;
    setPhase({ kind: "parsing", fraction: 0 });
    w.onmessage = (e: MessageEvent) => {
      const m = e.data as { type: "progress"; fraction: number } | { type: "done"; result: PreviewResult } | { type: "error"; message: string };
      if (m.type === "progress") setPhase({ kind: "parsing", fraction: m.fraction });
      else if (m.type === "done") setPhase({ kind: "preview", result: m.result });
      else setPhase({ kind: "refused", message: m.message });
    };
    w.postMessage({ bytes: bytes.slice(0), options });
  }, [bytes, options]);

  const choose = (f: File | null) => {
    setFile(f);
    setBytes(null);
    setServerError(null);
    setOptions({});
    if (!f) return setPhase({ kind: "idle" });
    const reader = new FileReader();
    reader.onprogress = (e) => setPhase({ kind: "reading", fraction: e.lengthComputable ? e.loaded / e.total : 0 });
    reader.onload = () => setBytes(reader.result as ArrayBuffer);
    reader.onerror = () => setPhase({ kind: "refused", message: "the file could not be read" });
    reader.readAsArrayBuffer(f);
  };

  const upload = (result: PreviewResult) => {
    if (!file) return;
    const fd = new FormData();
    fd.append("file", file);
    fd.append("name", name);
    fd.append("options", JSON.stringify(options));
    const xhr = new XMLHttpRequest();
    xhr.open("POST", "/api/traces");
    xhr.upload.onprogress = (e) => setPhase({ kind: "uploading", fraction: e.lengthComputable ? e.loaded / e.total : 0, result });
    xhr.onload = () => {
      const body = JSON.parse(xhr.responseText || "{}") as { id?: string; error?: string };
      if (xhr.status === 201 && body.id) router.push(`/traces/${body.id}`);
      else {
        setServerError(body.error ?? `the upload failed (HTTP ${xhr.status})`);
        setPhase({ kind: "preview", result });
      }
    };
    xhr.onerror = () => {
      setServerError("the upload failed: the server could not be reached");
      setPhase({ kind: "preview", result });
    };
    setPhase({ kind: "uploading", fraction: 0, result });
    xhr.send(fd);
  };

  const set = (patch: Partial<ImportOptions>) => setOptions((o) => JSON.parse(JSON.stringify({ ...o, ...patch })) as ImportOptions);
  const result = phase.kind === "preview" || phase.kind === "uploading" ? phase.result : null;
  const s = result?.settings;
  const previewZone = options.timeZone ?? "UTC";

  return (
    <div className="stack" style={{ maxWidth: "none" }}>
      <label htmlFor="f-file">
        Logger file (CSV)
        <span className="hint">Delimited text (or an .xlsx workbook) with a time column and one or more temperature columns; metadata lines above the header or below the data (serial number, start time) are kept with the trace.</span>
        <input id="f-file" type="file" accept=".csv,.txt,.tsv,.xlsx,text/csv,text/plain,application/vnd.openxmlformats-officedocument.spreadsheetml.sheet" onChange={(e) => choose(e.target.files?.[0] ?? null)} />
      </label>
      <label htmlFor="f-name">
        Name <span className="hint">Defaults to the file name, e.g. &apos;Route 7, tote 3&apos;</span>
        <input id="f-name" value={name} onChange={(e) => setName(e.target.value)} />
      </label>

      {(phase.kind === "reading" || phase.kind === "parsing" || phase.kind === "uploading") && (
        <div data-testid="progress">
          <progress max={1} value={phase.fraction} style={{ width: "100%" }} />
          <span className="muted">{phase.kind === "reading" ? "Reading the file" : phase.kind === "parsing" ? "Checking every row" : "Uploading"}: {pct(phase.fraction)}</span>
        </div>
      )}

      {phase.kind === "refused" && (
        <p className="form-error" data-testid="form-error">{file?.name}: {phase.message}. Nothing can be stored; change the settings below or fix the file.</p>
      )}
      {serverError && <p className="form-error" data-testid="server-error">{serverError}</p>}

      {(result || phase.kind === "refused") && (
        <details open={phase.kind === "refused"}>
          <summary>Import settings {result ? "(detected; change any to re-read the file)" : ""}</summary>
          <div className="grid2 stack" style={{ marginTop: "0.6rem", maxWidth: "none" }}>
            <label>Time zone for times without an offset
              <input defaultValue={options.timeZone ?? s?.timeZone ?? "UTC"} onBlur={(e) => set({ timeZone: e.target.value.trim() || undefined })} data-testid="opt-tz" />
            </label>
            <label>Encoding
              <select value={options.encoding ?? ""} onChange={(e) => set({ encoding: (e.target.value || undefined) as ImportOptions["encoding"] })} data-testid="opt-encoding">
                <option value="">detect{s ? ` (${s.encoding})` : ""}</option><option value="utf-8">UTF-8</option><option value="utf-16le">UTF-16 LE</option><option value="utf-16be">UTF-16 BE</option><option value="windows-1252">Windows-1252</option>
              </select>
            </label>
            <label>Date order
              <select value={options.dateOrder ?? ""} onChange={(e) => set({ dateOrder: (e.target.value || undefined) as ImportOptions["dateOrder"] })} data-testid="opt-date-order">
                <option value="">detect{s ? ` (${s.dateOrder})` : ""}</option><option value="dmy">day first (dmy)</option><option value="mdy">month first (mdy)</option><option value="ymd">year first (ymd)</option>
              </select>
            </label>
            <label>Temperature unit
              <select value={options.unit ?? ""} onChange={(e) => set({ unit: (e.target.value || undefined) as ImportOptions["unit"] })}>
                <option value="">from the headers, else °C</option><option value="C">°C</option><option value="F">°F</option><option value="K">K</option>
              </select>
            </label>
            <label>Decimal separator
              <select value={options.decimal ?? ""} onChange={(e) => set({ decimal: (e.target.value || undefined) as ImportOptions["decimal"] })}>
                <option value="">detect{s ? ` (${s.decimal})` : ""}</option><option value=".">point</option><option value=",">comma</option>
              </select>
            </label>
            {result && (
              <>
                <label>Air channel
                  <select value={options.airColumn ?? s!.airColumn} onChange={(e) => set({ airColumn: e.target.value })} data-testid="opt-air">
                    {result.channels.map((c) => <option key={c.name} value={c.name}>{c.name}</option>)}
                  </select>
                </label>
                <label>Product-probe channel
                  <select value={options.productColumn ?? s!.productColumn ?? ""} onChange={(e) => set({ productColumn: e.target.value || undefined })} data-testid="opt-product">
                    <option value="">none</option>
                    {result.channels.filter((c) => c.name !== (options.airColumn ?? s!.airColumn)).map((c) => <option key={c.name} value={c.name}>{c.name}</option>)}
                  </select>
                </label>
              </>
            )}
            <label>Codes meaning “no reading” <span className="hint">comma-separated, e.g. -999</span>
              <input defaultValue={(options.missing ?? []).join(",")} onBlur={(e) => set({ missing: e.target.value.split(",").map((x) => x.trim()).filter(Boolean) })} data-testid="opt-missing" />
            </label>
            <label>A pause longer than N median intervals is a gap
              <input defaultValue={String(options.gapMultiple ?? s?.gapMultiple ?? 3)} inputMode="decimal" onBlur={(e) => set({ gapMultiple: Number(e.target.value) || undefined })} />
            </label>
            <label>Plausible range, °C <span className="hint">readings outside are flagged and left out</span>
              <span style={{ display: "flex", gap: "0.4rem" }}>
                <input aria-label="plausible minimum" size={6} defaultValue={String(s?.plausibleMin_C ?? -60)} onBlur={(e) => set({ plausibleMin_C: Number(e.target.value) })} />
                <input aria-label="plausible maximum" size={6} defaultValue={String(s?.plausibleMax_C ?? 80)} onBlur={(e) => set({ plausibleMax_C: Number(e.target.value) })} />
              </span>
            </label>
          </div>
        </details>
      )}

      {result && (
        <section data-testid="preview">
          <h3 style={{ margin: "0.4rem 0" }}>Preview</h3>
          <p data-testid="preview-summary">
            {result.samples.toLocaleString("en")} samples from {at(result.start_s, previewZone)} to {at(result.end_s, previewZone)}; {s!.source === "xlsx" ? `workbook sheet '${s!.sheet}'` : s!.encoding}, delimiter {JSON.stringify(s!.delimiter)}, header on row {s!.headerRow}, time
            {s!.dateColumn ? ` from '${s!.dateColumn}' + '${s!.timeColumn}'` : ` from '${s!.timeColumn}'`} ({s!.timeFormat}{s!.timeFormat === "datetime" ? `, ${s!.dateOrder}, ${s!.timeZone}` : ""}); air from &apos;{s!.airColumn}&apos; in {s!.airUnit === "K" ? "K" : `°${s!.airUnit}`}
            {s!.productColumn ? `; product probe from '${s!.productColumn}'` : ""}; decimal {JSON.stringify(s!.decimal)}.
          </p>
          {result.warnings.length > 0 && <ul className="warnings" data-testid="preview-warnings">{result.warnings.map((w) => <li key={w}>{w}</li>)}</ul>}
          {result.preview.metadata.length > 0 && (
            <>
              <h4>Metadata lines in the file <span className="hint">kept with the trace</span></h4>
              <MetadataList lines={result.preview.metadata} testId="preview-metadata" />
            </>
          )}
          <div className="grid2">
            <div>
              <h4>First rows as written</h4>
              <table>
                <thead><tr>{result.preview.header.map((h) => <th key={h}>{h}</th>)}</tr></thead>
                <tbody>{result.preview.rows.slice(0, 8).map((r, i) => <tr key={i}>{r.map((c, j) => <td key={j}>{c}</td>)}</tr>)}</tbody>
              </table>
            </div>
            <div>
              <h4>As read (°C; times in {previewZone})</h4>
              <table data-testid="preview-parsed">
                <thead><tr><th>time</th><th className="num">air</th>{s!.productColumn && <th className="num">probe</th>}</tr></thead>
                <tbody>
                  {result.first.slice(0, 8).map((r) => (
                    <tr key={r.t_s}><td>{at(r.t_s, previewZone, true)}</td><td className="num">{Number.isNaN(r.air_C) || r.air_C === null ? "gap" : r.air_C.toFixed(2)}</td>{s!.productColumn && <td className="num">{r.probe_C === null || Number.isNaN(r.probe_C) ? "gap" : r.probe_C.toFixed(2)}</td>}</tr>
                  ))}
                </tbody>
              </table>
            </div>
          </div>
          <TemperatureChart
            title="Preview of the trace"
            zone={previewZone}
            height={220}
            times_ms={result.chart.t_s.map((t) => t * 1000)}
            lines={[
              { label: "Air", color: "var(--air)", values: result.chart.air_C.map((x) => (x === null ? Number.NaN : x)) },
              ...(result.chart.probe_C ? [{ label: "Product probe", color: "#2b8a7e", values: result.chart.probe_C.map((x) => (x === null ? Number.NaN : x)) }] : []),
            ]}
          />
        </section>
      )}
      <DuplicateWarning bytes={bytes} />
      <button type="button" disabled={!result || phase.kind === "uploading"} onClick={() => result && upload(result)}>
        {phase.kind === "uploading" ? "Uploading…" : "Upload and import"}
      </button>
    </div>
  );
}
