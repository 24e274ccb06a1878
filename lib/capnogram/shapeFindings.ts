import type { Pause } from './segmentBreaths';
import type { Breath, FindingKind, ShapeFinding } from './types';

/**
 * Thresholds of the shape findings. `rebreathing` follows common practice (an inspired CO2 that
 * does not return to zero; monitors commonly alarm at a few mmHg — no single source); the rest
 * are Plateau's choices, documented in docs/capnogram.md.
 */
export interface ShapeFindingOptions {
  /** Inspired minimum at or above this (mmHg) on `rebreathingBreaths` consecutive breaths. */
  rebreathingMmHg?: number;
  rebreathingBreaths?: number;
  /** Upstroke–plateau angle at or above this (degrees) on `obstructiveBreaths` consecutive breaths. */
  obstructiveAlphaDeg?: number;
  obstructiveBreaths?: number;
  /** Fall from peak to end of plateau, as a fraction of (peak − baseline), on `lostPlateauBreaths`. */
  lostPlateauFraction?: number;
  lostPlateauBreaths?: number;
  /** Notch depth at or above this fraction of the amplitude and at least `notchMinMmHg`. */
  notchFraction?: number;
  notchMinMmHg?: number;
  /** A flat line of at least this long (s), below `suddenZeroMaxMmHg`, after a breath of at least half the reference amplitude. */
  suddenZeroS?: number;
  suddenZeroMaxMmHg?: number;
  /** Amplitude below this fraction of the reference on `lowAmplitudeBreaths` consecutive breaths. */
  lowAmplitudeFraction?: number;
  lowAmplitudeBreaths?: number;
  /** The amplitude relative thresholds use; default the median amplitude of the breaths given. */
  referenceAmplitude?: number;
}

export const FINDING_DEFAULTS: Required<Omit<ShapeFindingOptions, 'referenceAmplitude'>> = {
  rebreathingMmHg: 3,
  rebreathingBreaths: 5,
  obstructiveAlphaDeg: 120,
  obstructiveBreaths: 3,
  lostPlateauFraction: 0.2,
  lostPlateauBreaths: 3,
  notchFraction: 0.1,
  notchMinMmHg: 2,
  suddenZeroS: 10,
  suddenZeroMaxMmHg: 5,
  lowAmplitudeFraction: 0.5,
  lowAmplitudeBreaths: 3,
};

/** Plateau's names and the words the UI shows for each finding. */
export const FINDING_TEXT: Record<FindingKind, { label: string; description: string }> = {
  rebreathing: {
    label: 'Inspired CO2 above zero',
    description: 'Between breaths the CO2 does not fall back to zero: the patient breathes in CO2. Commonly rebreathing (exhausted absorber, faulty valve, too much dead space under drapes or a mask) — or a sensor that needs zeroing.',
  },
  obstructive_upstroke: {
    label: 'Slow sloping upstroke',
    description: 'The expiratory upstroke rises slowly and runs into the plateau without a corner ("shark fin"): commonly airway obstruction — bronchospasm, COPD or asthma, a kinked tube or secretions.',
  },
  lost_plateau: {
    label: 'Plateau falls away',
    description: 'The curve rises normally but the plateau is not held and falls before the breath ends: commonly a leak around the airway or mask, or sampling diluted by room air or oxygen.',
  },
  plateau_notch: {
    label: 'Notch in the plateau',
    description: 'A dip in the middle of the plateau that recovers: commonly a weak breath effort by the patient (returning spontaneous breathing, a hiccup) or pressure on the chest.',
  },
  sudden_zero: {
    label: 'Waveform stops at zero',
    description: 'After a normal breath the CO2 falls to a flat line near zero and stays there: apnea, a disconnected or blocked sampling line, a dislodged airway — or cardiac arrest. Check the patient first.',
  },
  low_amplitude: {
    label: 'Small breaths',
    description: 'The breaths are much smaller than this patient\'s usual ones: shallow breathing (hypopnoea, small tidal volume) or dilution of the sample at the nose or mouth.',
  },
};

/**
 * Shape findings over a case's breaths (and the flat pauses between them). Each finding groups
 * consecutive breaths of one stretch that meet its criterion; it rests on those breaths and its
 * measure is their median value.
 *
 * @example
 * shapeFindings(breaths, pauses).map((f) => f.kind) //=> ['rebreathing']
 */
