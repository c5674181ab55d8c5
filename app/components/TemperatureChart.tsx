"use client";

import { useMemo, useState } from "react";
import * as d3 from "d3";

export interface ChartLine {
  label: string;
  color: string;
  values: number[];
  dashed?: boolean;
}

/** A filled band between two series (e.g. the 5th and 95th percentiles), drawn under the lines. */
export interface ChartBand {
  label: string;
  color: string;
  lower: number[];
  upper: number[];
}

export interface ChartThreshold {
  label: string;
  value_C: number;
}

interface Props {
  /** sample times, ms since the epoch (UTC) */
  times_ms: number[];
  lines: ChartLine[];
  thresholds?: ChartThreshold[];
  bands?: ChartBand[];
  /** spans bridged over missing data, ms */
  gaps?: Array<[number, number]>;
  height?: number;
  title: string;
  /** axis unit label */
  unit?: string;
}

const WIDTH = 960;
const M = { top: 12, right: 110, bottom: 32, left: 48 };

/** Temperature against time for one or more channels, with threshold lines and a hover readout (UTC). */
export function TemperatureChart({ times_ms, lines, thresholds = [], bands = [], gaps = [], height = 340, title, unit = "°C" }: Props) {
  const [hover, setHover] = useState<number | null>(null);
  const { x, y, paths, areas, xTicks, yTicks } = useMemo(() => {
    const x = d3.scaleUtc().domain(d3.extent(times_ms) as [number, number]).range([M.left, WIDTH - M.right]);
    const all = lines.flatMap((l) => l.values.filter(Number.isFinite)).concat(thresholds.map((t) => t.value_C), bands.flatMap((b) => [...b.lower, ...b.upper].filter(Number.isFinite)));
    const [lo, hi] = d3.extent(all) as [number, number];
    const pad = Math.max(0.5, (hi - lo) * 0.06);
    const y = d3.scaleLinear().domain([lo - pad, hi + pad]).nice().range([height - M.bottom, M.top]);
    const paths = lines.map((l) => {
      const gen = d3
        .line<number>()
        .defined((v) => Number.isFinite(v))
        .x((_, i) => x(times_ms[i]!))
        .y((v) => y(v));
      return gen(l.values) ?? "";
    });
    const areas = bands.map((b) =>
      d3
        .area<number>()
        .defined((_, i) => Number.isFinite(b.lower[i]) && Number.isFinite(b.upper[i]))
        .x((_, i) => x(times_ms[i]!))
        .y0((_, i) => y(b.lower[i]!))
        .y1((_, i) => y(b.upper[i]!))(b.lower) ?? "",
    );
    return { x, y, paths, areas, xTicks: x.ticks(6), yTicks: y.ticks(6) };
  }, [times_ms, lines, thresholds, bands, height]);

  const bisect = d3.bisector((t: number) => t).center;
  const onMove = (e: React.MouseEvent<SVGRectElement>) => {
    const svg = e.currentTarget.ownerSVGElement!;
    const pt = svg.createSVGPoint();
    pt.x = e.clientX;
    pt.y = e.clientY;
    const local = pt.matrixTransform(svg.getScreenCTM()!.inverse());
    setHover(bisect(times_ms, x.invert(local.x).getTime()));
  };
  const fmtTick = (d: Date) => (d.getUTCHours() === 0 && d.getUTCMinutes() === 0 ? d3.utcFormat("%d %b")(d) : d3.utcFormat("%H:%M")(d));
  const fmtHover = d3.utcFormat("%Y-%m-%d %H:%M:%S UTC");

  return (
    <figure className="chart" data-testid="temperature-chart" style={{ margin: 0 }}>
      <svg viewBox={`0 0 ${WIDTH} ${height}`} role="img" aria-label={title}>
        {gaps.map(([a, b], i) => (
          <rect key={i} x={x(a)} y={M.top} width={Math.max(1, x(b) - x(a))} height={height - M.top - M.bottom} fill="#e9e4d6">
            <title>data gap, bridged linearly</title>
          </rect>
        ))}
        {yTicks.map((t) => (
          <g key={`y${t}`}>
            <line x1={M.left} x2={WIDTH - M.right} y1={y(t)} y2={y(t)} stroke="#eef0f3" />
            <text x={M.left - 6} y={y(t)} dy="0.32em" textAnchor="end" fontSize={11} fill="#5b6575">{t}</text>
          </g>
        ))}
        {xTicks.map((t) => (
          <text key={`x${t.getTime()}`} x={x(t.getTime())} y={height - M.bottom + 18} textAnchor="middle" fontSize={11} fill="#5b6575">
            {fmtTick(t)}
          </text>
        ))}
        <text x={14} y={M.top + (height - M.top - M.bottom) / 2} transform={`rotate(-90 14 ${M.top + (height - M.top - M.bottom) / 2})`} textAnchor="middle" fontSize={11} fill="#5b6575">{unit}</text>
        <line x1={M.left} x2={WIDTH - M.right} y1={height - M.bottom} y2={height - M.bottom} stroke="#aab3bf" />
        {bands.map((b, i) => (
          <path key={`band${b.label}`} d={areas[i]} fill={b.color} fillOpacity={0.28} stroke="none" data-testid={`band-${b.label.toLowerCase().replace(/\W+/g, "-")}`}>
            <title>{b.label}</title>
          </path>
        ))}
        {thresholds.map((t) => (
          <g key={`th${t.label}`} data-testid="limit-line">
            <line x1={M.left} x2={WIDTH - M.right} y1={y(t.value_C)} y2={y(t.value_C)} stroke="var(--limit)" strokeDasharray="6 4" />
            <text x={WIDTH - M.right + 4} y={y(t.value_C)} dy="0.32em" fontSize={11} fill="var(--limit)">{t.label}</text>
          </g>
        ))}
        {lines.map((l, i) => (
          <path key={l.label} d={paths[i]} fill="none" stroke={l.color} strokeWidth={l.dashed ? 1.5 : 2} strokeDasharray={l.dashed ? "4 3" : undefined} data-testid={`series-${l.label.toLowerCase().replace(/\W+/g, "-")}`} />
        ))}
        {hover !== null && (
          <g pointerEvents="none">
            <line x1={x(times_ms[hover]!)} x2={x(times_ms[hover]!)} y1={M.top} y2={height - M.bottom} stroke="#5b6575" strokeWidth={0.8} />
            {lines.map((l) =>
              Number.isFinite(l.values[hover]) ? <circle key={l.label} cx={x(times_ms[hover]!)} cy={y(l.values[hover]!)} r={3} fill={l.color} /> : null,
            )}
          </g>
        )}
        <rect x={M.left} y={M.top} width={WIDTH - M.left - M.right} height={height - M.top - M.bottom} fill="transparent" onMouseMove={onMove} onMouseLeave={() => setHover(null)} />
      </svg>
      <figcaption className="legend">
        {bands.map((b) => (
          <span key={`band${b.label}`}>
            <span className="swatch" style={{ background: b.color, opacity: 0.4 }} />
            {b.label}
            {hover !== null && Number.isFinite(b.lower[hover]) ? `: ${b.lower[hover]!.toFixed(2)} to ${b.upper[hover]!.toFixed(2)} ${unit}` : ""}
          </span>
        ))}
        {lines.map((l) => (
          <span key={l.label}>
            <span className="swatch" style={{ background: l.color }} />
            {l.label}
            {hover !== null && Number.isFinite(l.values[hover]) ? `: ${l.values[hover]!.toFixed(2)} ${unit}` : ""}
          </span>
        ))}
        <span className="muted">{hover !== null ? fmtHover(new Date(times_ms[hover]!)) : "times in UTC; hover for values"}</span>
      </figcaption>
    </figure>
  );
}
