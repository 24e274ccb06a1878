import { describe, expect, it } from 'vitest';
import type { CaseRecord } from '@/lib/domain/caseRecord';
import { MMHG_PER_KPA } from '@/lib/domain/channel';
import { composed, gapsCase, kpaCase, manyEpisodesCase, quietCase } from '@/tests/fixtures/notes/cases';
import type { CaseNote } from '@/lib/note/types';

/** Lines of the note's text that start with `prefix`. */
function linesStarting(note: CaseNote, prefix: string): string[] {
  return note.text.split('\n').filter((l) => l.startsWith(prefix));
}

/** Clock time of a case second, computed here without the note's helpers (Dublin = UTC in March). */
function utcClock(t: number): string {
  return new Date(Date.parse('2026-03-02T09:00:00Z') + t * 1000).toISOString().slice(11, 19);
}

/** Independent: sum of a drug's doses in `unit` (mass doses converted). */
function totalOf(record: CaseRecord, drug: string, unit: 'mg' | 'mcg'): number {
  const toMcg = { mcg: 1, mg: 1000, g: 1e6 } as Record<string, number>;
  return record.doses.filter((d) => d.drug === drug).reduce((s, d) => s + (d.amount * toMcg[d.unit]) / toMcg[unit], 0);
}

/** Independent: EtCO2 coverage of [from, to] as rules.md §1 defines it (maxHold 30 s), in % with one decimal. */
function coveragePct(t: number[], from: number, to: number, maxHold = 30): number {
  const gaps: number[] = [];
  for (let i = 1; i < t.length; i++) gaps.push(t[i] - t[i - 1]);
  const sorted = [...gaps].sort((a, b) => a - b);
  const median = sorted.length % 2 ? sorted[(sorted.length - 1) / 2] : (sorted[sorted.length / 2 - 1] + sorted[sorted.length / 2]) / 2;
  let covered = 0;
  for (let i = 0; i < t.length; i++) {
    const hold = i + 1 < t.length ? Math.min(t[i + 1] - t[i], maxHold) : Math.min(median, maxHold);
    const a = Math.max(t[i], from);
    const b = Math.min(t[i] + hold, to);
    if (b > a) covered += b - a;
  }
  return Math.round((1000 * covered) / (to - from)) / 10;
}

describe('a quiet case: steady values and one dose', () => {
  const { record, note } = composed(quietCase(), { facts: { signatures: [] } });

  it('says there was no respiratory episode and no intervention, at case level none', () => {
    expect(note.episodes).toEqual([]);
    expect(note.text).toContain('No respiratory episode');
    expect(note.text).toContain('No intervention recorded');
    expect(note.caseLevel).toMatchObject({ level: 'none', majorPhysiology: false, confirmRequest: null, coSignatureNeeded: false });
    expect(note.text).not.toContain('Co-signature required');
    expect(note.text).not.toContain('Major physiology');
  });

  it('totals the one propofol dose and gives it per kg of the recorded 70 kg', () => {
    const perKg = 50 / 70; // 0.714… mg/kg
    expect(note.drugs.totals).toEqual([{ drug: 'propofol', label: 'Propofol', drugClass: 'sedative', doseCount: 1, total: 50, unit: 'mg', perKg: { value: expect.closeTo(perKg, 9), unit: 'mg/kg' } }]);
    expect(note.text).toContain('Total Propofol 50 mg (0.714 mg/kg) in 1 dose');
    expect(note.text).toContain(`${utcClock(record.doses[0].t)} Propofol 50 mg IV`);
  });

  it('reports full capnography over the sedation time and no data gap', () => {
    expect(note.monitoring.capnographyCoveragePct).toBe(100);
    expect(note.monitoring.gaps).toEqual([]);
    expect(note.text).toContain('Capnography coverage 100 % of the sedation time');
    expect(note.text).toContain('No EtCO2 or SpO2 gap longer than 30 s during the sedation time');
    expect(note.times.sedation).toMatchObject({ durationS: 960, startFrom: 'sedation_start', endFrom: 'recovery_start' });
    expect(note.text).toContain('Sedation time 16 min (09:02:20 sedation start to 09:18:20 recovery start)');
  });

  it('says when the note is not signed yet', () => {
    expect(linesStarting(note, 'Not signed')).toHaveLength(1);
  });
});

