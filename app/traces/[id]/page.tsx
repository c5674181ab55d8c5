import Link from "next/link";
import { notFound } from "next/navigation";
import { getTrace, tracesWithSha256 } from "@/lib/db/traces";
import { findGaps, medianInterval_s } from "@/lib/trace/series";
import { readableDuration } from "@/lib/thermal/screening";
import { TemperatureChart } from "@/app/components/TemperatureChart";
import { MetadataList } from "@/app/components/MetadataList";
import { displayZone } from "@/app/displayZone";
import { formatSpan, formatTime } from "@/lib/display/time";
import { displaySeries } from "@/lib/display/series";
import { serialFromMetadata } from "@/lib/shipment/matching";
import { loggersBySerial } from "@/lib/db/shipments";

export const dynamic = "force-dynamic";

export default async function TracePage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const trace = await getTrace(id);
  if (!trace) notFound();
  const { meta, series } = trace;
  const same = await tracesWithSha256(meta.sha256, meta.id);
  const gaps = findGaps(series, meta.importSettings.gapMultiple);
  const s = meta.importSettings;
  const zone = await displayZone(s.timeZone);
  const display = displaySeries({ t_s: series.t_s, channels: { air: series.air_C, probe: series.probe_C } });
  // a logger serial in the file's metadata that the register does not know: ask its accuracy once
  const serial = serialFromMetadata(s.metadata ?? []);
  const registered = serial ? (await loggersBySerial([serial])).length > 0 : true;
  return (
    <>
      <h1>Trace: {meta.name}</h1>
      <section className="card">
        <dl className="facts">
          <dt>File</dt><dd>{meta.fileName}</dd>
          <dt>SHA-256 of the original bytes</dt><dd><code className="hash" data-testid="trace-sha256">{meta.sha256}</code></dd>
          <dt>Original file</dt>
          <dd>
            <a href={`/traces/${meta.id}/original`} download data-testid="download-original">Download {meta.fileName}</a>{" "}
            <span className="muted">(the exact bytes as uploaded; their SHA-256 is the one above; each download is recorded in the <Link href={`/audit?object=${meta.id}`}>audit log</Link>)</span>
          </dd>
          {same.length > 0 && (
            <>
              <dt>Same file stored as</dt>
              <dd data-testid="same-file">{same.map((t, i) => <span key={t.id}>{i > 0 && ", "}<Link href={`/traces/${t.id}`}>{t.name}</Link> (uploaded {formatTime(t.createdAt, zone)})</span>)}</dd>
            </>
          )}
          <dt>Samples</dt><dd data-testid="trace-samples">{meta.sampleCount}</dd>
          <dt>From – to</dt><dd data-testid="trace-span">{formatSpan(meta.startAt, meta.endAt, zone)}</dd>
          <dt>Median interval</dt><dd>{readableDuration(medianInterval_s(series.t_s))}</dd>
          <dt>Import settings</dt>
          <dd data-testid="trace-settings">
            {s.encoding}; header on row {s.headerRow}; delimiter {JSON.stringify(s.delimiter)}; decimal {JSON.stringify(s.decimal)}; time {s.dateColumn ? `‘${s.dateColumn}’ + ` : ""}‘{s.timeColumn}’ ({s.timeFormat}
            {s.timeFormat === "datetime" ? `, ${s.dateOrder}, ${s.timeZone}` : s.startTime ? `, from ${s.startTime}` : ""}); air ‘{s.airColumn}’ in {s.airUnit === "K" ? "K" : `°${s.airUnit}`}
            {s.productColumn ? `; product probe ‘${s.productColumn}’` : ""}; gaps over {s.gapMultiple} median intervals; plausible {s.plausibleMin_C} to {s.plausibleMax_C} °C
            {s.missing.length ? `; “no reading” codes ${s.missing.join(", ")}` : ""}
          </dd>
          {s.metadata && s.metadata.length > 0 && (
            <>
              <dt>Metadata lines in the file</dt>
              <dd><MetadataList lines={s.metadata} testId="trace-metadata" /></dd>
            </>
          )}
          {serial && (
            <>
              <dt>Logger</dt>
              <dd data-testid="trace-logger">
                {serial}
                {registered ? <> (<Link href="/loggers">in the logger register</Link>)</> : <> · not in the logger register yet: <Link href={`/loggers?serial=${encodeURIComponent(serial)}`} data-testid="register-serial">register it with its stated accuracy</Link> (used as the sensor accuracy when a limit set states none)</>}
              </dd>
            </>
          )}
          <dt>Gaps</dt>
          <dd data-testid="trace-gaps">
            {gaps.length === 0 ? "none" : `${gaps.length} (bridged linearly by the models; rules judged across them are at best inconclusive)`}
            {gaps.length > 0 && (
              <ul style={{ margin: "0.3rem 0 0", paddingLeft: "1.1rem" }}>
                {gaps.slice(0, 20).map((g) => (
                  <li key={g.start_s}>{formatSpan(g.start_s * 1000, g.end_s * 1000, zone)} ({readableDuration(g.duration_s)})</li>
                ))}
                {gaps.length > 20 && <li>and {gaps.length - 20} more</li>}
              </ul>
            )}
          </dd>
        </dl>
        {meta.warnings.length > 0 && (
          <>
            <h2>Import warnings</h2>
            <ul className="warnings" data-testid="trace-warnings">{meta.warnings.map((w) => <li key={w}>{w}</li>)}</ul>
          </>
        )}
        <p className="no-print"><Link href={`/reviews/new?trace=${meta.id}`}>Review this trace →</Link></p>
      </section>
      <section className="card">
        <TemperatureChart
          title={`Air temperature, ${meta.name}`}
          zone={zone}
          times_ms={display.times_ms}
          lines={[
            { label: "Air", color: "var(--air)", values: display.channels.air! },
            ...(display.channels.probe ? [{ label: "Product probe", color: "#2b8a7e", values: display.channels.probe }] : []),
          ]}
          gaps={gaps.map((g) => [g.start_s * 1000, g.end_s * 1000])}
        />
      </section>
    </>
  );
}