export function shapeFindings(breaths: Breath[], pauses: Pause[], options: ShapeFindingOptions = {}): { findings: ShapeFinding[]; referenceAmplitude: number | null } {
  const o = { ...FINDING_DEFAULTS, ...options };
  const amps = breaths.map((b) => b.etco2 - b.baseline);
  const ref = options.referenceAmplitude ?? (amps.length ? median(amps) : null);
  const out: ShapeFinding[] = [];
  const runs = (kind: FindingKind, pick: (b: Breath, i: number) => number | null, threshold: number, above: boolean, minBreaths: number, name: string, unit: string) => {
    let i = 0;
    while (i < breaths.length) {
      const m = pick(breaths[i], i);
      if (m === null || !(above ? m >= threshold : m < threshold)) {
        i++;
        continue;
      }
      const idx = [i];
      const vals = [m];
      let j = i + 1;
      while (j < breaths.length && breaths[j].stretch === breaths[i].stretch) {
        const mj = pick(breaths[j], j);
        if (mj === null || !(above ? mj >= threshold : mj < threshold)) break;
        idx.push(j);
        vals.push(mj);
        j++;
      }
      if (idx.length >= minBreaths) {
        const value = median(vals);
        const margin = Math.abs(value - threshold) / Math.max(Math.abs(threshold), 1e-9);
        const first = breaths[idx[0]];
        const last = breaths[idx[idx.length - 1]];
        const endS = last.inspTimeS !== null ? last.expEndS + last.inspTimeS : last.expEndS;
        out.push({
          kind,
          ...FINDING_TEXT[kind],
          startS: first.expStartS,
          endS,
          durationS: endS - first.expStartS,
          breaths: idx,
          confidence: confidence(margin, idx.length, minBreaths),
          measure: { name, value, threshold, unit },
        });
      }
      i = j;
    }
  };
  runs('rebreathing', (b) => b.inspMin, o.rebreathingMmHg, true, o.rebreathingBreaths, 'inspired CO2', 'mmHg');
  runs('obstructive_upstroke', (b) => b.alphaDeg, o.obstructiveAlphaDeg, true, o.obstructiveBreaths, 'upstroke–plateau angle', '°');
  runs('lost_plateau', (b) => (b.peak - b.baseline > 0 ? (b.peak - b.etco2) / (b.peak - b.baseline) : null), o.lostPlateauFraction, true, o.lostPlateauBreaths, 'plateau fall / peak amplitude', 'fraction');
  runs('plateau_notch', (b) => (b.notchDepth >= o.notchMinMmHg && b.etco2 - b.baseline > 0 ? b.notchDepth / (b.etco2 - b.baseline) : null), o.notchFraction, true, 1, 'notch depth / amplitude', 'fraction');
  if (ref !== null && ref > 0) runs('low_amplitude', (b) => (b.etco2 - b.baseline) / ref, o.lowAmplitudeFraction, false, o.lowAmplitudeBreaths, 'amplitude / reference', 'fraction');
  for (const p of pauses) {
    const d = p.endS - p.startS;
    if (p.prevBreath < 0 || d < o.suddenZeroS || p.maxCo2 > o.suddenZeroMaxMmHg) continue;
    const prev = breaths[p.prevBreath];
    if (ref !== null && prev.etco2 - prev.baseline < 0.5 * ref) continue;
    out.push({
      kind: 'sudden_zero',
      ...FINDING_TEXT.sudden_zero,
      startS: p.startS,
      endS: p.endS,
      durationS: d,
      breaths: [p.prevBreath],
      confidence: confidence((d - o.suddenZeroS) / o.suddenZeroS, 1, 1),
      measure: { name: 'flat line', value: d, threshold: o.suddenZeroS, unit: 's' },
    });
  }
  out.sort((x, y) => x.startS - y.startS || x.kind.localeCompare(y.kind));
  return { findings: out, referenceAmplitude: ref };
}

/** 0.5 at the threshold and the minimum breath count; +0.25 for a margin of 50 %, +0.25 for twice the breaths. */
function confidence(margin: number, n: number, minBreaths: number): number {
  const c = 0.5 + 0.25 * Math.min(1, margin / 0.5) + 0.25 * Math.min(1, (n - minBreaths) / minBreaths);
  return Math.round(c * 100) / 100;
}

function median(xs: number[]): number {
  const s = [...xs].sort((p, q) => p - q);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}