describe('a case with many episodes', () => {
  const { record, analysis, note } = composed(manyEpisodesCase());

  it('lists every dose with its clock time, in order', () => {
    const doseLines = note.text.split('\n').filter((l) => / IV$/.test(l));
    expect(doseLines).toEqual(record.doses.map((d) => `${utcClock(d.t)} ${d.drug.charAt(0).toUpperCase()}${d.drug.slice(1)} ${d.amount} ${d.unit} IV`));
  });

  it('totals each drug from the record and divides by the 82 kg weight', () => {
    const w = record.case.weightKg as number;
    const propofol = totalOf(record, 'propofol', 'mg'); // 40 + 20 + 20 + 10
    const fentanyl = totalOf(record, 'fentanyl', 'mcg');
    const midazolam = totalOf(record, 'midazolam', 'mg');
    expect([propofol, fentanyl, midazolam]).toEqual([90, 50, 2]);
    const byDrug = Object.fromEntries(note.drugs.totals.map((x) => [x.drug, x]));
    expect(byDrug.propofol).toMatchObject({ total: propofol, unit: 'mg', doseCount: 4, perKg: { value: expect.closeTo(propofol / w, 9), unit: 'mg/kg' } });
    expect(byDrug.fentanyl).toMatchObject({ total: fentanyl, unit: 'mcg', perKg: { value: expect.closeTo(fentanyl / w, 9), unit: 'mcg/kg' } });
    expect(byDrug.midazolam.perKg?.value).toBeCloseTo(midazolam / w, 9);
    // three significant figures: 90/82 = 1.0976 → 1.10 → "1.1"; 50/82 = 0.6098 → "0.61"; 2/82 = 0.02439 → "0.0244"
    expect(note.text).toContain('Total Propofol 90 mg (1.1 mg/kg) in 4 doses');
    expect(note.text).toContain('Total Fentanyl 50 mcg (0.61 mcg/kg) in 1 dose');
    expect(note.text).toContain('Total Midazolam 2 mg (0.0244 mg/kg) in 1 dose');
  });

  it('writes each episode with its rule, clock times, duration, extreme and interventions, as the analysis found them', () => {
    expect(note.episodes.map((e) => [e.rule, e.start.t, e.durationS, e.level])).toEqual(analysis.episodes.map((e) => [e.rule, e.start, e.durationS, e.level]));
    // the fixture's runs: apnea 400–445, hypoxemia 430–470, hypoventilation 900–960, bradypnea 1100–1140, desaturation 1200–1270
    expect(note.episodes.map((e) => [e.rule, e.start.clock, e.end.clock, e.durationS])).toEqual([
      ['apnea', utcClock(400), utcClock(445), 45],
      ['hypoxemia', utcClock(430), utcClock(470), 40],
      ['hypoventilation', utcClock(900), utcClock(960), 60],
      ['bradypnea', utcClock(1100), utcClock(1140), 40],
      ['hypoxemia', utcClock(1200), utcClock(1270), 70],
      ['prolonged_hypoxemia', utcClock(1200), utcClock(1270), 70],
      ['severe_hypoxemia', utcClock(1200), utcClock(1270), 70],
    ]);
    const text = note.text;
    expect(text).toContain('1. Apnea 09:06:40–09:07:25, 45 s');
    expect(text).toContain('   Lowest EtCO2 0 mmHg at 09:06:40; lowest RR 0 /min at 09:06:40');
    expect(text).toContain('   Interventions: Jaw thrust 09:06:55 (corrected); More oxygen 09:07:20 (corrected)');
    expect(text).toContain('   First intervention 15 s after onset');
    expect(text).toContain('3. Hypoventilation 09:15:00–09:16:00, 1 min');
    expect(text).toContain('   Highest EtCO2 52 mmHg at 09:15:00');
    expect(text).toContain('4. Bradypnea 09:18:20–09:19:00, 40 s');
    expect(text).toContain('   Last sedative dose Propofol 10 mg at 09:16:40, 1 min 40 s before onset');
  });

  it('writes one item for the three desaturation rules that share one span', () => {
    expect(note.text).toContain('5–7. Hypoxemia, prolonged hypoxemia, severe hypoxemia 09:20:00–09:21:10, 1 min 10 s');
    expect(note.text).toContain('   Interventions: Bag-mask ventilation 09:20:30 (supported) — two breaths');
    expect(linesStarting(note, '6.')).toEqual([]);
  });

  it('adds the abrupt-onset hint to the apnea only', () => {
    expect(note.episodes.filter((e) => e.abruptOnsetHint !== null).map((e) => e.rule)).toEqual(['apnea']);
    expect(note.text).toContain('   Abrupt onset: may also be a disconnected or blocked sampling line, a dislodged airway, or loss of circulation.');
  });

  it('grades the case supported, asks to confirm the interventions for major physiology and wants a co-signature', () => {
    expect(note.caseLevel).toMatchObject({ level: 'supported', majorPhysiology: true, coSignatureNeeded: true });
    expect(note.caseLevel.confirmRequest).toMatch(/confirm that every intervention given is recorded/);
    expect(note.text).toContain('Supported: bag-mask or other positive-pressure ventilation');
    expect(note.text).toContain(note.caseLevel.confirmRequest as string);
    expect(note.text).toContain('Co-signature required');
  });

  it('gives the lowest SpO2, highest and lowest EtCO2 and lowest RR with their times, found independently in the series', () => {
    const spo2 = record.series.find((s) => s.channel === 'spo2')!;
    const min = Math.min(...spo2.v);
    const at = spo2.t[spo2.v.indexOf(min)];
    expect(note.physiology.lowestSpo2).toEqual({ value: min, unit: '%', at: { t: at, clock: utcClock(at) } });
    expect(note.text).toContain(`Lowest SpO2 ${min} % at ${utcClock(at)}`);
    expect(note.text).toContain('Highest EtCO2 52 mmHg at 09:15:00');
    expect(note.text).toContain('Lowest EtCO2 0 mmHg at 09:06:40');
    expect(note.text).toContain('Lowest RR 0 /min at 09:06:40');
    expect(note.text).toContain('Baseline EtCO2 38 mmHg, SpO2 98 %, RR 14 /min');
  });

  it('carries the times of the case events, recovery scores, discharge, free text, signatures and rule set', () => {
    for (const line of ['Sedation start 09:02:20', 'Procedure start 09:04:00', 'Procedure end 09:25:00', 'Recovery start 09:26:00', 'Discharge 09:55:00']) expect(note.text).toContain(line);
    expect(note.text).toContain('09:30:00 Aldrete 8 (activity 2, respiration 2, circulation 2, consciousness 1, oxygenation 1)');
    expect(note.text).toContain("NURSE'S NOTE\nPatient comfortable throughout.\nEscort present.");
    expect(note.text).toContain('Signed by C. Nurse (nurse), 2 Mar 2026 09:55');
    expect(note.ruleSet).toEqual({ id: 'plateau-default', version: 1 });
    expect(note.text).toContain('Rule set plateau-default version 1');
    expect(note.text.split('\n').at(-1)).toBe(note.caution);
  });
});

