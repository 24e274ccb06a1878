'use client';
import { useEffect, useRef } from 'react';
import uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';

export interface ChartSeries {
  t: number[];
  v: number[];
}
export interface ChartEpisode {
  rule: string;
  start: number;
  end: number;
}
export interface ChartMarker {
  t: number;
  label: string;
  kind: 'dose' | 'intervention' | 'event';
}

/** Episode shading colours by rule family (Plateau's own palette). */
export const RULE_COLOUR: Record<string, string> = {
  apnea: 'rgba(239,138,128,0.28)',
  prolonged_apnea: 'rgba(239,138,128,0.45)',
  hypoventilation: 'rgba(255,154,118,0.22)',
  low_etco2: 'rgba(143,208,232,0.18)',
  bradypnea: 'rgba(143,208,232,0.26)',
  hypoxemia: 'rgba(201,167,255,0.22)',
  severe_hypoxemia: 'rgba(201,167,255,0.36)',
  prolonged_hypoxemia: 'rgba(201,167,255,0.30)',
  critical_hypoxemia: 'rgba(201,167,255,0.5)',
};
const MARK_COLOUR = { dose: '#7fb7a4', intervention: '#e8b46b', event: '#a3aab8' };

/**
 * The case's EtCO2, RR, SpO2 (and HR) over time since the case clock started, with episodes
 * shaded by rule and dose / intervention / event markers. Times are seconds from case start;
 * the x axis shows the unit's wall clock.
 */
export function TrendChart(props: {
  series: Record<string, ChartSeries>;
  episodes: ChartEpisode[];
  markers: ChartMarker[];
  startMs: number;
  timeZone: string;
  etco2Unit: 'mmHg' | 'kPa';
  height?: number;
  testId?: string;
  /** Horizontal EtCO2 bands (mmHg), e.g. the resuscitation targets. */
  bands?: { fromMmHg: number; toMmHg: number; colour: string }[];
}) {
  const host = useRef<HTMLDivElement>(null);
  const plot = useRef<uPlot | null>(null);
  const overlay = useRef({ episodes: props.episodes, markers: props.markers, bands: props.bands ?? [] });
  overlay.current = { episodes: props.episodes, markers: props.markers, bands: props.bands ?? [] };

  const toDisplay = props.etco2Unit === 'kPa' ? (v: number) => Math.round((v / 7.50062) * 100) / 100 : (v: number) => v;
  const channels = ['etco2', 'rr', 'spo2', 'hr'] as const;
  const data = uPlot.join(
    channels.map((ch) => {
      const s = props.series[ch] ?? { t: [], v: [] };
      return [s.t.map((t) => props.startMs / 1000 + t), ch === 'etco2' ? s.v.map(toDisplay) : s.v] as uPlot.AlignedData;
    }),
  );

  useEffect(() => {
    if (!host.current) return;
    const fmt = new Intl.DateTimeFormat('en-GB', { timeZone: props.timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' });
    const draw = (u: uPlot) => {
      const ctx = u.ctx;
      const { top, height, left, width } = u.bbox;
      ctx.save();
      for (const b of overlay.current.bands) {
        const k = props.etco2Unit === 'kPa' ? 1 / 7.50062 : 1;
        const y0 = u.valToPos(b.toMmHg * k, 'co2', true);
        const y1 = u.valToPos(b.fromMmHg * k, 'co2', true);
        ctx.fillStyle = b.colour;
        ctx.fillRect(left, Math.min(y0, y1), width, Math.abs(y1 - y0));
      }
      for (const e of overlay.current.episodes) {
        const x0 = u.valToPos(props.startMs / 1000 + e.start, 'x', true);
        const x1 = u.valToPos(props.startMs / 1000 + e.end, 'x', true);
        ctx.fillStyle = RULE_COLOUR[e.rule] ?? 'rgba(255,255,255,0.12)';
        ctx.fillRect(x0, top, Math.max(2, x1 - x0), height);
      }
      ctx.font = `${Math.round(11 * devicePixelRatio)}px system-ui`;
      // Labels go in three staggered rows so markers close in time stay readable.
      const rowEnds = [-Infinity, -Infinity, -Infinity];
      const sorted = [...overlay.current.markers].sort((a, b) => a.t - b.t);
      for (const m of sorted) {
        const x = u.valToPos(props.startMs / 1000 + m.t, 'x', true);
        ctx.strokeStyle = MARK_COLOUR[m.kind];
        ctx.fillStyle = MARK_COLOUR[m.kind];
        ctx.setLineDash(m.kind === 'event' ? [4, 4] : []);
        ctx.beginPath();
        ctx.moveTo(x, top);
        ctx.lineTo(x, top + height);
        ctx.stroke();
        const w = ctx.measureText(m.label).width;
        const row = rowEnds.findIndex((end) => end < x);
        if (row >= 0) {
          ctx.fillText(m.label, x + 3, top + (12 + row * 13) * devicePixelRatio);
          rowEnds[row] = x + w + 8;
        }
      }
      ctx.restore();
    };
    const opts: uPlot.Options = {
      width: host.current.clientWidth || 800,
      height: props.height ?? 300,
      legend: { show: true },
      cursor: { drag: { x: true, y: false } },
      scales: { x: { time: true }, co2: { range: props.etco2Unit === 'kPa' ? [0, 10] : [0, 75] }, rr: { range: [0, 40] }, spo2: { range: [70, 100] }, hr: { range: [30, 160] } },
      axes: [
        { stroke: '#a3aab8', grid: { stroke: '#2a303b' }, values: (_u, vals) => vals.map((v) => fmt.format(new Date(v * 1000))) },
        { scale: 'co2', stroke: '#ff9a76', label: `EtCO2 ${props.etco2Unit} · RR /min`, grid: { stroke: '#2a303b' } },
        { scale: 'spo2', side: 1, stroke: '#c9a7ff', label: 'SpO2 %', grid: { show: false } },
      ],
      series: [
        {},
        { label: `EtCO2 (${props.etco2Unit})`, scale: 'co2', stroke: '#ff9a76', width: 2, spanGaps: false },
        { label: 'RR (/min)', scale: 'co2', stroke: '#8fd0e8', width: 1.5, spanGaps: false },
        { label: 'SpO2 (%)', scale: 'spo2', stroke: '#c9a7ff', width: 2, spanGaps: false },
        { label: 'HR (/min)', scale: 'hr', stroke: '#d8d08a', width: 1, spanGaps: false, show: false },
      ],
      hooks: { drawClear: [draw] },
    };
    plot.current = new uPlot(opts, data, host.current);
    const ro = new ResizeObserver(() => plot.current?.setSize({ width: host.current?.clientWidth || 800, height: props.height ?? 300 }));
    ro.observe(host.current);
    return () => {
      ro.disconnect();
      plot.current?.destroy();
      plot.current = null;
    };
    // Options change only with the case; data updates go through setData below.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [props.startMs, props.timeZone, props.etco2Unit, props.height]);

  useEffect(() => {
    plot.current?.setData(data, true);
  });

  return <div ref={host} className="trend-chart" data-testid={props.testId ?? 'trend-chart'} role="img" aria-label="Trend chart of EtCO2, RR and SpO2 with episodes shaded" />;
}
