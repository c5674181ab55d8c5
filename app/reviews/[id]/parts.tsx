import Link from "next/link";
import type { StoredReview } from "@/lib/db/reviews";
import type { TraceSeries } from "@/lib/trace/series";
import { bridgeGaps, findGaps } from "@/lib/trace/series";
import { readableDuration } from "@/lib/thermal/screening";
import { TemperatureChart } from "@/app/components/TemperatureChart";
import { StatusBadge } from "@/app/components/StatusBadge";
import { Caution } from "@/app/components/Caution";
import { ResistanceTable } from "@/app/products/ProductEditor";

const fmtTime = (iso: string) => iso.slice(0, 16).replace("T", " ");
const OUTCOME_WORDS: Record<string, string> = { accept: "accept", hold: "hold for review", reject: "reject" };

/** Outcome, caution, inputs with their hashes, and the sign-off. Shared by the review page and its printed report. */
export function ReviewHeader({ review }: { review: StoredReview }) {
  const r = review.result;
  return (
    <section className="card">
      <div className="outcome" data-testid="outcome">
        Suggested outcome <strong className={`status-${r.outcome}`} data-testid="outcome-value">{OUTCOME_WORDS[r.outcome]}</strong>
        {review.status === "signed" && (
          <span data-testid="decision">
            · decision <strong className={`status-${review.decision}`}>{OUTCOME_WORDS[review.decision ?? ""]}</strong> by {review.signedBy}, {review.signedAt?.toISOString().slice(0, 16).replace("T", " ")} UTC
          </span>
        )}
      </div>
      {review.status === "signed" && review.signComment && <p data-testid="sign-comment">Reviewer&apos;s comment: {review.signComment}</p>}
      <Caution />
      <dl className="facts">
        <dt>Trace</dt>
        <dd>
          <Link href={`/traces/${review.trace.id}`}>{review.trace.name}</Link> ({review.trace.fileName}, {review.trace.sampleCount} samples, {fmtTime(review.trace.startAt.toISOString())} – {fmtTime(review.trace.endAt.toISOString())} UTC)
        </dd>
        <dt>Trace SHA-256</dt><dd><code className="hash">{review.trace.sha256}</code></dd>
        <dt>Product</dt><dd>{review.product.name} v{review.product.version} <code className="hash">{review.product.sha256.slice(0, 16)}…</code></dd>
        <dt>Pack</dt><dd>{review.pack ? <>{review.pack.name} v{review.pack.version} <code className="hash">{review.pack.sha256.slice(0, 16)}…</code></> : "none (the product's own surface coefficient)"}</dd>
        <dt>Limit set</dt><dd>{review.limits.name} v{review.limits.version} <code className="hash">{review.limits.sha256.slice(0, 16)}…</code></dd>
        <dt>Judged window</dt><dd>{fmtTime(r.window.start)} – {fmtTime(r.window.end)} UTC</dd>
        <dt>Engine</dt><dd>{review.engineVersion}; result SHA-256 <code className="hash">{review.resultSha256}</code></dd>
        <dt>Run</dt><dd>{review.createdAt.toISOString()}</dd>
        <dt>Status</dt><dd data-testid="review-status">{review.status === "signed" ? "signed off (final)" : "open: not yet signed off"}</dd>
        {review.corrects && <><dt>Corrects</dt><dd><Link href={`/reviews/${review.corrects.id}`}>{review.corrects.title}</Link></dd></>}
        {review.correctedBy.length > 0 && (
          <>
            <dt>Corrected by</dt>
            <dd data-testid="corrected-by">{review.correctedBy.map((c) => <Link key={c.id} href={`/reviews/${c.id}`}>{c.title} </Link>)}</dd>
          </>
        )}
      </dl>
    </section>
  );
}

export function ReviewChart({ review, series }: { review: StoredReview; series: TraceSeries }) {
  const s = review.result.screening;
  const thresholds = [...new Map(review.result.rules.map((x) => [x.threshold_C, { label: `${x.threshold_C} °C`, value_C: x.threshold_C }])).values()];
  return (
    <section className="card chart-card">
      <TemperatureChart
        title="Air and predicted product temperatures with the rule thresholds"
        times_ms={Array.from(series.t_s, (t) => t * 1000)}
        lines={[
          { label: "Air (logger)", color: "var(--air)", values: Array.from(bridgeGaps(series)) },
          { label: "Core (predicted)", color: "var(--core)", values: Array.from(review.core_C) },
          ...(s.model === "conduction" && review.surface_C && review.mean_C
            ? [
                { label: "Surface (predicted)", color: "#6c8ebf", values: Array.from(review.surface_C), dashed: true },
                { label: "Mean (predicted)", color: "#2b8a7e", values: Array.from(review.mean_C), dashed: true },
              ]
            : []),
          ...(review.coolant_C ? [{ label: "Coolant / inner air", color: "#7a4fa3", values: Array.from(review.coolant_C), dashed: true }] : []),
          ...(series.probe_C ? [{ label: "Product probe (measured)", color: "#b8860b", values: Array.from(series.probe_C) }] : []),
          ...(review.result.uncertainty
            ? [
                { label: "Core 95th percentile", color: "#9b1f2e", values: review.result.uncertainty.p95, dashed: true },
                { label: "Core 5th percentile", color: "#2b8a7e", values: review.result.uncertainty.p05, dashed: true },
              ]
            : []),
        ]}
        thresholds={thresholds}
        gaps={findGaps(series, (review.trace.importSettings as { gapMultiple?: number } | null)?.gapMultiple).map((g) => [g.start_s * 1000, g.end_s * 1000])}
      />
    </section>
  );
}