describe('a case with data gaps', () => {
  const { record, note } = composed(gapsCase());

  it('lists the EtCO2 and SpO2 stretches without a sample longer than 30 s, taken from the sample times', () => {
    const etco2 = record.series.find((s) => s.channel === 'etco2')!.t;
    const i = etco2.findIndex((t, k) => k > 0 && t - etco2[k - 1] > 30);
    expect([etco2[i - 1], etco2[i]]).toEqual([599, 665]);
    expect(note.monitoring.gaps.map((g) => [g.channel, g.start.t, g.end.t, g.durationS])).toEqual([
      ['etco2', 599, 665, 66],
      ['spo2', 799, 840, 41],
    ]);
    expect(note.text).toContain('EtCO2 data gap 09:09:59–09:11:05, 1 min 6 s');
    expect(note.text).toContain('SpO2 data gap 09:13:19–09:14:00, 41 s');
  });

  it('reports capnography coverage equal to an independent computation over the sedation time', () => {
    const etco2 = record.series.find((s) => s.channel === 'etco2')!.t;
    const expected = coveragePct(etco2, 140, 1400); // (629 − 140 + 1400 − 665) / 1260 = 97.1 %
    expect(expected).toBe(97.1);
    expect(note.monitoring.capnographyCoveragePct).toBe(expected);
    expect(note.text).toContain('Capnography coverage 97.1 % of the sedation time');
  });

  it('says a hypoxemia that ran into the probe-off lasted at least its recorded 20 s', () => {
    expect(note.episodes).toHaveLength(1);
    expect(note.episodes[0]).toMatchObject({ rule: 'hypoxemia', durationS: 20, censoredAt: 'end', level: 'observed' });
    expect(note.text).toContain('1. Hypoxemia 09:13:00–09:13:20, 20 s (duration at least this: data stopped during the episode)');
  });

  it('does not list gaps shorter than a longer maxHold', () => {
    const { note: relaxed } = composed(gapsCase(), { maxHoldS: 60 });
    expect(relaxed.monitoring.gaps.map((g) => g.channel)).toEqual(['etco2']);
    const { note: loose } = composed(gapsCase(), { maxHoldS: 70 });
    expect(loose.monitoring.gaps).toEqual([]);
    expect(loose.text).toContain('No EtCO2 or SpO2 gap longer than 1 min 10 s during the sedation time');
  });

  it('names a channel that was not monitored at all', () => {
    const noSpo2 = gapsCase();
    noSpo2.series = noSpo2.series.filter((s) => s.channel !== 'spo2');
    const { note: n } = composed(noSpo2);
    expect(n.monitoring.notMonitored).toEqual(['spo2']);
    expect(n.text).toContain('SpO2 not monitored');
    expect(n.text).toContain('Lowest SpO2: no reading');
  });
});

