import Link from "next/link";
import { notFound } from "next/navigation";
import { getReview } from "@/lib/db/reviews";
import { getTrace } from "@/lib/db/traces";
import { bridgeGaps, findGaps } from "@/lib/trace/series";
import { readableDuration } from "@/lib/thermal/screening";
import { TemperatureChart } from "@/app/components/TemperatureChart";
import { StatusBadge } from "@/app/components/StatusBadge";
import { Caution } from "@/app/components/Caution";
import { ResistanceTable } from "@/app/products/ProductEditor";

export const dynamic = "force-dynamic";

const fmtTime = (iso: string) => iso.slice(0, 16).replace("T", " ");

export default async function ReviewPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const review = await getReview(id);
  if (!review) notFound();
  const trace = await getTrace(review.traceId);
  if (!trace) notFound();
  const r = review.result;
  const s = r.screening;
  const thresholds = [...new Map(r.rules.map((x) => [x.threshold_C, { label: `${x.threshold_C} °C`, value_C: x.threshold_C }])).values()];
  return (
    <>
      <h1>Review: {review.title}</h1>
      <section className="card">
        <div className="outcome" data-testid="outcome">
          Suggested outcome <strong className={`status-${r.outcome}`} data-testid="outcome-value">{r.outcome === "hold" ? "hold for review" : r.outcome}</strong>
        </div>
        <Caution />
        <dl className="facts">
          <dt>Trace</dt><dd><Link href={`/traces/${review.trace.id}`}>{review.trace.name}</Link> ({review.trace.sampleCount} samples, {fmtTime(review.trace.startAt.toISOString())} – {fmtTime(review.trace.endAt.toISOString())} UTC)</dd>
          <dt>Trace SHA-256</dt><dd><code className="hash">{review.trace.sha256}</code></dd>
          <dt>Product</dt><dd>{review.product.name} v{review.product.version}</dd>
          <dt>Pack</dt><dd>{review.pack ? `${review.pack.name} v${review.pack.version}` : "none (the product's own surface coefficient)"}</dd>
          <dt>Limit set</dt><dd>{review.limits.name} v{review.limits.version}</dd>
          <dt>Engine</dt><dd>{review.engineVersion}; result SHA-256 <code className="hash">{review.resultSha256}</code></dd>
          <dt>Run</dt><dd>{review.createdAt.toISOString()}</dd>
        </dl>
      </section>

      <section className="card">
        <TemperatureChart
          title="Air and predicted core temperature with limits"
          times_ms={Array.from(trace.series.t_s, (t) => t * 1000)}
          lines={[
            { label: "Air (logger)", color: "var(--air)", values: Array.from(bridgeGaps(trace.series)) },
            { label: "Core (predicted)", color: "var(--core)", values: Array.from(review.core_C) },
            ...(s.model === "conduction" && review.surface_C && review.mean_C
              ? [
                  { label: "Surface (predicted)", color: "#6c8ebf", values: Array.from(review.surface_C), dashed: true },
                  { label: "Mean (predicted)", color: "#2b8a7e", values: Array.from(review.mean_C), dashed: true },
                ]
              : []),
            ...(review.coolant_C ? [{ label: "Coolant / inner air", color: "#7a4fa3", values: Array.from(review.coolant_C), dashed: true }] : []),
          ]}
          thresholds={thresholds}
          gaps={findGaps(trace.series).map((g) => [g.start_s * 1000, g.end_s * 1000])}
        />
      </section>

      <div className="grid2">
        <section className="card">
          <h2 style={{ marginTop: 0 }}>Screening</h2>
          <dl className="facts" data-testid="screening">
            <dt>Time constant tau = R·C</dt><dd data-testid="tau">{s.tau_readable} ({Math.round(s.tau_s)} s)</dd>
            <dt>R (air to product)</dt><dd>{s.r_total_K_W.toPrecision(4)} K/W</dd>
            <dt>C = m·cp</dt><dd>{s.c_total_J_K.toPrecision(4)} J/K</dd>
            <dt>Lc = V/A</dt><dd>{s.lc_m === null ? "not known" : `${(s.lc_m * 1000).toPrecision(3)} mm`}</dd>
            <dt>Biot number</dt><dd data-testid="biot">{s.biot === null ? "not checked" : s.biot.toPrecision(2)}</dd>
            <dt>Model</dt><dd data-testid="model">{s.model === "lumped" ? "lumped capacitance" : `1-D conduction (${review.result.solver.shells} shells)`}</dd>
            <dt>Solver</dt>
            <dd>
              {review.result.solver.method}
              {review.result.solver.step_s !== null ? `, step ${review.result.solver.step_s} s (halving it changes results by ${review.result.solver.halving_change_K!.toFixed(4)} K)` : ", closed form for air linear between samples"}
            </dd>
            <dt>Material</dt><dd>{s.material}</dd>
          </dl>
          <p>{s.reason}.</p>
          {s.geometry_note && <p className="muted">{s.geometry_note[0]!.toUpperCase() + s.geometry_note.slice(1)}.</p>}
          <ResistanceTable items={s.resistances} />
          <p>{s.excursion_reading[0]!.toUpperCase() + s.excursion_reading.slice(1)}.</p>
        </section>
        <section className="card">
          <h2 style={{ marginTop: 0 }}>Mean kinetic temperature</h2>
          <dl className="facts">
            <dt>Air</dt><dd>{r.mkt_C.air.toFixed(2)} °C</dd>
            <dt>Core (predicted)</dt><dd>{r.mkt_C.core.toFixed(2)} °C</dd>
          </dl>
          <p className="muted">Activation energy 83.144 kJ/mol (ΔH/R = 10,000 K), as in the USP storage chapter.</p>
          {r.gaps.length > 0 && (
            <>
              <h2>Data gaps</h2>
              <ul>{r.gaps.map((g) => <li key={g.start}>{fmtTime(g.start)} – {fmtTime(g.end)} UTC ({readableDuration(g.duration_s)}), bridged linearly</li>)}</ul>
            </>
          )}
        </section>
      </div>

      <section className="card">
        <h2 style={{ marginTop: 0 }}>Rules</h2>
        <table data-testid="rules-table">
          <thead>
            <tr><th>Rule</th><th>Channel</th><th>Threshold</th><th className="num">Time beyond (min)</th><th className="num">Longest (min)</th><th className="num">Extreme °C</th><th>Status</th><th>Why</th></tr>
          </thead>
          <tbody>
            {r.rules.map((x) => (
              <tr key={x.id} data-testid={`rule-${x.id}`}>
                <td>{x.id}</td>
                <td>{x.channel}</td>
                <td>{x.direction} {x.threshold_C} °C</td>
                <td className="num" data-testid={`cumulative-${x.id}`}>{x.cumulative_min.toFixed(1)}</td>
                <td className="num">{x.longest_continuous_min.toFixed(1)}</td>
                <td className="num">{x.extreme_C.toFixed(2)}</td>
                <td><StatusBadge status={x.status} /></td>
                <td>{x.reason}</td>
              </tr>
            ))}
          </tbody>
        </table>
        <h2>Excursions</h2>
        <table>
          <thead><tr><th>Rule</th><th>Start (UTC)</th><th>End (UTC)</th><th className="num">Duration (min)</th><th className="num">Peak °C</th><th className="num">Degree-minutes</th></tr></thead>
          <tbody>
            {r.rules.every((x) => x.excursions.length === 0) && (
              <tr><td colSpan={6} className="muted">No excursions beyond any rule threshold.</td></tr>
            )}
            {r.rules.flatMap((x) =>
              x.excursions.map((e) => (
                <tr key={`${x.id}-${e.start}`}>
                  <td>{x.id}</td><td>{fmtTime(e.start)}</td><td>{fmtTime(e.end)}</td>
                  <td className="num">{e.duration_min.toFixed(1)}</td><td className="num">{e.peak_C.toFixed(2)}</td><td className="num">{e.degree_min.toFixed(1)}</td>
                </tr>
              )),
            )}
          </tbody>
        </table>
        <p className="muted">Crossing times are interpolated linearly between samples.</p>
      </section>
    </>
  );
}
