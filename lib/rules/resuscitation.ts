import { lowerBound, medianOf } from '@/lib/_shared/sorted';
import { z } from 'zod';
import type { CaseRecord } from '@/lib/domain/caseRecord';
import { MMHG_PER_KPA } from '@/lib/domain/channel';

/**
 * EtCO2 during chest compressions: compression periods, per-minute medians against the usual
 * targets, and two flags — a possible fatigue of the compressor, and a possible return of
 * circulation (a prompt to check for a pulse, never a statement that circulation returned).
 * The thresholds are data with a version, like the episode rules.
 */
export const ResuscitationRules = z.object({
  id: z.string().min(1),
  version: z.number().int().min(1),
  description: z.string(),
  /** EtCO2 during compressions: at least `minimumMmHg`, ideally above `goodMmHg`. */
  targets: z.object({ minimumMmHg: z.number().positive(), goodMmHg: z.number().positive(), source: z.string() }),
  /** Fatigue: the per-minute median falls `consecutiveFalls` times in a row by at least `minTotalFallMmHg` in all. */
  fatigue: z.object({ consecutiveFalls: z.number().int().min(1), minTotalFallMmHg: z.number().min(0), minSamplesPerMinute: z.number().int().min(1), source: z.string() }),
  /** Possible return of circulation: the median of the next `sustainS` seconds is at least `riseMmHg` above the median of the `beforeS` seconds before. */
  rosc: z.object({ riseMmHg: z.number().positive(), beforeS: z.number().positive(), sustainS: z.number().positive(), source: z.string() }),
});
export type ResuscitationRules = z.infer<typeof ResuscitationRules>;

/** Plateau's resuscitation rules, version 1. */
export const PLATEAU_RESUSCITATION_V1: ResuscitationRules = Object.freeze({
  id: 'plateau-resuscitation',
  version: 1,
  description: 'EtCO2 targets during chest compressions, compressor-fatigue and possible-return-of-circulation flags',
  targets: {
    minimumMmHg: 10,
    goodMmHg: 15,
    source:
      'Common practice in resuscitation guidelines: EtCO2 below 10 mmHg during compressions suggests poor-quality CPR; aim above 15 mmHg (AHA 2020 adult advanced life support, Panchal AR et al., Circulation 142:S366-S468 — from memory).',
  },
  fatigue: {
    consecutiveFalls: 2,
    minTotalFallMmHg: 4,
    minSamplesPerMinute: 20,
    source: "Plateau's choice: a falling EtCO2 during compressions suggests rescuer fatigue (common practice); two falls in a row totalling ≥ 4 mmHg flag it.",
  },
  rosc: {
    riseMmHg: 10,
    beforeS: 60,
    sustainS: 30,
    source: 'Common practice: an abrupt, sustained rise of EtCO2 (about 10 mmHg or more) during compressions may signal return of spontaneous circulation — check for a pulse (from memory).',
  },
});

export interface CompressionPeriod {
  start: number;
  /** Null while compressions go on at the end of the record. */
  end: number | null;
  endedBy: 'paused' | 'stopped' | 'rosc' | null;
}

export interface MinuteMedian {
  /** 1-based minute of compression time. */
  minute: number;
  start: number;
  end: number;
  medianMmHg: number | null;
  samples: number;
  band: 'below_minimum' | 'minimum' | 'good' | 'no_data';
}

export interface ResuscitationAnalysis {
  rules: { id: string; version: number };
  /** True while the last compression period has no end. */
  active: boolean;
  periods: CompressionPeriod[];
  /** Seconds of compressions (pauses left out), up to `nowS` for an open period. */
  compressionS: number;
  minutes: MinuteMedian[];
  fatigueFlags: { t: number; minute: number; fromMmHg: number; toMmHg: number }[];
  possibleRoscFlags: { t: number; beforeMmHg: number; afterMmHg: number }[];
  timeline: { t: number; kind: string; label: string; note?: string }[];
}

