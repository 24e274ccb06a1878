import type { Proportion } from '@/lib/review';

/** A proportion as a percentage with one decimal. @example pct(0.2597) //=> '26.0 %' */
export function pct(rate: number | null | undefined, digits = 1): string {
  return rate === null || rate === undefined || !Number.isFinite(rate) ? '—' : `${(rate * 100).toFixed(digits)} %`;
}

/** The Wilson interval of a proportion. @example ci(p) //=> '17.5–36.7 %' */
export function ci(p: Pick<Proportion, 'lower' | 'upper' | 'denominator'>): string {
  if (p.denominator === 0) return '—';
  return `${(p.lower * 100).toFixed(1)}–${(p.upper * 100).toFixed(1)} %`;
}

export function num(v: number | null | undefined, digits = 2): string {
  return v === null || v === undefined || !Number.isFinite(v) ? '—' : v.toFixed(digits);
}

/** @example dur(75) //=> '1 min 15 s' */
export function dur(s: number | null | undefined): string {
  if (s === null || s === undefined) return '—';
  const m = Math.floor(s / 60);
  const r = Math.round(s - m * 60);
  return m ? `${m} min ${r} s` : `${r} s`;
}

/** Wall-clock time of a case-relative instant in the unit's zone. */
export function clockAt(startIso: string, t: number, timeZone: string): string {
  return new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', second: '2-digit', hourCycle: 'h23' }).format(new Date(Date.parse(startIso) + t * 1000));
}

/** Seconds from case start as +m:ss. @example rel(75) //=> '+1:15' */
export function rel(t: number): string {
  const sign = t < 0 ? '−' : '+';
  const a = Math.abs(Math.round(t));
  return `${sign}${Math.floor(a / 60)}:${String(a % 60).padStart(2, '0')}`;
}

/** Query string from a record, dropping empty values. */
export function qs(params: Record<string, string | undefined | null>): string {
  const p = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) if (v !== undefined && v !== null && v !== '') p.set(k, v);
  const s = p.toString();
  return s ? `?${s}` : '';
}
