"use client";

import * as d3 from "d3";
import { formatTick, timeTicks, UTC } from "@/lib/display/time";
import { M, WIDTH } from "./TemperatureChart";

export interface ConsequenceCurve {
  label: string;
  color: string;
  /** epoch ms and the cumulative value (log10 increase, or percent of the shelf life consumed) */
  times_ms: number[];
  values: number[];
  dashed?: boolean;
}

/**
 * The cumulative growth (log10 increase) or shelf life consumed (%) along the trip, on the same time axis as the
 * temperature chart above it (same width, margins and time domain), with each rule's limit as a dashed line.
 */
export function ConsequenceChart({ domain_ms, curves, limits = [], unit, title, zone = UTC, height = 200, testId = "consequence-chart", secondary }: { domain_ms: [number, number]; curves: ConsequenceCurve[]; limits?: Array<{ value: number; label: string }>; unit: string; title: string; zone?: string; height?: number; testId?: string; secondary?: ConsequenceCurve & { unit: string } }) {
  const x = d3.scaleUtc().domain(domain_ms).range([M.left, WIDTH - M.right]);
  const all = curves.flatMap((c) => c.values).concat(limits.map((l) => l.value), [0]);
  const y = d3.scaleLinear().domain([0, Math.max(1e-9, ...all) * 1.08]).nice().range([height - M.bottom, M.top]);
  const plotBottom = height - M.bottom;
  const line = (c: ConsequenceCurve, scale = y) => d3.line<number>().digits(1).x((_, i) => x(c.times_ms[i]!)).y((v) => scale(v))(c.values) ?? "";
  // the proxy beside it (minutes above a threshold) on its own scale, ticks inside the plot's right edge
  const y2 = secondary ? d3.scaleLinear().domain([0, Math.max(1, ...secondary.values) * 1.08]).nice().range([height - M.bottom, M.top]) : null;
  return (
    <figure className="chart" data-testid={testId} style={{ margin: 0 }}>
      <svg viewBox={`0 0 ${WIDTH} ${height}`} role="img" aria-label={title}>
        <title>{title}</title>
        {y.ticks(4).map((t) => (
          <g key={`y${t}`}>
            <line x1={M.left} x2={WIDTH - M.right} y1={y(t)} y2={y(t)} stroke="#eef0f3" />
            <text x={M.left - 6} y={y(t)} dy="0.32em" textAnchor="end" fontSize={11} fill="#5b6575">{t}</text>
          </g>
        ))}
        {timeTicks(domain_ms[0], domain_ms[1], zone, 6).map((t) => (
          <text key={`x${t}`} x={x(t)} y={plotBottom + 18} textAnchor="middle" fontSize={11} fill="#5b6575">{formatTick(t, zone)}</text>
        ))}
        <text x={14} y={M.top + (plotBottom - M.top) / 2} transform={`rotate(-90 14 ${M.top + (plotBottom - M.top) / 2})`} textAnchor="middle" fontSize={11} fill="#5b6575">{unit}</text>
        <line x1={M.left} x2={WIDTH - M.right} y1={plotBottom} y2={plotBottom} stroke="#aab3bf" />
        {limits.map((l) => (
          <g key={`l${l.label}`} data-testid="consequence-limit">
            <line x1={M.left} x2={WIDTH - M.right} y1={y(l.value)} y2={y(l.value)} stroke="var(--limit)" strokeDasharray="6 4" />
            <text x={WIDTH - M.right + 4} y={y(l.value)} dy="0.32em" fontSize={10.5} fill="var(--limit)">{l.label}</text>
          </g>
        ))}
        {secondary && y2 && (
          <g data-testid="consequence-secondary">
            {y2.ticks(4).map((t) => (
              <text key={`y2${t}`} x={WIDTH - M.right - 4} y={y2(t)} dy="-0.2em" textAnchor="end" fontSize={10} fill="#8a93a0">{t}</text>
            ))}
            <path d={line(secondary, y2)} fill="none" stroke={secondary.color} strokeWidth={1.5} strokeDasharray="2 3" />
          </g>
        )}
        {curves.map((c) => (
          <path key={c.label} d={line(c)} fill="none" stroke={c.color} strokeWidth={2} strokeDasharray={c.dashed ? "4 3" : undefined} data-testid={`consequence-curve-${c.label.toLowerCase().replace(/\W+/g, "-")}`} />
        ))}
      </svg>
      <figcaption className="legend">
        {curves.map((c) => (
          <span key={c.label}><span className="swatch" style={{ background: c.color }} />{c.label}</span>
        ))}
        {secondary && <span><span className="swatch" style={{ background: secondary.color }} />{secondary.label} ({secondary.unit}, grey scale inside the right edge)</span>}
      </figcaption>
    </figure>
  );
}
