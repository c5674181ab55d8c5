"use client";

import { useActionState, useEffect, useState } from "react";
import Link from "next/link";
import { TemperatureChart } from "@/app/components/TemperatureChart";
import { ActionForm } from "@/app/components/ActionForm";
import { FormMessage } from "@/app/components/Field";
import { closeMonitorAction } from "@/app/actions/monitors";
import { formatTime } from "@/lib/display/time";
import { fixed } from "@/lib/display/numbers";
import type { LivePayload } from "@/lib/services/monitorPage";
import type { FormState } from "@/lib/validation";

const minutes = (m: number) => (m < 1 / 60 ? "under a second" : m < 1.5 ? `${Math.round(m * 60)} s` : m < 120 ? `${Math.round(m)} min` : `${(m / 60).toFixed(1)} h`);

/** The live page: the payload from the server, replaced by every "state" event of the monitor's stream. */
export function LiveView({ initial, zone, demoToken, origin }: { initial: LivePayload; zone: string; demoToken: string | null; origin: string | null }) {
  const [p, setP] = useState(initial);
  const [connected, setConnected] = useState<boolean | null>(null);
  const [closeState, closeAction] = useActionState<FormState, FormData>(closeMonitorAction, {});
  useEffect(() => {
    if (initial.status !== "open") return;
    const es = new EventSource(`/monitors/${initial.id}/events`);
    es.addEventListener("state", (e) => setP(JSON.parse((e as MessageEvent<string>).data) as LivePayload));
    es.onopen = () => setConnected(true);
    es.onerror = () => setConnected(false);
    return () => es.close();
  }, [initial.id, initial.status]);

  const s = p.state;
  const fc = s.forecast;
  const fcLabel = fc ? `Forecast, air held at ${fixed(fc.assumed_air_C, 2)} °C` : "Forecast";
  return (
    <>
      <h1>
        {p.name} <span className={`status ${p.status === "open" ? "status-pass" : ""}`} data-testid="monitor-status">{p.status === "open" ? "live" : "closed"}</span>
      </h1>
      <p className="muted">
        {p.productName}
        {p.packName ? ` in ${p.packName}` : ""} · {p.limitsName}
        {p.shipmentId ? ` · shipment ${p.shipmentId}` : ""}
        {p.serial ? ` · logger ${p.serial}` : ""} · alert lead {minutes(p.alertLeadMin)}
        {p.status === "open" && connected === false ? " · reconnecting to the live stream…" : ""}
      </p>
      {s.stale && p.status === "open" && (
        <p className="form-error" data-testid="stale-warning">
          No reading for {minutes(p.stale.silent_s / 60)} (usually one every {p.stale.interval_s ? minutes(p.stale.interval_s / 60) : "?"} of arrival time). The values below are as of the last reading: check the logger or gateway.
        </p>
      )}
      <aside className="caution" data-testid="caution">
        <p>The core temperature and the forecast are estimates from a model and the readings so far; the forecast assumes the air stays where it is held. Use them to act early (move the load to a cold room, check the unit), not as a verdict.</p>
        <p>Whether food may still be sold is decided under your local regulations and licensed food-safety practice.</p>
      </aside>
      <section className="card">
        {p.readingCount === 0 ? (
          <p className="muted" data-testid="no-readings">
            No readings yet. Send them to <code>POST /api/v1/monitors/{p.id}/readings</code> with the device token, or replay a file:
            <br />
            <code data-testid="simulate-command">npm run -s corelag -- simulate --monitor {p.id} --trace {demoToken ? "public/demo/route7-tote3.csv" : "FILE"} --speed 600 --token {demoToken ?? "TOKEN"}{origin ? ` --url ${origin}` : ""}</code>
          </p>
        ) : (
          <>
            <dl className="facts" data-testid="live-facts">
              <dt>Readings</dt><dd data-testid="reading-count">{p.readingCount}</dd>
              <dt>Last reading</dt><dd>{s.last_reading ? `${formatTime(new Date(s.last_reading.t), zone)}: air ${fixed(s.last_reading.air_C, 2)} °C` : ""}</dd>
              <dt>Core (predicted)</dt><dd data-testid="core-now">{s.core_C !== null ? `${fixed(s.core_C, 2)} °C` : ""}</dd>
              {s.surface_C !== undefined && (<><dt>Surface (predicted)</dt><dd>{fixed(s.surface_C, 2)} °C</dd></>)}
              <dt>Rules so far</dt>
              <dd data-testid="rules-verdict"><strong className={p.words.verdict.failed ? "status-fail" : ""}>{p.words.verdict.text}</strong></dd>
              <dt>Thresholds now</dt>
              <dd data-testid="threshold-now">
                {p.words.now.length === 0 ? (
                  <span className="muted">inside every core, surface and mean threshold at the last reading</span>
                ) : (
                  <ul style={{ margin: 0, paddingLeft: "1rem" }}>
                    {p.words.now.map((w) => <li key={w.rule} className={w.usedUp ? "status-fail" : ""} data-testid={`threshold-now-${w.rule}`}>{w.text}</li>)}
                  </ul>
                )}
              </dd>
              <dt>Forecast</dt>
              <dd data-testid="forecast">
                <strong className={p.words.soon ? "status-fail" : ""}>{p.words.forecast}</strong>
                {fc && <span className="muted"> · {fc.reason}; horizon {minutes(fc.horizon_min)}</span>}
              </dd>
              {p.model && (<><dt>Model</dt><dd className="muted">{p.model.path === "exact" ? "exact lumped update" : `${p.model.path} network, internal step ${p.model.step_s?.toPrecision(2)} s`}; tau {minutes(p.model.tau_s / 60)}; {p.model.reason}</dd></>)}
            </dl>
            <TemperatureChart
              title="Air readings, predicted core and the forecast"
              zone={zone}
              times_ms={p.times_ms}
              thresholds={p.thresholds}
              lines={[
                { label: "Air (readings)", color: "var(--air)", values: p.air },
                { label: "Core (predicted)", color: "var(--core)", values: p.core },
                // in the legend only when a forecast line is drawn
                ...(p.forecastLine.some(Number.isFinite) ? [{ label: fcLabel, color: "var(--core)", values: p.forecastLine, dashed: true }] : []),
              ]}
            />
          </>
        )}
      </section>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Rules so far</h2>
        <table data-testid="rules-running">
          <thead><tr><th>Rule</th><th>Channel</th><th>Status so far</th><th className="num">Minutes beyond</th><th className="num">Allowance left</th><th>Why</th></tr></thead>
          <tbody>
            {p.rules.length === 0 && (
              <tr><td colSpan={6} className="muted">Judged from the first reading on: the limit set&apos;s threshold rules on the core, surface, mean and air.</td></tr>
            )}
            {p.rules.map((r) => (
              <tr key={r.id}>
                <td>{r.id}</td>
                <td>{r.channel}</td>
                <td><span className={`status status-${r.status_so_far}`}>{r.status_so_far}</span></td>
                <td className="num">{fixed(r.cumulative_min, 1)} min</td>
                <td className="num">{r.remaining_min !== undefined ? `${fixed(r.remaining_min, 1)} min` : ""}</td>
                <td className="muted">{r.reason}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Alerts</h2>
        {p.alerts.length === 0 ? (
          <p className="muted">No alerts so far.</p>
        ) : (
          <table data-testid="alert-history">
            <thead><tr><th>Alert</th><th>Raised</th><th>Cleared</th><th>Deliveries</th></tr></thead>
            <tbody>
              {p.alerts.map((a) => (
                <tr key={a.id} data-testid={`alert-${a.kind}`}>
                  <td><span className={`status ${a.clearedAt ? "" : "status-fail"}`}>{a.kind}</span> {a.message}</td>
                  <td>{formatTime(new Date(a.raisedAt), zone)}</td>
                  <td>{a.clearedAt ? (a.clearedByClose ? <>closed with the monitor, {formatTime(new Date(a.clearedAt), zone)}{a.kind === "rule-fail" ? <span className="status-fail"> (the rule still failed)</span> : null}</> : formatTime(new Date(a.clearedAt), zone)) : "open"}</td>
                  <td>
                    {a.deliveries.length === 0 ? <span className="muted">in the app only</span> : (
                      <ul style={{ margin: 0, paddingLeft: "1rem" }}>
                        {a.deliveries.map((d) => (
                          <li key={d.id} data-testid="delivery">
                            {d.event}, {d.channel} to {d.target}, attempt {d.attempt}: {d.ok ? "delivered" : `failed (${d.error ?? d.httpStatus})`}
                            {d.nextAt ? `; next attempt ${formatTime(new Date(d.nextAt), zone, { seconds: true })}` : ""}
                          </li>
                        ))}
                      </ul>
                    )}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Receiving alerts</h2>
        <dl className="facts">
          <dt>Webhooks</dt><dd>{p.webhooks.length ? p.webhooks.join(", ") : "none"}</dd>
          <dt>E-mails</dt><dd>{p.emails.length ? p.emails.join(", ") : "none"}</dd>
          <dt>Webhook secret</dt><dd><details><summary>show</summary><code className="hash">{p.webhookSecret}</code></details><span className="muted">Each body is signed: header X-Corelag-Signature = &quot;sha256=&quot; + hex HMAC-SHA256 of the body with this secret.</span></dd>
        </dl>
      </section>
      {p.status === "open" ? (
        <section className="card">
          <h2 style={{ marginTop: 0 }}>Close the monitor</h2>
          <p className="muted">The readings become a stored trace and a normal review with this monitor&apos;s product, pack and limits, ready for sign-off.</p>
          <ActionForm action={closeAction}>
            <input type="hidden" name="monitorId" value={p.id} />
            <FormMessage state={closeState} />
            <button type="submit" className="secondary" data-testid="close-monitor">Close and review</button>
          </ActionForm>
        </section>
      ) : (
        <p>Closed. {p.reviewId && <Link href={`/reviews/${p.reviewId}`}>Open its review</Link>}{p.traceId && <> · <Link href={`/traces/${p.traceId}`}>its trace</Link></>}</p>
      )}
    </>
  );
}