describe('a case recorded in kPa, in New York', () => {
  const { record, note } = composed(kpaCase(), { facts: { weightKg: null } , timeZone: 'America/New_York' });

  it('shows EtCO2 in kPa everywhere and never in mmHg', () => {
    expect(note.physiology).toMatchObject({ etco2Unit: 'kPa', baseline: { etco2: 5.1 }, highestEtco2: { value: 6.9, unit: 'kPa' } });
    expect(note.text).toContain('Baseline EtCO2 5.1 kPa, SpO2 97 %, RR 12 /min');
    expect(note.text).toContain('Highest EtCO2 6.9 kPa at 04:10:00');
    expect(note.text).toContain('   Highest EtCO2 6.9 kPa at 04:10:00');
    expect(note.text).not.toContain('mmHg');
  });

  it('found the hypoventilation because 6.9 kPa is at least 50 mmHg (1 kPa = 7.50062 mmHg, references.md)', () => {
    expect(6.9 * 7.50062).toBeGreaterThanOrEqual(50);
    expect(MMHG_PER_KPA).toBeCloseTo(7.50062, 5);
    expect(note.episodes.map((e) => [e.rule, e.start.clock, e.durationS])).toEqual([['hypoventilation', '04:10:00', 40]]);
  });

  it('shows clock times in the unit zone (EST, UTC−5 on 2 March 2026)', () => {
    expect(note.times.caseStart.clock).toBe('04:00:00');
    expect(note.text).toContain('times in America/New_York');
    expect(note.text).toContain('Signed by C. Nurse (nurse), 2 Mar 2026 04:55');
  });

  it('adds mg and mcg of fentanyl in mcg and gives no per-kg figure without a weight', () => {
    expect(record.case.weightKg).toBeNull();
    const fentanyl = note.drugs.totals.find((x) => x.drug === 'fentanyl');
    expect(fentanyl).toMatchObject({ total: 0.05 * 1000 + 25, unit: 'mcg', perKg: null, doseCount: 2 });
    expect(note.text).toContain('Total Fentanyl 75 mcg in 2 doses');
    expect(note.text).toContain('No weight recorded: no per-kg doses');
    expect(note.text).toContain('Weight not recorded, height not recorded');
  });

  it('counts manual readings as spot readings of their channel', () => {
    expect(note.monitoring.channels.find((c) => c.channel === 'hr')).toMatchObject({ source: 'manual', samples: 3 });
    expect(note.text).toContain('HR manual, 3 readings, 04:01:40–04:11:40');
  });
});

