import { MMHG_PER_KPA } from '@/lib/domain/channel';

/** A waveform file that cannot be read; `field` names what is wrong (the API maps it to 422). */
export class WaveformError extends Error {
  constructor(
    public readonly field: string,
    message: string,
  ) {
    super(`${field}: ${message}`);
    this.name = 'WaveformError';
  }
}

export interface ParseWaveformCsvOptions {
  /** Stated sampling rate, 20–300 Hz. */
  rateHz: number;
  unit: 'mmHg' | 'kPa';
  /** Largest share of unusable rows before the file is refused (default 0.1). */
  maxBadFraction?: number;
  /** Longest file accepted (s, default 24 h). */
  maxDurationS?: number;
}

export interface ParsedWaveform {
  /** mmHg; NaN for a missing, non-numeric or absurd sample and for the samples of a time gap. */
  v: Float32Array;
  rateHz: number;
  /** Time of sample 0 in the file's own clock (s): the first time value, or 0 for an index file. */
  fileT0S: number;
  /** 'time' (first column in seconds), 'index' (sample numbers) or 'values' (one column). */
  layout: 'time' | 'index' | 'values';
  rows: number;
  /** Rows whose value was not a number or outside −10…150 mmHg (kept as gaps). */
  badValues: number;
  /** Samples filled in as gaps where times jump. */
  gapSamples: number;
}

const MAX_BAD_SHOWN = 3;

/**
 * Reads a raw CO2 CSV: one column of values, or time (s) or sample index and value, with or
 * without a header, `,`, `;` or tab separated. Values convert to mmHg. Bad values become gap
 * samples (NaN); too many of them, times that disagree with the stated rate, or times running
 * backwards are a WaveformError.
 *
 * @example
 * parseWaveformCsv('t,co2\n0,0\n0.01,1.5\n0.02,3', { rateHz: 100, unit: 'mmHg' }).v //=> Float32Array [0, 1.5, 3]
 */
export function parseWaveformCsv(text: string, opts: ParseWaveformCsvOptions): ParsedWaveform {
  const rate = opts.rateHz;
  if (typeof rate !== 'number' || !Number.isFinite(rate) || rate < 20 || rate > 300) throw new WaveformError('rateHz', `must be a number from 20 to 300 Hz, got ${String(rate)}`);
  if (opts.unit !== 'mmHg' && opts.unit !== 'kPa') throw new WaveformError('unit', 'must be mmHg or kPa');
  const factor = opts.unit === 'kPa' ? MMHG_PER_KPA : 1;
  const maxS = opts.maxDurationS ?? 24 * 3600;
  const lines = text.split(/\r?\n/);
  let li = 0;
  while (li < lines.length && lines[li].trim() === '') li++;
  if (li >= lines.length) throw new WaveformError('text', 'the file is empty');
  const sep = /\t/.test(lines[li]) ? '\t' : /;/.test(lines[li]) ? ';' : ',';
  const firstCells = lines[li].split(sep).map((c) => c.trim());
  const numeric = (c: string) => c !== '' && Number.isFinite(Number(c));
  let header: string[] | null = null;
  if (!firstCells.some(numeric)) {
    header = firstCells.map((c) => c.toLowerCase());
    li++;
  }
  const cols = header ? header.length : firstCells.length;
  if (cols > 2) throw new WaveformError('text', `expected one column (values) or two (time or sample index, value), found ${cols}`);
  const keys: number[] = [];
  const vals: number[] = [];
  const badRows: number[] = [];
  for (let r = li; r < lines.length; r++) {
    const line = lines[r];
    if (line.trim() === '') continue;
    const cells = line.split(sep);
    const key = cols === 2 ? Number(cells[0]) : keys.length;
    if (cols === 2 && (cells[0].trim() === '' || !Number.isFinite(key))) throw new WaveformError('text', `row ${r + 1}: the first column must be a time or sample index, got "${cells[0].trim()}"`);
    const raw = (cols === 2 ? cells[1] : cells[0]) ?? '';
    const x = raw.trim() === '' ? NaN : Number(raw) * factor;
    keys.push(key);
    if (!Number.isFinite(x) || x < -10 || x > 150) {
      badRows.push(r + 1);
      vals.push(NaN);
    } else vals.push(x);
  }
  const rows = vals.length;
  if (rows < 2) throw new WaveformError('text', 'the file has fewer than two samples');
  if (badRows.length > (opts.maxBadFraction ?? 0.1) * rows) {
    throw new WaveformError('text', `${badRows.length} of ${rows} values are not numbers or outside −10…150 mmHg (rows ${badRows.slice(0, MAX_BAD_SHOWN).join(', ')}${badRows.length > MAX_BAD_SHOWN ? ', …' : ''}); check the unit and the column`);
  }
  let layout: ParsedWaveform['layout'] = cols === 1 ? 'values' : 'time';
  if (cols === 2) {
    const h0 = header?.[0] ?? '';
    const allInts = keys.every((k) => Number.isInteger(k));
    if (/index|sample|^n$|^i$/.test(h0) || (!/time|^t$|sec/.test(h0) && allInts && keys[1] - keys[0] === 1)) layout = 'index';
  }
  const dt = 1 / rate;
  let steps: number[];
  if (layout === 'values') steps = keys;
  else {
    const unitStep = layout === 'time' ? dt : 1;
    const diffs: number[] = [];
    for (let i = 1; i < keys.length && diffs.length < 2000; i++) diffs.push(keys[i] - keys[i - 1]);
    const sortedD = [...diffs].sort((p, q) => p - q);
    const med = sortedD[sortedD.length >> 1];
    if (layout === 'time' && Math.abs(med - dt) > 0.05 * dt) {
      throw new WaveformError('rateHz', `stated ${rate} Hz, but the times step ${round(med)} s (${round(1 / med)} Hz)`);
    }
    steps = new Array(keys.length);
    for (let i = 0; i < keys.length; i++) {
      if (i > 0 && keys[i] <= keys[i - 1]) throw new WaveformError('text', `row ${i + li + 1}: the ${layout} does not increase (${keys[i]} after ${keys[i - 1]})`);
      steps[i] = Math.round((keys[i] - keys[0]) / unitStep);
    }
  }
  const n = steps[steps.length - 1] + 1;
  if (n / rate > maxS) throw new WaveformError('text', `the file covers ${round(n / rate)} s, more than ${maxS} s`);
  const v = new Float32Array(n).fill(NaN);
  for (let i = 0; i < vals.length; i++) v[steps[i]] = vals[i];
  return { v, rateHz: rate, fileT0S: layout === 'time' ? keys[0] : 0, layout, rows, badValues: badRows.length, gapSamples: n - rows };
}

function round(x: number): number {
  return Math.round(x * 1000) / 1000;
}
