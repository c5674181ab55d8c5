"use client";

import * as d3 from "d3";

/** A design curve: the governing metric against the design variable, feasible points shaded. */
export function CurveChart({ points, xLabel, yLabel, chosen }: { points: Array<{ x: number; metric: number; feasible: boolean }>; xLabel: string; yLabel: string; chosen: number | null }) {
  const W = 720, H = 280, M = { top: 12, right: 20, bottom: 40, left: 56 };
  const x = d3.scaleLinear().domain(d3.extent(points, (p) => p.x) as [number, number]).range([M.left, W - M.right]);
  const y = d3.scaleLinear().domain(d3.extent(points, (p) => p.metric) as [number, number]).nice().range([H - M.bottom, M.top]);
  const line = d3.line<{ x: number; metric: number }>().x((p) => x(p.x)).y((p) => y(p.metric))(points) ?? "";
  const feasible = points.filter((p) => p.feasible);
  const fx = feasible.length ? d3.extent(feasible, (p) => p.x) as [number, number] : null;
  return (
    <figure className="chart" data-testid="curve-chart" style={{ margin: 0 }}>
      <svg viewBox={`0 0 ${W} ${H}`} role="img" aria-label={`${yLabel} against ${xLabel}`}>
        {fx && <rect x={x(fx[0])} y={M.top} width={Math.max(1, x(fx[1]) - x(fx[0]))} height={H - M.top - M.bottom} fill="#e4f1e6"><title>every rule passes</title></rect>}
        {y.ticks(5).map((t) => (
          <g key={`y${t}`}><line x1={M.left} x2={W - M.right} y1={y(t)} y2={y(t)} stroke="#eef0f3" /><text x={M.left - 6} y={y(t)} dy="0.32em" textAnchor="end" fontSize={11} fill="#5b6575">{t}</text></g>
        ))}
        {x.ticks(6).map((t) => <text key={`x${t}`} x={x(t)} y={H - M.bottom + 16} textAnchor="middle" fontSize={11} fill="#5b6575">{t}</text>)}
        <text x={(M.left + W - M.right) / 2} y={H - 6} textAnchor="middle" fontSize={11} fill="#5b6575">{xLabel}</text>
        <text x={14} y={H / 2} transform={`rotate(-90 14 ${H / 2})`} textAnchor="middle" fontSize={11} fill="#5b6575">{yLabel}</text>
        <path d={line} fill="none" stroke="var(--core)" strokeWidth={2} />
        {points.map((p) => <circle key={p.x} cx={x(p.x)} cy={y(p.metric)} r={3.5} fill={p.feasible ? "var(--pass)" : "var(--fail)"}><title>{`${p.x}: ${p.metric.toFixed(2)} (${p.feasible ? "passes" : "fails"})`}</title></circle>)}
        {chosen !== null && <line x1={x(chosen)} x2={x(chosen)} y1={M.top} y2={H - M.bottom} stroke="var(--ink)" strokeDasharray="4 3" data-testid="chosen-line" />}
      </svg>
      <figcaption className="legend"><span><span className="swatch" style={{ background: "#e4f1e6", height: 10 }} />feasible range</span><span className="muted">green points pass every rule, red points fail one</span></figcaption>
    </figure>
  );
}