const TIMELINE_LABEL: Record<string, string> = {
  chest_compressions: 'Compressions started',
  compressions_paused: 'Compressions paused',
  compressions_resumed: 'Compressions resumed',
  compressions_stopped: 'Compressions stopped',
  rhythm_check: 'Rhythm check',
  shock: 'Shock delivered',
  airway_placed: 'Airway placed',
  rosc: 'Return of circulation recorded',
  team_note: 'Team note',
  intubation: 'Tracheal intubation',
  bag_mask: 'Bag-mask ventilation',
  supraglottic_airway: 'Supraglottic airway',
};

/**
 * Analyses the resuscitation part of a case (none when no chest_compressions was recorded).
 * `nowS` closes an open compression period for the running clock (default: end of data).
 *
 * @example
 * analyzeResuscitation(record, PLATEAU_RESUSCITATION_V1)?.minutes[0].band //=> 'good'
 */
export function analyzeResuscitation(record: CaseRecord, rules: ResuscitationRules = PLATEAU_RESUSCITATION_V1, options: { nowS?: number } = {}): ResuscitationAnalysis | null {
  const starts = record.interventions.filter((i) => i.kind === 'chest_compressions').map((i) => i.t);
  if (starts.length === 0) return null;
  const marks = [
    ...starts.map((t) => ({ t, kind: 'start' as const })),
    ...record.events.filter((e) => e.kind === 'compressions_resumed').map((e) => ({ t: e.t, kind: 'start' as const })),
    ...record.events.filter((e) => e.kind === 'compressions_paused').map((e) => ({ t: e.t, kind: 'paused' as const })),
    ...record.events.filter((e) => e.kind === 'compressions_stopped').map((e) => ({ t: e.t, kind: 'stopped' as const })),
    ...record.events.filter((e) => e.kind === 'rosc').map((e) => ({ t: e.t, kind: 'rosc' as const })),
  ].sort((a, b) => a.t - b.t || (a.kind === 'start' ? 1 : -1));
  const periods: CompressionPeriod[] = [];
  let open: number | null = null;
  for (const m of marks) {
    if (m.kind === 'start') {
      if (open === null) open = m.t;
    } else if (open !== null) {
      periods.push({ start: open, end: m.t, endedBy: m.kind });
      open = null;
    }
  }
  if (open !== null) periods.push({ start: open, end: null, endedBy: null });

  const co2 = record.series.find((s) => s.channel === 'etco2' && s.source === 'monitor');
  const factor = co2?.unit === 'kPa' ? MMHG_PER_KPA : 1;
  const t = co2?.t ?? [];
  const v = co2 ? co2.v.map((x) => x * factor) : [];
  const lastDataT = t.length ? t[t.length - 1] : starts[0];
  const nowS = options.nowS ?? lastDataT;
  const endOf = (p: CompressionPeriod) => p.end ?? Math.max(p.start, nowS);

  // Per-minute medians over compression time only: minute k covers the k-th 60 s of compressions.
  const minutes: MinuteMedian[] = [];
  let acc = 0;
  let minute = 1;
  let bucket: number[] = [];
  let bucketStart = periods[0].start;
  const flush = (end: number) => {
    const m = bucket.length ? medianOf(bucket) : null;
    minutes.push({ minute, start: bucketStart, end, medianMmHg: m === null ? null : round1(m), samples: bucket.length, band: band(m, bucket.length, rules) });
    minute++;
    bucket = [];
  };
  let j = 0;
  for (const p of periods) {
    const pe = endOf(p);
    let cursor = p.start;
    if (!bucket.length && acc === 0) bucketStart = p.start;
    while (cursor < pe) {
      const need = 60 - acc;
      const stop = Math.min(pe, cursor + need);
      while (j < t.length && t[j] < cursor) j++;
      while (j < t.length && t[j] < stop) bucket.push(v[j++]);
      acc += stop - cursor;
      cursor = stop;
      if (acc >= 60 - 1e-9) {
        flush(stop);
        acc = 0;
        bucketStart = stop;
      }
    }
  }
  if (acc > 0) flush(endOf(periods[periods.length - 1]));
  const compressionS = periods.reduce((s, p) => s + (endOf(p) - p.start), 0);

  // Fatigue: `consecutiveFalls` falls in a row among full, well-sampled minutes.
  const fatigueFlags: ResuscitationAnalysis['fatigueFlags'] = [];
  const usable = minutes.filter((m) => m.medianMmHg !== null && m.samples >= rules.fatigue.minSamplesPerMinute);
  let run = 0;
  for (let i = 1; i < usable.length; i++) {
    run = (usable[i].medianMmHg as number) < (usable[i - 1].medianMmHg as number) ? run + 1 : 0;
    if (run >= rules.fatigue.consecutiveFalls) {
      const from = usable[i - run].medianMmHg as number;
      const to = usable[i].medianMmHg as number;
      if (from - to >= rules.fatigue.minTotalFallMmHg - 1e-9) {
        fatigueFlags.push({ t: usable[i].end, minute: usable[i].minute, fromMmHg: from, toMmHg: to });
        run = 0;
      }
    }
  }

  // Possible return of circulation: a sustained rise inside a compression period.
  const possibleRoscFlags: ResuscitationAnalysis['possibleRoscFlags'] = [];
  for (const p of periods) {
    const pe = endOf(p);
    let skipUntil = -Infinity;
    for (let i = 0; i < t.length; i++) {
      const ti = t[i];
      if (ti < p.start + rules.rosc.beforeS / 2 || ti + rules.rosc.sustainS > pe + 1e-9 || ti < skipUntil) continue;
      const before = window(t, v, Math.max(p.start, ti - rules.rosc.beforeS), ti);
      const after = window(t, v, ti, ti + rules.rosc.sustainS);
      if (before.length < 5 || after.length < 5) continue;
      const b = medianOf(before);
      const a = medianOf(after);
      // Sustained: the whole next window stays above the old level plus the rise, bar the odd sample.
      const above = after.filter((x) => x >= b + rules.rosc.riseMmHg).length / after.length;
      if (a - b >= rules.rosc.riseMmHg - 1e-9 && above >= 0.8) {
        // The flag points at the rise itself: the first sample at the new level.
        let k = i;
        while (k < t.length && v[k] < b + rules.rosc.riseMmHg) k++;
        possibleRoscFlags.push({ t: t[k] ?? ti, beforeMmHg: round1(b), afterMmHg: round1(a) });
        skipUntil = ti + 120;
      }
    }
  }

  const kinds = new Set(Object.keys(TIMELINE_LABEL));
  const timeline = [
    ...record.interventions.filter((i) => kinds.has(i.kind)).map((i) => ({ t: i.t, kind: i.kind, label: TIMELINE_LABEL[i.kind], ...(i.note ? { note: i.note } : {}) })),
    ...record.events.filter((e) => kinds.has(e.kind)).map((e) => ({ t: e.t, kind: e.kind, label: TIMELINE_LABEL[e.kind], ...(e.note ? { note: e.note } : {}) })),
    ...record.doses.filter((d) => d.t >= periods[0].start).map((d) => ({ t: d.t, kind: 'dose', label: `${d.drug} ${d.amount} ${d.unit} ${d.route}` })),
  ].sort((a, b) => a.t - b.t);

  return { rules: { id: rules.id, version: rules.version }, active: periods[periods.length - 1].end === null, periods, compressionS, minutes, fatigueFlags, possibleRoscFlags, timeline };
}

function band(m: number | null, n: number, rules: ResuscitationRules): MinuteMedian['band'] {
  if (m === null || n === 0) return 'no_data';
  return m > rules.targets.goodMmHg ? 'good' : m >= rules.targets.minimumMmHg ? 'minimum' : 'below_minimum';
}

function window(t: number[], v: number[], from: number, to: number): number[] {
  const out: number[] = [];
  for (let i = lowerBound(t, from); i < t.length && t[i] < to; i++) out.push(v[i]);
  return out;
}



function round1(x: number): number {
  return Math.round(x * 10) / 10;
}
