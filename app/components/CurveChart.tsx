"use client";

import * as d3 from "d3";

export interface CurvePointView {
  x: number;
  y: number;
  feasible: boolean;
  /** ids of the rules that do not pass at this point */
  failing: string[];
}

export interface CurveLimit {
  value: number;
  label: string;
  /** "limit": the rule as written; "pass": where a pass must stay once the guard band is taken off */
  kind: "limit" | "pass";
}

/**
 * A design curve: the governing rule's measure against the design variable, in the user's units, with
 * the rule's limit line, the feasible range shaded and the chosen value marked.
 */
/**
 * `feasible` is the range to shade, as the result states it (from the boundary value, not from the curve's first
 * passing point, which may lie a whole curve step further on).
 */
export function CurveChart({ points, xLabel, yLabel, chosen, feasible, limits = [], note }: { points: CurvePointView[]; xLabel: string; yLabel: string; chosen: number | null; feasible: [number, number] | null; limits?: CurveLimit[]; note?: string | null }) {
  const W = 760, H = 300, M = { top: 14, right: 150, bottom: 44, left: 60 };
  const x = d3.scaleLinear().domain(d3.extent(points, (p) => p.x) as [number, number]).range([M.left, W - M.right]);
  const ys = points.map((p) => p.y).filter(Number.isFinite).concat(limits.map((l) => l.value));
  const y = d3.scaleLinear().domain(d3.extent(ys) as [number, number]).nice().range([H - M.bottom, M.top]);
  const line = d3.line<CurvePointView>().defined((p) => Number.isFinite(p.y)).x((p) => x(p.x)).y((p) => y(p.y))(points) ?? "";
  const fmt = (v: number) => Number(v.toPrecision(4)).toString();
  return (
    <figure className="chart" data-testid="curve-chart" style={{ margin: 0 }}>
      <svg viewBox={`0 0 ${W} ${H}`} role="img" aria-label={`${yLabel} against ${xLabel}`}>
        {feasible && <rect data-testid="feasible-range" x={x(feasible[0])} y={M.top} width={Math.max(1, x(feasible[1]) - x(feasible[0]))} height={H - M.top - M.bottom} fill="#e4f1e6"><title>every rule passes</title></rect>}
        {y.ticks(5).map((t) => (
          <g key={`y${t}`}><line x1={M.left} x2={W - M.right} y1={y(t)} y2={y(t)} stroke="#eef0f3" /><text x={M.left - 6} y={y(t)} dy="0.32em" textAnchor="end" fontSize={11} fill="#5b6575">{t}</text></g>
        ))}
        {x.ticks(6).map((t) => <text key={`x${t}`} x={x(t)} y={H - M.bottom + 16} textAnchor="middle" fontSize={11} fill="#5b6575">{t}</text>)}
        <line x1={M.left} x2={W - M.right} y1={H - M.bottom} y2={H - M.bottom} stroke="#aab3bf" />
        <text x={(M.left + W - M.right) / 2} y={H - 8} textAnchor="middle" fontSize={12} fill="#1d2430" data-testid="curve-x-label">{xLabel}</text>
        <text x={14} y={(M.top + H - M.bottom) / 2} transform={`rotate(-90 14 ${(M.top + H - M.bottom) / 2})`} textAnchor="middle" fontSize={11} fill="#1d2430" data-testid="curve-y-label">{yLabel}</text>
        {limits.map((l) => (
          <g key={`${l.kind}${l.value}`} data-testid={`curve-${l.kind}-line`}>
            <line x1={M.left} x2={W - M.right} y1={y(l.value)} y2={y(l.value)} stroke="var(--limit)" strokeWidth={l.kind === "limit" ? 1.5 : 1} strokeDasharray={l.kind === "limit" ? "6 4" : "2 3"} />
            <text x={W - M.right + 6} y={y(l.value)} fontSize={11} fill="var(--limit)">
              {/* "rule-id: limit" on two lines, so a long rule id fits the margin */}
              {l.label.split(/(?<=:) /).map((part, i) => <tspan key={i} x={W - M.right + 6} dy={i === 0 ? "-0.2em" : "1.2em"}>{part}</tspan>)}
            </text>
          </g>
        ))}
        <path d={line} fill="none" stroke="var(--core)" strokeWidth={2} />
        {points.map((p) =>
          Number.isFinite(p.y) ? (
            <circle key={p.x} cx={x(p.x)} cy={y(p.y)} r={3.5} fill={p.feasible ? "var(--pass)" : "var(--fail)"}>
              <title>{`${fmt(p.x)}: ${fmt(p.y)}; ${p.feasible ? "every rule passes" : `does not pass: ${p.failing.join(", ")}`}`}</title>
            </circle>
          ) : null,
        )}
        {chosen !== null && (
          <g data-testid="chosen-line">
            <line x1={x(chosen)} x2={x(chosen)} y1={M.top} y2={H - M.bottom} stroke="var(--ink)" strokeDasharray="4 3" />
            <text x={x(chosen) + 4} y={M.top + 10} fontSize={11} fill="var(--ink)">{fmt(chosen)}</text>
          </g>
        )}
      </svg>
      <figcaption className="legend">
        <span><span className="swatch" style={{ background: "#e4f1e6", height: 10 }} />feasible range</span>
        <span className="muted">green points pass every rule, red points fail one<span className="no-print"> (hover for which)</span></span>
        {note && <span className="muted" data-testid="curve-note">{note}</span>}
      </figcaption>
    </figure>
  );
}
