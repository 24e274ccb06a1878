'use client';
import { useEffect, useRef } from 'react';

export interface StripBreath {
  i: number;
  expStartS: number;
  expEndS: number;
  etco2: number;
}
export interface StripFinding {
  startS: number;
  endS: number;
  kind: string;
}

const FINDING_FILL: Record<string, string> = {
  rebreathing: 'rgba(255,154,118,0.20)',
  obstructive_upstroke: 'rgba(201,167,255,0.22)',
  lost_plateau: 'rgba(143,208,232,0.22)',
  plateau_notch: 'rgba(255,220,120,0.22)',
  sudden_zero: 'rgba(239,138,128,0.30)',
  low_amplitude: 'rgba(160,200,160,0.20)',
};

/** The CO2 strip on a canvas: the trace, breath marks, end-tidal values when zoomed in, finding bands. */
export function WaveformStrip(props: { t: number[]; v: (number | null)[]; from: number; to: number; breaths: StripBreath[]; findings: StripFinding[]; gaps: { startS: number; endS: number }[]; onPick: (s: number) => void }) {
  const ref = useRef<HTMLCanvasElement>(null);
  const { t, v, from, to, breaths, findings } = props;
  useEffect(() => {
    const c = ref.current;
    if (!c) return;
    const dpr = window.devicePixelRatio || 1;
    const w = c.clientWidth;
    const h = 240;
    c.width = Math.round(w * dpr);
    c.height = Math.round(h * dpr);
    const g = c.getContext('2d');
    if (!g) return;
    g.setTransform(dpr, 0, 0, dpr, 0, 0);
    g.clearRect(0, 0, w, h);
    const left = 36, right = 8, top = 18, bottom = 22;
    let max = 50;
    for (const x of v) if (x !== null && x > max) max = Math.min(150, x);
    const X = (s: number) => left + ((s - from) / Math.max(1e-9, to - from)) * (w - left - right);
    const Y = (mm: number) => top + (1 - mm / max) * (h - top - bottom);
    // grid
    g.strokeStyle = 'rgba(255,255,255,0.08)';
    g.fillStyle = 'rgba(255,255,255,0.5)';
    g.font = '11px sans-serif';
    for (let mm = 0; mm <= max; mm += 10) {
      g.beginPath();
      g.moveTo(left, Y(mm));
      g.lineTo(w - right, Y(mm));
      g.stroke();
      g.fillText(String(mm), 4, Y(mm) + 4);
    }
    const span = to - from;
    const step = [1, 2, 5, 10, 30, 60, 120, 300, 600, 1800].find((s) => span / s <= 10) ?? 3600;
    for (let s = Math.ceil(from / step) * step; s <= to; s += step) {
      g.beginPath();
      g.moveTo(X(s), top);
      g.lineTo(X(s), h - bottom);
      g.stroke();
      const m = Math.floor(Math.abs(s) / 60);
      g.fillText(`${s < 0 ? '−' : ''}${m}:${String(Math.round(Math.abs(s) % 60)).padStart(2, '0')}`, X(s) + 2, h - 6);
    }
    for (const f of findings) {
      if (f.endS < from || f.startS > to) continue;
      g.fillStyle = FINDING_FILL[f.kind] ?? 'rgba(255,255,255,0.12)';
      g.fillRect(X(f.startS), top, Math.max(2, X(f.endS) - X(f.startS)), h - top - bottom);
    }
    g.fillStyle = 'rgba(255,255,255,0.06)';
    for (const gap of props.gaps) if (gap.endS > from && gap.startS < to) g.fillRect(X(gap.startS), top, X(gap.endS) - X(gap.startS), h - top - bottom);
    // trace
    g.strokeStyle = '#f0f3f6';
    g.lineWidth = 1.2;
    g.beginPath();
    let pen = false;
    for (let k = 0; k < t.length; k++) {
      const y = v[k];
      if (y === null) {
        pen = false;
        continue;
      }
      if (!pen) g.moveTo(X(t[k]), Y(y));
      else g.lineTo(X(t[k]), Y(y));
      pen = true;
    }
    g.stroke();
    // breath marks
    if (span <= 300) {
      for (const b of breaths) {
        g.strokeStyle = 'rgba(120,220,140,0.8)';
        g.beginPath();
        g.moveTo(X(b.expStartS), Y(0));
        g.lineTo(X(b.expStartS), Y(max * 0.15));
        g.stroke();
        g.fillStyle = 'rgba(255,170,80,0.95)';
        g.beginPath();
        g.arc(X(b.expEndS), Y(b.etco2), 3, 0, 2 * Math.PI);
        g.fill();
        if (span <= 60) g.fillText(b.etco2.toFixed(0), X(b.expEndS) - 6, Y(b.etco2) - 6);
      }
    }
  }, [t, v, from, to, breaths, findings, props.gaps]);
  return (
    <canvas
      ref={ref}
      style={{ width: '100%', height: 240, display: 'block', marginTop: 8, cursor: 'zoom-in' }}
      aria-label="CO2 waveform strip"
      onClick={(e) => {
        const r = e.currentTarget.getBoundingClientRect();
        const left = 36, right = 8;
        props.onPick(from + ((e.clientX - r.left - left) / (r.width - left - right)) * (to - from));
      }}
    />
  );
}
