"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import type { PreviewRow, StoreBatchResult } from "@/lib/services/batch";

interface Entry {
  id: string;
  label: string;
}

/** The settings a user may fix, for one file or for all (the importer detects the rest). */
const FIXABLE = [
  { key: "timeZone", label: "Time zone (IANA)", placeholder: "Europe/Lisbon" },
  { key: "unit", label: "Unit (C, F, K)", placeholder: "C" },
  { key: "decimal", label: "Decimal (. or ,)", placeholder: "." },
  { key: "delimiter", label: "Delimiter (, ; | or tab)", placeholder: "," },
  { key: "dateOrder", label: "Date order (dmy, mdy, ymd)", placeholder: "dmy" },
  { key: "airColumn", label: "Air column", placeholder: "Air (°C)" },
] as const;
type Settings = Partial<Record<(typeof FIXABLE)[number]["key"], string>>;

const clean = (s: Settings): Record<string, string> => {
  const out: Record<string, string> = {};
  for (const [k, v] of Object.entries(s)) if (v && v.trim()) out[k] = k === "delimiter" && v.trim() === "tab" ? "\t" : v.trim();
  return out;
};

/**
 * Batch upload: drop many files (or one .zip, or choose a folder); every file is imported on the server
 * without storing anything and shown in one table with its settings, channels, samples, span, warnings or
 * refusal; the user fixes settings for one file or all, checks the proposed logger entry of each file and
 * the accuracy of any new logger serial, then confirms. Refused files store nothing.
 */