/** Every numeric leaf and every string leaf with a digit in the structured note (the text excluded). */
function leaves(note: CaseNote): { numbers: number[]; strings: string[] } {
  const numbers: number[] = [];
  const strings: string[] = [];
  const walk = (x: unknown) => {
    if (typeof x === 'number') numbers.push(x);
    else if (typeof x === 'string') {
      if (/\d/.test(x)) strings.push(x);
    } else if (Array.isArray(x)) x.forEach(walk);
    else if (x !== null && typeof x === 'object') for (const [k, v] of Object.entries(x)) if (k !== 'text') walk(v);
  };
  walk(note);
  return { numbers, strings: strings.sort((a, b) => b.length - a.length) };
}

describe('every number in the text is a value of the structured note', () => {
  const cases = {
    quiet: composed(quietCase()),
    many: composed(manyEpisodesCase()),
    gaps: composed(gapsCase()),
    kpa: composed(kpaCase(), { timeZone: 'America/New_York', facts: { weightKg: null } }),
  };
  for (const [name, { note }] of Object.entries(cases)) {
    it(`holds for the ${name} case: strings with digits (clocks, dates, MRN) are fields, and each remaining number rounds a numeric field`, () => {
      const { numbers, strings } = leaves(note);
      let checked = 0;
      for (const original of note.text.split('\n')) {
        let line = original;
        for (const s of strings) line = line.split(s).join(' ');
        // durations are written "1 h 2 min 5 s": fold them back into seconds before comparing
        line = line.replace(/(?:(\d+) h )?(?:(\d+) min)?(?: ?(\d+) s)?\b/g, (m, h, mi, s) => {
          if (m.trim() === '' || (h === undefined && mi === undefined && s === undefined)) return m;
          if (h === undefined && mi === undefined) return m; // plain "45 s"
          return ` ${Number(h ?? 0) * 3600 + Number(mi ?? 0) * 60 + Number(s ?? 0)} s`;
        });
        for (const match of line.matchAll(/(?<![\w.-])-?\d+(?:\.\d+)?/g)) {
          const token = match[0];
          const decimals = token.includes('.') ? token.split('.')[1].length : 0;
          const tol = 0.5 * 10 ** -decimals + 1e-9;
          const sig = Number(token);
          // per-kg figures use three significant figures: allow that rounding too
          const ok = numbers.some((v) => Math.abs(v - sig) <= tol || (v !== 0 && Math.abs(Number(v.toPrecision(3)) - sig) <= tol));
          expect(ok, `"${token}" in "${original}" is not a field of the note`).toBe(true);
          checked++;
        }
      }
      expect(checked).toBeGreaterThan(10);
    });
  }
});
