"use client";

import { useMemo, useState } from "react";
import * as d3 from "d3";
import { formatTick, timeTicks, UTC } from "@/lib/display/time";
import { formatC } from "@/lib/display/numbers";

/** One logger of a load: its air and the predicted cores of its products, each on the logger's own times. */
export interface LoadSeries {
  key: string;
  label: string;
  color: string;
  times_ms: number[];
  air: number[];
  cores: Array<{ label: string; values: number[] }>;
}

interface Props {
  loggers: LoadSeries[];
  thresholds: Array<{ value_C: number; label: string }>;
  zone?: string;
  title: string;
}

const W = 960;
const M = { top: 10, right: 90, bottom: 28, left: 46 };

function Plot({ loggers, thresholds, zone, height, title, domain }: { loggers: LoadSeries[]; thresholds: Props["thresholds"]; zone: string; height: number; title: string; domain: { t: [number, number]; y: [number, number] } }) {
  const x = d3.scaleUtc().domain(domain.t).range([M.left, W - M.right]);
  const y = d3.scaleLinear().domain(domain.y).nice().range([height - M.bottom, M.top]);
  const line = (times: number[]) => d3.line<number>().digits(1).defined((v) => Number.isFinite(v)).x((_, i) => x(times[i]!)).y((v) => y(v));
  const bottom = height - M.bottom;
  return (
    <svg viewBox={`0 0 ${W} ${height}`} role="img" aria-label={title}>
      <title>{title}</title>
      {y.ticks(5).map((t) => (
        <g key={`y${t}`}>
          <line x1={M.left} x2={W - M.right} y1={y(t)} y2={y(t)} stroke="#eef0f3" />
          <text x={M.left - 6} y={y(t)} dy="0.32em" textAnchor="end" fontSize={11} fill="#5b6575">{t}</text>
        </g>
      ))}
      {timeTicks(domain.t[0], domain.t[1], zone, 6).map((t) => (
        <text key={`x${t}`} x={x(t)} y={bottom + 18} textAnchor="middle" fontSize={11} fill="#5b6575">{formatTick(t, zone)}</text>
      ))}
      <text x={12} y={(M.top + bottom) / 2} transform={`rotate(-90 12 ${(M.top + bottom) / 2})`} textAnchor="middle" fontSize={11} fill="#5b6575">°C</text>
      <line x1={M.left} x2={W - M.right} y1={bottom} y2={bottom} stroke="#aab3bf" />
      {thresholds.map((t) => (
        <g key={`th${t.value_C}`}>
          <line x1={M.left} x2={W - M.right} y1={y(t.value_C)} y2={y(t.value_C)} stroke="var(--limit)" strokeDasharray="6 4" />
          <text x={W - M.right + 4} y={y(t.value_C)} dy="0.32em" fontSize={11} fill="var(--limit)">{t.label}</text>
        </g>
      ))}
      {loggers.map((l) => (
        <g key={l.key} data-testid={`load-series-${l.key}`}>
          <path d={line(l.times_ms)(l.air) ?? ""} fill="none" stroke={l.color} strokeWidth={1.2} strokeOpacity={0.55} />
          {l.cores.map((c) => (
            <path key={c.label} d={line(l.times_ms)(c.values) ?? ""} fill="none" stroke={l.color} strokeWidth={2} strokeDasharray="5 3">
              <title>{`${l.label}: predicted core, ${c.label}`}</title>
            </path>
          ))}
        </g>
      ))}
    </svg>
  );
}

/**
 * Every logger's air (thin) and predicted cores (dashed) on one time axis: overlaid with a toggle per
 * logger, or as small multiples sharing the same axes.
 */
export function LoadChart({ loggers, thresholds, zone = UTC, title }: Props) {
  const [shown, setShown] = useState<Record<string, boolean>>(() => Object.fromEntries(loggers.map((l) => [l.key, true])));
  const [mode, setMode] = useState<"overlay" | "multiples">("overlay");
  const domain = useMemo(() => {
    const ts = loggers.flatMap((l) => [l.times_ms[0]!, l.times_ms[l.times_ms.length - 1]!]);
    const vs = loggers.flatMap((l) => [...l.air, ...l.cores.flatMap((c) => c.values)]).filter(Number.isFinite).concat(thresholds.map((t) => t.value_C));
    const [lo, hi] = d3.extent(vs) as [number, number];
    const pad = Math.max(0.5, (hi - lo) * 0.06);
    return { t: d3.extent(ts) as [number, number], y: [lo - pad, hi + pad] as [number, number] };
  }, [loggers, thresholds]);
  const visible = loggers.filter((l) => shown[l.key]);
  return (
    <figure className="chart" data-testid="load-chart" data-mode={mode} style={{ margin: 0 }}>
      <div className="no-print"><p style={{ display: "flex", gap: "1rem", flexWrap: "wrap", alignItems: "center" }}>
        <label style={{ display: "inline" }}>
          <input type="radio" name="load-mode" checked={mode === "overlay"} onChange={() => setMode("overlay")} data-testid="mode-overlay" /> overlaid
        </label>
        <label style={{ display: "inline" }}>
          <input type="radio" name="load-mode" checked={mode === "multiples"} onChange={() => setMode("multiples")} data-testid="mode-multiples" /> one small chart per logger
        </label>
      </p></div>
      {mode === "overlay" ? (
        <Plot loggers={visible} thresholds={thresholds} zone={zone} height={340} title={title} domain={domain} />
      ) : (
        <div className="multiples" style={{ display: "grid", gridTemplateColumns: "1fr 1fr", gap: "0.5rem" }}>
          {visible.map((l) => (
            <div key={l.key} data-testid="small-multiple">
              <strong style={{ color: l.color }}>{l.label}</strong>
              <Plot loggers={[l]} thresholds={thresholds} zone={zone} height={200} title={`${title}: ${l.label}`} domain={domain} />
            </div>
          ))}
        </div>
      )}
      <figcaption className="legend">
        {loggers.map((l) => (
          <label key={l.key} style={{ display: "inline-flex", alignItems: "center", gap: "0.3rem", marginRight: "1rem" }}>
            <input type="checkbox" className="no-print" checked={shown[l.key] ?? true} onChange={(e) => setShown({ ...shown, [l.key]: e.target.checked })} data-testid={`toggle-${l.key}`} />
            <span className="swatch" style={{ background: l.color }} />
            {l.label} (air max {formatC(Math.max(...l.air.filter(Number.isFinite)))})
          </label>
        ))}
        <span className="muted">thin: air as logged · dashed: predicted core of each product the logger stands for</span>
      </figcaption>
    </figure>
  );
}