export function BatchUpload({ shipmentId, entries }: { shipmentId: string; entries: Entry[] }) {
  const router = useRouter();
  const [files, setFiles] = useState<File[]>([]);
  const [all, setAll] = useState<Settings>({});
  const [perFile, setPerFile] = useState<Record<string, Settings>>({});
  const [rows, setRows] = useState<PreviewRow[] | null>(null);
  const [matches, setMatches] = useState<Record<string, string>>({});
  const [accuracy, setAccuracy] = useState<Record<string, string>>({});
  const [fixing, setFixing] = useState<string | null>(null);
  const [draft, setDraft] = useState<Settings>({});
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [result, setResult] = useState<StoreBatchResult | null>(null);

  const options = (a: Settings = all, p: Record<string, Settings> = perFile) => ({ all: clean(a), perFile: Object.fromEntries(Object.entries(p).map(([f, s]) => [f, clean(s)])) });

  async function send(mode: "preview" | "store", request: unknown, list: File[] = files) {
    const body = new FormData();
    for (const f of list) body.append("files", f, f.name);
    body.append("request", JSON.stringify(request));
    const res = await fetch(`/api/shipments/${shipmentId}/batch?mode=${mode}`, { method: "POST", body });
    const json = await res.json();
    if (!res.ok) throw new Error(json.error ?? `HTTP ${res.status}`);
    return json;
  }

  async function preview(list: File[] = files, a: Settings = all, p: Record<string, Settings> = perFile) {
    setBusy(true);
    setError(null);
    setResult(null);
    try {
      const r = (await send("preview", { options: options(a, p) }, list)) as { rows: PreviewRow[] };
      setRows(r.rows);
      setMatches(Object.fromEntries(r.rows.map((row) => [row.file, matches[row.file] ?? row.match.target ?? ""])));
    } catch (e) {
      setError((e as Error).message);
      setRows(null);
    } finally {
      setBusy(false);
    }
  }

  function choose(list: FileList | null) {
    if (!list || list.length === 0) return;
    const next = Array.from(list);
    setFiles(next);
    setPerFile({});
    setMatches({});
    void preview(next, all, {});
  }

  async function confirm() {
    if (!rows) return;
    setBusy(true);
    setError(null);
    try {
      const serials = [...new Set(rows.filter((r) => r.unregistered && matches[r.file]).map((r) => r.serial!))];
      const register = serials.map((serial) => ({ serial, accuracyK: Number(accuracy[serial]), description: "" }));
      const missing = register.find((r) => !(r.accuracyK > 0));
      if (missing) throw new Error(`give the stated accuracy (K) of logger ${missing.serial}: it is not in the logger register yet`);
      const r = (await send("store", { options: options(), matches: rows.map((row) => ({ file: row.file, shipmentLoggerId: matches[row.file] || null })), register })) as StoreBatchResult;
      setResult(r);
      setRows(null);
      setFiles([]);
      router.refresh();
    } catch (e) {
      setError((e as Error).message);
    } finally {
      setBusy(false);
    }
  }

  const unregistered = rows ? [...new Set(rows.filter((r) => r.unregistered && matches[r.file]).map((r) => r.serial!))] : [];
  const taken = Object.values(matches).filter(Boolean);
  const duplicate = taken.find((t, i) => taken.indexOf(t) !== i);

  return (
    <div data-testid="batch-upload">
      <div
        className="dropzone"
        data-testid="dropzone"
        onDragOver={(e) => e.preventDefault()}
        onDrop={(e) => {
          e.preventDefault();
          choose(e.dataTransfer.files);
        }}
        style={{ border: "2px dashed var(--line)", borderRadius: 6, padding: "1rem", textAlign: "center" }}
      >
        <p>Drop the logger files of this load here (many at once, or one .zip), or</p>
        <input type="file" multiple accept=".csv,.txt,.tsv,.xlsx,.zip" data-testid="batch-files" onChange={(e) => choose(e.target.files)} />{" "}
        <label style={{ display: "inline" }}>
          choose a folder <input type="file" data-testid="batch-folder" {...({ webkitdirectory: "" } as Record<string, string>)} onChange={(e) => choose(e.target.files)} />
        </label>
      </div>
      {busy && <p role="status">Reading {files.length} file(s)…</p>}
      {error && <p className="form-error" data-testid="batch-error">{error}</p>}
      {rows && (
        <>
          <details>
            <summary>Settings for every file</summary>
            <div className="grid2">
              {FIXABLE.map((f) => (
                <label key={f.key}>{f.label}<input value={all[f.key] ?? ""} placeholder={f.placeholder} onChange={(e) => setAll({ ...all, [f.key]: e.target.value })} /></label>
              ))}
            </div>
            <button type="button" className="secondary" onClick={() => preview()}>Apply to all files and read again</button>
          </details>
          <table data-testid="batch-preview">
            <thead>
              <tr><th>File</th><th>Read as</th><th>Channels</th><th className="num">Samples</th><th>Start – end (UTC)</th><th>Warnings / refusal</th><th>Serial</th><th>Logger entry</th><th /></tr>
            </thead>
            <tbody>
              {rows.map((r) => (
                <tr key={r.file} data-testid="batch-row" data-file={r.file} data-ok={r.ok ? "yes" : "no"}>
                  <td>{r.file}</td>
                  <td>{r.settings ? `delimiter ${r.settings.delimiter === "\t" ? "tab" : `“${r.settings.delimiter}”`} · decimal “${r.settings.decimal}” · dates ${r.settings.dateOrder} · zone ${r.settings.timeZone} · unit °${r.settings.airUnit}` : "–"}</td>
                  <td>{r.channels ? r.channels.map((c) => `${c.name}: ${c.role}`).join(", ") : "–"}</td>
                  <td className="num">{r.samples ?? "–"}</td>
                  <td>{r.start ? `${r.start.slice(0, 16).replace("T", " ")} – ${r.end!.slice(0, 16).replace("T", " ")}` : "–"}</td>
                  <td>
                    {r.refusal ? (
                      <span className="field-error" data-testid="refusal">
                        refused{r.refusal.row ? `, row ${r.refusal.row}` : ""}{r.refusal.column ? `, column ${r.refusal.column}` : ""}: {r.refusal.message}
                      </span>
                    ) : r.warnings && r.warnings.length > 0 ? (
                      <span className="muted">{r.warnings.join("; ")}</span>
                    ) : "none"}
                  </td>
                  <td>{r.serial ?? "–"}{r.unregistered ? " (new)" : ""}</td>
                  <td>
                    <select aria-label={`Logger entry for ${r.file}`} data-testid="match-select" value={matches[r.file] ?? ""} onChange={(e) => setMatches({ ...matches, [r.file]: e.target.value })} disabled={!r.ok}>
                      <option value="">not stored</option>
                      {entries.map((en) => <option key={en.id} value={en.id}>{en.label}</option>)}
                    </select>
                    {r.match.by && <span className="hint"> proposed by {r.match.by === "serial" ? "serial" : "file name"}</span>}
                  </td>
                  <td><button type="button" className="secondary" onClick={() => { setFixing(r.file); setDraft(perFile[r.file] ?? {}); }}>Fix settings</button></td>
                </tr>
              ))}
            </tbody>
          </table>
          {fixing && (
            <section className="card" data-testid="fix-settings">
              <h3 style={{ marginTop: 0 }}>Settings for {fixing}</h3>
              <div className="grid2">
                {FIXABLE.map((f) => (
                  <label key={f.key}>{f.label}<input value={draft[f.key] ?? ""} placeholder={f.placeholder} onChange={(e) => setDraft({ ...draft, [f.key]: e.target.value })} /></label>
                ))}
              </div>
              <button type="button" onClick={() => { const p = { ...perFile, [fixing]: draft }; setPerFile(p); setFixing(null); void preview(files, all, p); }}>Apply to this file</button>{" "}
              <button type="button" className="secondary" onClick={() => { const a = { ...all, ...draft }; setAll(a); setFixing(null); void preview(files, a, perFile); }}>Apply to all files</button>{" "}
              <button type="button" className="secondary" onClick={() => setFixing(null)}>Close</button>
            </section>
          )}
          {unregistered.length > 0 && (
            <section className="card" data-testid="new-serials">
              <h3 style={{ marginTop: 0 }}>New loggers</h3>
              <p className="muted">These serials are not in the logger register. Give each one&apos;s stated accuracy once; it becomes the rules&apos; sensor accuracy when a limit set states none. Calibration dates can be added on the Loggers page.</p>
              {unregistered.map((s) => (
                <label key={s}>Accuracy of {s}, K<input type="number" step="0.01" min="0.01" max="10" data-testid={`accuracy-${s}`} value={accuracy[s] ?? ""} onChange={(e) => setAccuracy({ ...accuracy, [s]: e.target.value })} /></label>
              ))}
            </section>
          )}
          {duplicate && <p className="form-error">Two files are matched to the same logger entry; match each entry once.</p>}
          <button type="button" onClick={confirm} disabled={busy || !!duplicate} data-testid="confirm-batch">Confirm matching and store</button>
        </>
      )}
      {result && (
        <section className="card" data-testid="batch-result">
          <p>Stored {result.stored.length} file(s){result.registered.length ? `; registered ${result.registered.join(", ")}` : ""}.</p>
          {result.refused.length > 0 && (
            <ul data-testid="batch-refused">
              {result.refused.map((r) => <li key={r.file} className="field-error">{r.file}: nothing stored: {r.message}</li>)}
            </ul>
          )}
          {result.skipped.length > 0 && <ul>{result.skipped.map((r) => <li key={r.file} className="muted">{r.file}: {r.reason}</li>)}</ul>}
        </section>
      )}
    </div>
  );
}