export function ScreeningCard({ review }: { review: StoredReview }) {
  const s = review.result.screening;
  const solver = review.result.solver;
  return (
    <section className="card">
      <h2 style={{ marginTop: 0 }}>Screening</h2>
      <dl className="facts" data-testid="screening">
        <dt>Time constant tau = R·C</dt><dd data-testid="tau">{s.tau_readable} ({Math.round(s.tau_s)} s)</dd>
        <dt>R (air to product)</dt><dd>{s.r_total_K_W.toPrecision(4)} K/W</dd>
        <dt>C = m·cp</dt><dd>{s.c_total_J_K.toPrecision(4)} J/K</dd>
        <dt>Lc = V/A</dt><dd>{s.lc_m === null ? "not known" : `${(s.lc_m * 1000).toPrecision(3)} mm`}</dd>
        <dt>Biot number</dt><dd data-testid="biot">{s.biot === null ? "not checked" : s.biot.toPrecision(2)}</dd>
        <dt>Model</dt><dd data-testid="model">{s.model === "lumped" ? "lumped capacitance" : `1-D conduction (${solver.shells} shells)`}</dd>
        <dt>Solver</dt>
        <dd>
          {solver.method}
          {solver.step_s !== null ? `, step ${solver.step_s} s (halving it changes results by ${solver.halving_change_K!.toFixed(4)} K)` : ", closed form for air linear between samples"}
        </dd>
        <dt>Material</dt><dd>{s.material}</dd>
      </dl>
      <p>{s.reason}.</p>
      {s.geometry_note && <p className="muted">{s.geometry_note[0]!.toUpperCase() + s.geometry_note.slice(1)}.</p>}
      <ResistanceTable items={s.resistances} />
      <p>{s.excursion_reading[0]!.toUpperCase() + s.excursion_reading.slice(1)}.</p>
      {review.result.uncertainty && (
        <p data-testid="uncertainty-summary">
          Monte Carlo ({review.result.uncertainty.samples} samples, seed {review.result.uncertainty.seed}): the 5–95 % core band is at most ±{review.result.uncertainty.half_width_K.toFixed(2)} K
          {review.result.uncertainty.used_in_guard_band ? ", used as the model uncertainty in the guard band" : ""}; rules fail in{" "}
          {Object.entries(review.result.uncertainty.fail_fraction).map(([id, f]) => `${id}: ${(f * 100).toFixed(1)} %`).join(", ")} of samples.
        </p>
      )}
    </section>
  );
}

export function HistoryCard({ review }: { review: StoredReview }) {
  const r = review.result;
  return (
    <section className="card">
      <h2 style={{ marginTop: 0 }}>Mean kinetic temperature</h2>
      <dl className="facts">
        <dt>Air</dt><dd data-testid="mkt-air">{r.mkt_C.air.toFixed(2)} °C</dd>
        <dt>Core (predicted)</dt><dd>{r.mkt_C.core.toFixed(2)} °C</dd>
      </dl>
      <p className="muted">Activation energy 83.144 kJ/mol (ΔH/R = 10,000 K), as in the USP storage chapter.</p>
      <h2>Time in each temperature band</h2>
      <table data-testid="bands">
        <thead><tr><th>Band</th><th className="num">Air (min)</th><th className="num">Core (min)</th></tr></thead>
        <tbody>
          {r.bands.labels.map((label, k) =>
            r.bands.air_min[k]! > 0 || r.bands.core_min[k]! > 0 ? (
              <tr key={label}><td>{label}</td><td className="num">{r.bands.air_min[k]!.toFixed(1)}</td><td className="num">{r.bands.core_min[k]!.toFixed(1)}</td></tr>
            ) : null,
          )}
        </tbody>
      </table>
      {r.gaps.length > 0 && (
        <>
          <h2>Data gaps</h2>
          <ul>{r.gaps.map((g) => <li key={g.start}>{fmtTime(g.start)} – {fmtTime(g.end)} UTC ({readableDuration(g.duration_s)}), bridged linearly; rules across it are at best inconclusive</li>)}</ul>
        </>
      )}
    </section>
  );
}

export function RulesCard({ review }: { review: StoredReview }) {
  const r = review.result;
  return (
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
      <p className="muted">Crossing times are interpolated linearly between samples. With a guard band, a rule passes only when it holds with the threshold moved against the shipment and fails only when it fails with the threshold moved in its favour (ISO 14253-1 decision rules).</p>
    </section>
  );
}
