import type { SampleUnit } from '@/lib/domain/channel';
import type { DoseUnit } from '@/lib/domain/drug';
import { formatClock, formatDate } from '@/lib/_shared/time';
import type { PerKgUnit } from './types';

/**
 * One formatting function per quantity. The note's text, the PDF and the tests all format through
 * these, so a number in the text is always the structured value it came from, rounded one way.
 */

/**
 * A number with at most `maxDecimals` decimals, trailing zeros dropped, never in exponent form.
 * @example formatNumber(2.50, 2) //=> "2.5"
 * @example formatNumber(-0.0001, 1) //=> "0"
 */
export function formatNumber(x: number, maxDecimals: number): string {
  const f = 10 ** maxDecimals;
  let r = Math.round(x * f) / f;
  if (Object.is(r, -0) || r === 0) r = 0;
  let s = r.toFixed(maxDecimals);
  if (s.includes('.')) s = s.replace(/0+$/, '').replace(/\.$/, '');
  return s;
}

/**
 * Three significant figures, for per-kg doses (0.0244 mg/kg and 12.2 mcg/kg keep their precision).
 * @example formatSignificant(1.463414) //=> "1.46"
 * @example formatSignificant(0.02439) //=> "0.0244"
 */
export function formatSignificant(x: number, digits = 3): string {
  if (x === 0) return '0';
  if (Math.abs(x) >= 10 ** digits) return formatNumber(x, 0);
  const s = Number(x.toPrecision(digits));
  const decimals = Math.max(0, digits - 1 - Math.floor(Math.log10(Math.abs(s))));
  return formatNumber(s, decimals);
}

/** @example formatDoseAmount(40, 'mg') //=> "40 mg" */
export function formatDoseAmount(amount: number, unit: DoseUnit): string {
  return `${formatNumber(amount, 3)} ${unit}`;
}

/** @example formatPerKg(1.463414, 'mg/kg') //=> "1.46 mg/kg" */
export function formatPerKg(value: number, unit: PerKgUnit): string {
  return `${formatSignificant(value)} ${unit}`;
}

/** The decimals a channel value is shown with: kPa two, others one (trailing zeros dropped). */
export function valueDecimals(unit: SampleUnit): number {
  return unit === 'kPa' ? 2 : 1;
}

/**
 * A physiological value with its unit: SpO2 "84 %", RR "6 /min", EtCO2 "52 mmHg" or "6.67 kPa".
 * @example formatChannelValue(6.6661, 'kPa') //=> "6.67 kPa"
 */
export function formatChannelValue(value: number, unit: SampleUnit): string {
  return `${formatNumber(value, valueDecimals(unit))} ${unit}`;
}

/**
 * A duration in whole seconds, in s below a minute, then min and s, then h and min.
 * @example formatDuration(45) //=> "45 s"
 * @example formatDuration(125) //=> "2 min 5 s"
 * @example formatDuration(4380) //=> "1 h 13 min"
 */
export function formatDuration(seconds: number): string {
  const r = Math.max(0, Math.round(seconds));
  if (r < 60) return `${r} s`;
  if (r < 3600) {
    const m = Math.floor(r / 60);
    const s = r % 60;
    return s === 0 ? `${m} min` : `${m} min ${s} s`;
  }
  const h = Math.floor(r / 3600);
  const m = Math.floor((r % 3600) / 60);
  const s = r % 60;
  return `${h} h ${m} min${s === 0 ? '' : ` ${s} s`}`;
}

/** A sampling interval in seconds, to two decimals. @example formatInterval(0.5) //=> "0.5 s" */
export function formatInterval(seconds: number): string {
  return `${formatNumber(seconds, 2)} s`;
}

/** @example formatPercent(96.5) //=> "96.5 %" */
export function formatPercent(pct: number): string {
  return `${formatNumber(pct, 1)} %`;
}

/** @example formatKg(82) //=> "82 kg" */
export function formatKg(kg: number): string {
  return `${formatNumber(kg, 1)} kg`;
}

/** @example formatCm(175) //=> "175 cm" */
export function formatCm(cm: number): string {
  return `${formatNumber(cm, 1)} cm`;
}

/** @example formatBmi(26.8) //=> "26.8 kg/m²" */
export function formatBmi(bmi: number): string {
  return `${formatNumber(bmi, 1)} kg/m²`;
}

/** Whole scores (STOP-Bang, Aldrete). @example formatScore(9) //=> "9" */
export function formatScore(score: number): string {
  return formatNumber(score, 0);
}

/**
 * Clock time (HH:MM:SS) of a case time `t` (seconds from start) in a zone.
 * @example clockAt(Date.parse('2026-03-02T09:00:00Z'), 615, 'Europe/Dublin') //=> "09:10:15"
 */
export function clockAt(caseStartMs: number, t: number, timeZone: string): string {
  return formatClock(new Date(caseStartMs + Math.round(t * 1000)), timeZone, true);
}

/**
 * Date and minute of an instant in a zone, for signatures.
 * @example formatDateTime('2026-03-02T09:52:00Z', 'Europe/Dublin') //=> "2 Mar 2026 09:52"
 */
export function formatDateTime(iso: string, timeZone: string): string {
  const d = new Date(iso);
  return `${formatDate(d, timeZone)} ${formatClock(d, timeZone)}`;
}
