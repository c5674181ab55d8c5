"use client";

import { useMemo, useState } from "react";
import * as d3 from "d3";
import { formatTick, formatTime, timeTicks, UTC } from "@/lib/display/time";
import { formatC, sigTrim } from "@/lib/display/numbers";

const formatK = (k: number) => `${sigTrim(k, 2)} K`;

export interface ChartLine {
  label: string;
  color: string;
  values: number[];
  dashed?: boolean;
}

/** One limit line: every rule that uses this threshold is named on it. */
export interface ChartThreshold {
  value_C: number;
  /** the value as written at the axis, e.g. "8 °C" */
  label: string;
  /** the rules on this threshold with their channel, e.g. ["air-above-8C (air)", "core-peak-8C (core)"] */
  rules?: string[];
  /** guard band half-widths, K (one per distinct guard of the rules here): each drawn as a strip value ± guard */
  guards_K?: number[];
}

/** A time span beyond a rule threshold, shaded behind the lines. */
export interface ChartExcursion {
  start_ms: number;
  end_ms: number;
  label: string;
  /** row of the marker strip along the top of the plot (one per rule) and its colour */
  lane?: number;
  color?: string;
}

/** A filled area between two series (e.g. the Monte Carlo 5–95 % band), drawn under the lines. */
export interface ChartBand {
  label: string;
  color: string;
  lower: number[];
  upper: number[];
}

interface Props {
  /** sample times, ms since the epoch (UTC) */
  times_ms: number[];
  lines: ChartLine[];
  thresholds?: ChartThreshold[];
  excursions?: ChartExcursion[];
  bands?: ChartBand[];
  /** spans bridged over missing data, ms */
  gaps?: Array<[number, number]>;
  height?: number;
  title: string;
  /** axis unit label */
  unit?: string;
  /** IANA zone the times are shown in (stored times stay UTC) */
  zone?: string;
}

export const WIDTH = 960;
export const M = { top: 12, right: 110, bottom: 32, left: 48 };
const EXCURSION_FILL = "rgba(155, 31, 46, 0.08)";
const GUARD_FILL = "rgba(138, 28, 43, 0.06)";

/**
 * Temperature against time: an optional filled band underneath, excursion spans shaded, limit lines
 * labelled with their rules (and guard band), the lines on top, and a hover readout in the display zone.
 * Callers pass display-decimated series (lib/display/decimate.ts), never every sample of a long trace.
 */
