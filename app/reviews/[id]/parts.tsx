import Link from "next/link";
import type { StoredReview } from "@/lib/db/reviews";
import type { TraceSeries } from "@/lib/trace/series";
import { bridgeGaps, findGaps } from "@/lib/trace/series";
import { readableDuration } from "@/lib/thermal/screening";
import { TemperatureChart } from "@/app/components/TemperatureChart";
import { ConsequenceChart, type ConsequenceCurve } from "@/app/components/ConsequenceChart";
import { clip } from "@/lib/exposure/window";
import { cumulativeTimeAbove } from "@/lib/exposure/timeAbove";
import { StatusBadge } from "@/app/components/StatusBadge";
import { Caution } from "@/app/components/Caution";
import { ResistanceTable } from "@/app/products/ProductEditor";
import { formatSpan, formatTime } from "@/lib/display/time";
import { displaySeries } from "@/lib/display/series";
import { fixed, sig, sigTrim } from "@/lib/display/numbers";
import { ruleAllowance } from "@/lib/review/parameters";

const OUTCOME_WORDS: Record<string, string> = { accept: "accept", hold: "hold for review", reject: "reject" };

/** Outcome, caution, inputs with their hashes, and the sign-off. Shared by the review page and its printed report. */
export function ReviewHeader({ review, zone }: { review: StoredReview; zone: string }) {
  const r = review.result;
  return (
    <section className="card">
      <div className="outcome" data-testid="outcome">
        Suggested outcome <strong className={`status-${r.outcome}`} data-testid="outcome-value">{OUTCOME_WORDS[r.outcome]}</strong>
        {review.status === "signed" && (
          <span data-testid="decision">
            · decision <strong className={`status-${review.decision}`}>{OUTCOME_WORDS[review.decision ?? ""]}</strong> by {review.signedBy}, {review.signedAt ? formatTime(review.signedAt, zone) : ""}
          </span>
        )}
      </div>
      {review.status === "signed" && (
        <p data-testid="signature">
          Electronic signature: <strong>{review.signedBy}</strong>, {review.signedAt ? formatTime(review.signedAt, zone, { seconds: true }) : ""}. Meaning: {review.signMeaning ?? "not recorded"}.
        </p>
      )}
      {review.status === "signed" && review.signComment && <p data-testid="sign-comment">Reviewer&apos;s comment: {review.signComment}</p>}
      <Caution />
      <dl className="facts">
        <dt>Trace</dt>
        <dd>
          <Link href={`/traces/${review.trace.id}`}>{review.trace.name}</Link> ({review.trace.fileName}, {review.trace.sampleCount.toLocaleString("en")} samples, {formatSpan(review.trace.startAt, review.trace.endAt, zone)})
        </dd>
        <dt>Trace SHA-256</dt><dd><code className="hash">{review.trace.sha256}</code></dd>
        <dt>Product</dt><dd>{review.product.name} v{review.product.version} <code className="hash">{review.product.sha256.slice(0, 16)}…</code></dd>
        <dt>Pack</dt><dd>{review.pack ? <>{review.pack.name} v{review.pack.version} <code className="hash">{review.pack.sha256.slice(0, 16)}…</code></> : "none (the product's own surface coefficient)"}</dd>
        <dt>Limit set</dt><dd>{review.limits.name} v{review.limits.version} <code className="hash">{review.limits.sha256.slice(0, 16)}…</code></dd>
        <dt>Judged window</dt><dd>{formatSpan(r.window.start, r.window.end, zone)}</dd>
        <dt>Engine</dt><dd>{review.engineVersion}; result SHA-256 <code className="hash">{review.resultSha256}</code></dd>
        <dt>Run</dt><dd>{formatTime(review.createdAt, zone)}</dd>
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

const CHANNEL_OF_RULE: Record<string, string> = { air: "air", core: "core", surface: "surface", mean: "mean", probe: "probe" };

/**
 * The review chart: air and predicted channels decimated on the server for display (min/max per
 * bucket, every excursion's peak kept; lib/display), each excursion shaded, each limit line labelled
 * with its rules and channels and its guard band, and the Monte Carlo 5–95 % band as a filled area
 * under the deterministic core line. The full series is in the CSV export.
 */
export function ReviewChart({ review, series, zone }: { review: StoredReview; series: TraceSeries; zone: string }) {
  const s = review.result.screening;
  const r = review.result;
  const conduction = s.model === "conduction" && review.surface_C && review.mean_C;
  const display = displaySeries({
    t_s: series.t_s,
    channels: {
      air: bridgeGaps(series),
      core: review.core_C,
      surface: conduction ? review.surface_C : null,
      mean: conduction ? review.mean_C : null,
      coolant: review.coolant_C,
      probe: series.probe_C,
      p05: r.uncertainty?.p05,
      p95: r.uncertainty?.p95,
    },
    thresholds: r.rules.map((x) => ({
      value_C: x.threshold_C,
      direction: x.direction,
      channels: x.channel === "core" ? ["core", "p05", "p95"] : [CHANNEL_OF_RULE[x.channel] ?? x.channel],
    })),
  });
  const c = display.channels;
  // One line per threshold; every rule on it is named (an air rule and a core rule can share 8 °C).
  const byThreshold = new Map<number, { rules: string[]; guards: Set<number> }>();
  for (const x of r.rules) {
    const e = byThreshold.get(x.threshold_C) ?? { rules: [], guards: new Set<number>() };
    e.rules.push(`${x.id} (${x.channel}, ${x.direction}${x.guard_K > 0 ? `, guard ±${sigTrim(x.guard_K, 2)} K` : ""})`);
    if (x.guard_K > 0) e.guards.add(x.guard_K);
    byThreshold.set(x.threshold_C, e);
  }
  const thresholds = [...byThreshold].map(([value_C, e]) => ({ value_C, label: `${fixed(value_C, value_C % 1 === 0 ? 0 : 1)} °C`, rules: e.rules, guards_K: [...e.guards] }));
  const laneColor: Record<string, string> = { air: "var(--air)", core: "var(--core)", probe: "#b8860b" };
  const excursions = r.rules.flatMap((x, lane) =>
    x.excursions.map((e) => ({
      lane,
      color: laneColor[x.channel] ?? "#6c8ebf",
      start_ms: Date.parse(e.start),
      end_ms: Date.parse(e.end),
      label: `${x.id}: ${x.channel} ${x.direction} ${x.threshold_C} °C for ${fixed(e.duration_min, 1)} min, peak ${fixed(e.peak_C, 2)} °C (${formatSpan(e.start, e.end, zone)})`,
    })),
  );
  return (
    <section className="card chart-card">
      <TemperatureChart
        title="Air and predicted product temperatures with the rule thresholds"
        zone={zone}
        times_ms={display.times_ms}
        bands={c.p05 && c.p95 ? [{ label: `Core 5–95 % band (Monte Carlo, ${r.uncertainty!.samples} samples)`, color: "var(--core)", lower: c.p05, upper: c.p95 }] : []}
        lines={[
          { label: "Air (logger)", color: "var(--air)", values: c.air! },
          ...(c.surface ? [{ label: "Surface (predicted)", color: "#6c8ebf", values: c.surface, dashed: true }] : []),
          ...(c.mean ? [{ label: "Mean (predicted)", color: "#2b8a7e", values: c.mean, dashed: true }] : []),
          ...(c.coolant ? [{ label: "Coolant / inner air", color: "#7a4fa3", values: c.coolant, dashed: true }] : []),
          ...(c.probe ? [{ label: "Product probe (measured)", color: "#b8860b", values: c.probe }] : []),
          { label: "Core (predicted)", color: "var(--core)", values: c.core! },
        ]}
        thresholds={thresholds}
        excursions={excursions}
        gaps={findGaps(series, (review.trace.importSettings as { gapMultiple?: number } | null)?.gapMultiple).map((g) => [g.start_s * 1000, g.end_s * 1000])}
      />
      <p className="muted" style={{ margin: "0.3rem 0 0", fontSize: "0.8rem" }}>
        Drawn from {display.times_ms.length.toLocaleString("en")} of {series.t_s.length.toLocaleString("en")} samples (the extremes of every pixel column and the peak of every excursion); the CSV export has every sample.
      </p>
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
        <dt>Time constant tau = R·C</dt><dd data-testid="tau">{s.tau_readable} ({Math.round(s.tau_s).toLocaleString("en")} s)</dd>
        <dt>R (air to product)</dt><dd>{sig(s.r_total_K_W, 3)} K/W</dd>
        <dt>C = m·cp</dt><dd>{sig(s.c_total_J_K, 3)} J/K</dd>
        <dt>Lc = V/A</dt><dd>{s.lc_m === null ? "not known" : `${sig(s.lc_m * 1000, 3)} mm`}</dd>
        <dt>Biot number</dt><dd data-testid="biot">{s.biot === null ? "not checked" : sig(s.biot, 2)}</dd>
        <dt>Model</dt><dd data-testid="model">{s.model === "lumped" ? "lumped capacitance" : s.conduction_kind && s.conduction_kind !== "1-D" ? `${s.conduction_kind} conduction (${solver.nodes} nodes)` : `1-D conduction (${solver.shells} shells)`}</dd>
        <dt>Solver</dt>
        <dd>
          {solver.method}
          {solver.step_s !== null ? `, step ${solver.step_s} s (halving it changes results by ${sig(solver.halving_change_K!, 2)} K)` : ", closed form for air linear between samples"}
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

export function HistoryCard({ review, zone }: { review: StoredReview; zone: string }) {
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
          <ul>{r.gaps.map((g) => <li key={g.start}>{formatSpan(g.start, g.end, zone)} ({readableDuration(g.duration_s)}), bridged linearly; rules across it are at best inconclusive</li>)}</ul>
        </>
      )}
    </section>
  );
}

export function RulesCard({ review, zone }: { review: StoredReview; zone: string }) {
  const r = review.result;
  // each rule's allowance, from the limit set version the review ran on (the stored result keeps only the threshold)
  const defined = new Map(((review.limits.body as { rules?: Array<{ id: string } & Parameters<typeof ruleAllowance>[0]> } | null)?.rules ?? []).map((x) => [x.id, x]));
  return (
    <section className="card">
      <h2 style={{ marginTop: 0 }}>Rules</h2>
      <table data-testid="rules-table">
        <thead>
          <tr><th>Rule</th><th>Channel</th><th>Threshold</th><th>Allowed beyond it</th><th className="num">Time beyond (min)</th><th className="num">Longest (min)</th><th className="num">Extreme °C</th><th>Status</th><th>Why</th></tr>
        </thead>
        <tbody>
          {r.rules.map((x) => (
            <tr key={x.id} data-testid={`rule-${x.id}`}>
              <td>{x.id}</td>
              <td>{x.channel}</td>
              <td>{x.direction} {x.threshold_C} °C</td>
              <td data-testid={`allowance-${x.id}`}>{defined.has(x.id) ? ruleAllowance(defined.get(x.id)!) : <span className="muted">not in the limit set</span>}</td>
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
        <thead><tr><th>Rule</th><th>Start</th><th>End</th><th className="num">Duration (min)</th><th className="num">Peak °C</th><th className="num">Degree-minutes</th></tr></thead>
        <tbody>
          {r.rules.every((x) => x.excursions.length === 0) && (
            <tr><td colSpan={6} className="muted">No excursions beyond any rule threshold.</td></tr>
          )}
          {r.rules.flatMap((x) =>
            x.excursions.map((e, i) => (
              <tr key={`${x.id}-${e.start}`} data-testid={`excursion-row-${x.id}-${i}`}>
                <td>{x.id}</td><td>{formatTime(e.start, zone)}</td><td>{formatTime(e.end, zone)}</td>
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

const CURVE_COLORS = ["#1b7f5b", "#b5522b", "#5b4fa3", "#2b6fa3", "#8a6d1b"];

/**
 * Growth and shelf life consumed (issue 16): per model and channel the estimate with its guard band, the
 * remaining shelf life, the cumulative curve on the temperature chart's time axis, the same trip's minutes
 * above a threshold beside it, and the growth and shelf-life rules. Cautions on every consequence.
 */
export function ConsequenceCard({ review, series, zone }: { review: StoredReview; series: TraceSeries; zone: string }) {
  const r = review.result;
  if (!r.consequences || r.consequences.length === 0) return null;
  const domain: [number, number] = [series.t_s[0]! * 1000, series.t_s[series.t_s.length - 1]! * 1000];
  const rules = r.consequence_rules ?? [];
  const curves = (kind: "growth" | "shelf_life") =>
    r.consequences!.filter((c) => c.kind === kind).map((c, i) => ({
      label: `${c.model} on the ${c.channel}`,
      color: CURVE_COLORS[i % CURVE_COLORS.length]!,
      times_ms: c.curve.t_s.map((t) => t * 1000),
      values: c.curve.value,
      dashed: c.channel !== "core",
    }));
  const limits = (kind: "growth" | "shelf_life") => rules.filter((x) => x.kind === kind).map((x) => ({ value: x.limit, label: `${x.id} ≤ ${sigTrim(x.limit, 3)}` }));
  const growth = curves("growth"), shelf = curves("shelf_life");
  // Beside the first growth curve on the core or air: the same history's running minutes above its comparison
  // threshold, from the stored series cut to the judged window exactly as runReview cut it.
  const first = r.consequences.find((c) => c.kind === "growth" && (c.channel === "core" || c.channel === "air"));
  let secondary: (ConsequenceCurve & { unit: string }) | undefined;
  if (first) {
    const values = first.channel === "core" ? review.core_C : bridgeGaps(series);
    const cut = clip(series.t_s, values, Date.parse(r.window.start) / 1000, Date.parse(r.window.end) / 1000);
    const running = cumulativeTimeAbove(cut.t_s, cut.v, first.comparison.threshold_C);
    const at = new Map<number, number>();
    cut.t_s.forEach((t, i) => at.set(t, running[i]! / 60));
    const pts = first.curve.t_s.filter((t) => at.has(t));
    secondary = { label: `${first.channel}: minutes above ${first.comparison.threshold_C} °C`, unit: "min", color: "#8a93a0", times_ms: pts.map((t) => t * 1000), values: pts.map((t) => at.get(t)!) };
  }
  const range = (lo: number, hi: number, unit: string) => `${sigTrim(lo, 3)} to ${sigTrim(hi, 3)}${unit}`;
  const days = (d: number | null | undefined) => (d === null || d === undefined ? "no spoilage predicted at this temperature" : `${sigTrim(d, 3)} days`);
  return (
    <section className="card" data-testid="consequences-card">
      <h2 style={{ marginTop: 0 }}>Growth and shelf life</h2>
      <div className="caution" data-testid="consequence-caution">
        <strong>Model estimates.</strong> The parameters must be validated for this product; these figures do not replace challenge tests, the food business operator&apos;s shelf-life studies or local regulations.
      </div>
      {growth.length > 0 && (
        <>
          <h3>Cumulative growth, log10 increase (same time axis as the chart above)</h3>
          <ConsequenceChart domain_ms={domain} curves={growth} limits={limits("growth")} unit="log10 increase" title="Cumulative log10 increase along the trip" zone={zone} testId="growth-chart" secondary={secondary} />
        </>
      )}
      {shelf.length > 0 && (
        <>
          <h3>Shelf life consumed, % (same time axis)</h3>
          <ConsequenceChart domain_ms={domain} curves={shelf} limits={limits("shelf_life")} unit="% consumed" title="Cumulative shelf life consumed along the trip" zone={zone} testId="shelf-chart" />
        </>
      )}
      <table data-testid="consequences-table">
        <thead>
          <tr><th>Model</th><th>Channel</th><th>Estimate</th><th>Guard band (±{sigTrim(r.consequences[0]!.guard_K, 2)} K)</th><th>Remaining life</th><th>Beside it: time above a threshold</th></tr>
        </thead>
        <tbody>
          {r.consequences.map((c) => (
            <tr key={c.id} data-testid={`consequence-${c.id}`}>
              <td>{c.model}{c.organism ? ` (${c.organism})` : ""}{c.source ? <span className="muted" style={{ display: "block", fontSize: "0.8rem" }}>source: {c.source}</span> : null}</td>
              <td>{c.channel}</td>
              {c.kind === "growth" ? (
                <>
                  <td data-testid={`log10-${c.id}`}>{sigTrim(c.log10_increase!, 3)} log10 increase{c.q0 === null ? " (no lag)" : `, q0 ${sig(c.q0!)}`}</td>
                  <td>{range(c.lower, c.upper, " log10")}</td>
                  <td className="muted">(growth model)</td>
                </>
              ) : (
                <>
                  <td data-testid={`consumed-${c.id}`}>{sigTrim(c.shelf_life_consumed_percent!, 3)} % consumed ({sigTrim(c.shelf_life_consumed_days!, 3)} days at the reference){c.shelf_life_ends_at ? <strong>; used up at {formatTime(c.shelf_life_ends_at, zone)}</strong> : null}</td>
                  <td>{range(c.lower, c.upper, " %")}</td>
                  <td data-testid={`remaining-${c.id}`}>{days(c.remaining_days_at_C)} at {c.storage_C} °C{c.remaining_days_range ? <span className="muted"> ({days(c.remaining_days_range[0])} to {days(c.remaining_days_range[1])} under the guard band)</span> : null}</td>
                </>
              )}
              <td data-testid={`comparison-${c.id}`}>{sigTrim(c.comparison.minutes_above, 3)} min above {c.comparison.threshold_C} °C <span className="muted">({c.comparison.threshold_from})</span></td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="muted">
        Minutes above a threshold count time only; growth and shelf life weigh each minute by how warm it was (60 min at 6 °C and 60 min at 14 °C are the same time above 5 °C and very different growth).
        Estimates run over the judged window; the guard band moves the whole history down and up by the sensor accuracy plus the model uncertainty.
      </p>
      {rules.length > 0 && (
        <>
          <h3>Growth and shelf-life rules</h3>
          <table data-testid="consequence-rules-table">
            <thead><tr><th>Rule</th><th>Model</th><th>Channel</th><th>Limit</th><th>Estimate (guard band)</th><th>Limit reached</th><th>Status</th><th>Why</th></tr></thead>
            <tbody>
              {rules.map((x) => {
                const unit = x.kind === "growth" ? " log10" : " %";
                return (
                  <tr key={x.id} data-testid={`consequence-rule-${x.id}`}>
                    <td>{x.id}</td><td>{x.model}</td><td>{x.channel}</td><td>≤ {sigTrim(x.limit, 3)}{unit}</td>
                    <td>{sigTrim(x.central, 3)}{unit} ({range(x.lower, x.upper, unit)})</td>
                    <td>{x.reached_at ? formatTime(x.reached_at, zone) : "not reached"}</td>
                    <td><StatusBadge status={x.status} /></td><td>{x.reason}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </>
      )}
    </section>
  );
}