export function TemperatureChart({ times_ms, lines, thresholds = [], excursions = [], bands = [], gaps = [], height = 340, title, unit = "°C", zone = UTC }: Props) {
  const [hover, setHover] = useState<number | null>(null);
  const { x, y, paths, areas, xTicks, yTicks } = useMemo(() => {
    const x = d3.scaleUtc().domain(d3.extent(times_ms) as [number, number]).range([M.left, WIDTH - M.right]);
    const all = lines
      .flatMap((l) => l.values.filter(Number.isFinite))
      .concat(thresholds.flatMap((t) => [t.value_C - Math.max(0, ...(t.guards_K ?? [])), t.value_C + Math.max(0, ...(t.guards_K ?? []))]))
      .concat(bands.flatMap((b) => [...b.lower, ...b.upper].filter(Number.isFinite)));
    const [lo, hi] = all.length ? (d3.extent(all) as [number, number]) : [0, 1];
    const pad = Math.max(0.5, (hi - lo) * 0.06);
    const y = d3.scaleLinear().domain([lo - pad, hi + pad]).nice().range([height - M.bottom, M.top]);
    const paths = lines.map((l) => {
      const gen = d3
        .line<number>()
        .digits(1)
        .defined((v) => Number.isFinite(v))
        .x((_, i) => x(times_ms[i]!))
        .y((v) => y(v));
      return gen(l.values) ?? "";
    });
    const areas = bands.map(
      (b) =>
        d3
          .area<number>()
          .digits(1)
          .defined((i) => Number.isFinite(b.lower[i]) && Number.isFinite(b.upper[i]))
          .x((i) => x(times_ms[i]!))
          .y0((i) => y(b.lower[i]!))
          .y1((i) => y(b.upper[i]!))(times_ms.map((_, i) => i)) ?? "",
    );
    const [t0, t1] = x.domain().map((d) => d.getTime()) as [number, number];
    return { x, y, paths, areas, xTicks: timeTicks(t0, t1, zone, 6), yTicks: y.ticks(6) };
  }, [times_ms, lines, thresholds, bands, height, zone]);

  const bisect = d3.bisector((t: number) => t).center;
  const onMove = (e: React.MouseEvent<SVGRectElement>) => {
    const svg = e.currentTarget.ownerSVGElement!;
    const pt = svg.createSVGPoint();
    pt.x = e.clientX;
    pt.y = e.clientY;
    const local = pt.matrixTransform(svg.getScreenCTM()!.inverse());
    setHover(bisect(times_ms, x.invert(local.x).getTime()));
  };
  const plotBottom = height - M.bottom;
  const guards = thresholds.flatMap((t) => (t.guards_K ?? []).filter((g) => g > 0).map((g) => ({ t, g })));

  return (
    <figure className="chart" data-testid="temperature-chart" style={{ margin: 0 }}>
      <svg viewBox={`0 0 ${WIDTH} ${height}`} role="img" aria-label={title}>
        <title>{title}</title>
        {gaps.map(([a, b], i) => (
          <rect key={`gap${i}`} x={x(a)} y={M.top} width={Math.max(1, x(b) - x(a))} height={plotBottom - M.top} fill="#e9e4d6">
            <title>data gap, bridged linearly</title>
          </rect>
        ))}
        {excursions.map((ex, i) => (
          <g key={`ex${i}`} data-testid="excursion-shade">
            <title>{ex.label}</title>
            <rect x={x(ex.start_ms)} y={M.top} width={Math.max(1.5, x(ex.end_ms) - x(ex.start_ms))} height={plotBottom - M.top} fill={EXCURSION_FILL} />
            <rect x={x(ex.start_ms)} y={M.top + (ex.lane ?? 0) * 5} width={Math.max(2, x(ex.end_ms) - x(ex.start_ms))} height={4} fill={ex.color ?? "var(--fail)"} />
          </g>
        ))}
        {yTicks.map((t) => (
          <g key={`y${t}`}>
            <line x1={M.left} x2={WIDTH - M.right} y1={y(t)} y2={y(t)} stroke="#eef0f3" />
            <text x={M.left - 6} y={y(t)} dy="0.32em" textAnchor="end" fontSize={11} fill="#5b6575">{t}</text>
          </g>
        ))}
        {xTicks.map((t) => (
          <text key={`x${t}`} x={x(t)} y={plotBottom + 18} textAnchor="middle" fontSize={11} fill="#5b6575">
            {formatTick(t, zone)}
          </text>
        ))}
        <text x={14} y={M.top + (plotBottom - M.top) / 2} transform={`rotate(-90 14 ${M.top + (plotBottom - M.top) / 2})`} textAnchor="middle" fontSize={11} fill="#5b6575">{unit}</text>
        <line x1={M.left} x2={WIDTH - M.right} y1={plotBottom} y2={plotBottom} stroke="#aab3bf" />
        {guards.map(({ t, g }) => (
          <g key={`gb${t.value_C}-${g}`} data-testid="guard-band">
            {/* one string child: React 19 renders a <title> with several text children empty on the server (hydration error #418) */}
            <title>{`guard band ${t.label} ± ${formatK(g)}`}</title>
            <rect x={M.left} width={WIDTH - M.left - M.right} y={y(t.value_C + g)} height={Math.max(1, y(t.value_C - g) - y(t.value_C + g))} fill={GUARD_FILL} />
            <line x1={M.left} x2={WIDTH - M.right} y1={y(t.value_C + g)} y2={y(t.value_C + g)} stroke="var(--limit)" strokeOpacity={0.35} strokeDasharray="1 3" />
            <line x1={M.left} x2={WIDTH - M.right} y1={y(t.value_C - g)} y2={y(t.value_C - g)} stroke="var(--limit)" strokeOpacity={0.35} strokeDasharray="1 3" />
          </g>
        ))}
        {bands.map((b, i) => (
          <path key={`band${b.label}`} d={areas[i]} fill={b.color} fillOpacity={0.25} stroke="none" data-testid={`band-${b.label.toLowerCase().replace(/\W+/g, "-")}`}>
            <title>{b.label}</title>
          </path>
        ))}
        {thresholds.map((t) => (
          <g key={`th${t.value_C}`} data-testid="limit-line">
            <line x1={M.left} x2={WIDTH - M.right} y1={y(t.value_C)} y2={y(t.value_C)} stroke="var(--limit)" strokeDasharray="6 4" />
            <text x={WIDTH - M.right + 4} y={y(t.value_C)} dy="0.32em" fontSize={11} fill="var(--limit)">{t.label}</text>
          </g>
        ))}
        {lines.map((l, i) => (
          <path key={l.label} d={paths[i]} fill="none" stroke={l.color} strokeWidth={l.dashed ? 1.5 : 2} strokeDasharray={l.dashed ? "4 3" : undefined} data-testid={`series-${l.label.toLowerCase().replace(/\W+/g, "-")}`} />
        ))}
        {thresholds.map((t) =>
          t.rules && t.rules.length > 0 ? (
            <text key={`tl${t.value_C}`} x={WIDTH - M.right - 4} y={y(t.value_C) - 4} textAnchor="end" fontSize={10.5} fill="var(--limit)" stroke="#fff" strokeWidth={3} paintOrder="stroke" data-testid="limit-label">
              {t.rules.join(" · ")}
            </text>
          ) : null,
        )}
        {hover !== null && (
          <g pointerEvents="none">
            <line x1={x(times_ms[hover]!)} x2={x(times_ms[hover]!)} y1={M.top} y2={plotBottom} stroke="#5b6575" strokeWidth={0.8} />
            {lines.map((l) =>
              Number.isFinite(l.values[hover]) ? <circle key={l.label} cx={x(times_ms[hover]!)} cy={y(l.values[hover]!)} r={3} fill={l.color} /> : null,
            )}
          </g>
        )}
        <rect x={M.left} y={M.top} width={WIDTH - M.left - M.right} height={plotBottom - M.top} fill="transparent" onMouseMove={onMove} onMouseLeave={() => setHover(null)} />
      </svg>
      <figcaption className="legend">
        {bands.map((b) => (
          <span key={`band${b.label}`}>
            <span className="swatch" style={{ background: b.color, opacity: 0.4, height: "0.7rem" }} />
            {b.label}
            {hover !== null && Number.isFinite(b.lower[hover]) ? `: ${formatC(b.lower[hover]!)} to ${formatC(b.upper[hover]!)}` : ""}
          </span>
        ))}
        {lines.map((l) => (
          <span key={l.label}>
            <span className="swatch" style={{ background: l.color }} />
            {l.label}
            {hover !== null && Number.isFinite(l.values[hover]) ? `: ${formatC(l.values[hover]!)}` : ""}
          </span>
        ))}
        {excursions.length > 0 && (
          <span><span className="swatch" style={{ background: "rgba(155, 31, 46, 0.2)", height: "0.7rem" }} />excursion beyond a rule threshold (marked per rule along the top<span className="no-print">; hover for details</span>)</span>
        )}
        {guards.length > 0 && (
          <span><span className="swatch" style={{ background: "rgba(138, 28, 43, 0.15)", height: "0.7rem" }} />guard band: threshold ± {[...new Set(guards.map((x) => formatK(x.g)))].join(", ")} (sensor and model uncertainty)</span>
        )}
        <span className="muted" data-testid="chart-time">{hover !== null ? formatTime(times_ms[hover]!, zone, { seconds: true }) : <>times in {zone}<span className="no-print">; hover for values</span></>}</span>
      </figcaption>
    </figure>
  );
}
