import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { CHANNEL_SPECS } from '@/lib/domain/channel';
import { INTERVENTION_KINDS } from '@/lib/domain/intervention';
import { isSedativeDrug } from '@/lib/domain/drug';
import {
  DEMO_FORMULARY,
  PROCEDURE_IDS,
  REGIMENS,
  createRng,
  generateDemoCase,
  generateDemoPatient,
  procedureType,
  type DemoCase,
  type DemoCaseParams,
  type ProcedureId,
  type Regimen,
} from '@/lib/demo';
import { channel, runs } from './_helpers';

function paramsFor(seed: number, procedureId: ProcedureId = 'colonoscopy', extra: Partial<DemoCaseParams> = {}): DemoCaseParams {
  const patient = generateDemoPatient(createRng(seed).fork('patient'), { index: seed, mrnPrefix: 'KBD', referenceDate: '2026-03-04' });
  return { key: `t-${seed}`, start: '2026-03-02T09:00:00Z', patient, procedureId, roomId: 'room-1', proceduralistId: 'dr-aldous', nurseUsername: 'nurse.ada', ...extra };
}
const gen = (seed: number, procedureId?: ProcedureId, extra?: Partial<DemoCaseParams>) => generateDemoCase(createRng(seed).fork('case'), paramsFor(seed, procedureId, extra));
const ev = (c: DemoCase, kind: string) => c.record.events.find((e) => e.kind === kind)?.t ?? NaN;

/** Everything a complete generated case must satisfy (rules.md §1 and the demo's own model). */
function checkCompleteCase(c: DemoCase) {
  const r = c.record;
  // Series: the four monitor channels, strictly increasing times, values in the accepted ranges.
  expect(r.series.map((s) => s.channel)).toEqual(['etco2', 'rr', 'spo2', 'hr']);
  for (const s of r.series) {
    expect(s.source).toBe('monitor');
    expect(s.unit).toBe(CHANNEL_SPECS[s.channel].units[0]);
    expect(s.t.length).toBe(s.v.length);
    if (s.probeOff) expect(s.probeOff.length).toBe(s.t.length);
    for (let i = 1; i < s.t.length; i++) if (!(s.t[i] > s.t[i - 1])) throw new Error(`${c.key} ${s.channel}: t[${i}] not increasing`);
    const { min, max } = CHANNEL_SPECS[s.channel];
    for (const v of s.v) if (!(Number.isFinite(v) && v >= min && v <= max)) throw new Error(`${c.key} ${s.channel}: ${v} out of range`);
  }
  const e = channel(c, 'etco2');
  const recovery = ev(c, 'recovery_start');
  expect(e.t[0]).toBe(0);
  expect(e.t[e.t.length - 1]).toBe(recovery);
  // Events in clinical order.
  const order = ['sedation_start', 'procedure_start', 'procedure_end', 'sedation_end', 'recovery_start', 'discharge'].map((k) => ev(c, k));
  for (let i = 1; i < order.length; i++) expect(order[i]).toBeGreaterThanOrEqual(order[i - 1]);
  expect(ev(c, 'procedure_start')).toBeGreaterThan(ev(c, 'sedation_start'));
  expect(ev(c, 'recovery_start')).toBeGreaterThan(ev(c, 'sedation_end'));
  // The room is freed within the booked slot.
  expect(recovery).toBeLessThanOrEqual(procedureType(c.procedureId).slotMin * 60);
  // Doses: formulary drugs in the formulary's unit, route and class; the first sedative dose starts sedation.
  for (const d of r.doses) {
    const f = DEMO_FORMULARY.find((x) => x.drug === d.drug);
    expect(f, d.drug).toBeDefined();
    expect([d.unit, d.route, d.drugClass]).toEqual([f!.unit, f!.route, f!.drugClass]);
    expect(d.amount).toBeGreaterThan(0);
    expect(d.t).toBeGreaterThanOrEqual(ev(c, 'sedation_start'));
    expect(d.t).toBeLessThanOrEqual(recovery);
  }
  const firstSedative = r.doses.find((d) => isSedativeDrug(d.drug, d.drugClass));
  expect(firstSedative?.t).toBe(ev(c, 'sedation_start'));
  // A full baseline window (rules.md §3): ≥ 120 s of monitoring before the first sedative dose.
  expect(firstSedative!.t).toBeGreaterThanOrEqual(150);
  // Interventions: known kinds, while the patient is monitored.
  for (const i of r.interventions) {
    expect(INTERVENTION_KINDS).toContain(i.kind);
    expect(i.t).toBeGreaterThanOrEqual(ev(c, 'sedation_start'));
    expect(i.t).toBeLessThanOrEqual(recovery);
  }
  // Reversal agents are charted twice: as an intervention and as a dose.
  for (const kind of ['naloxone', 'flumazenil'] as const) {
    expect(r.doses.filter((d) => d.drug === kind).length).toBe(r.interventions.filter((i) => i.kind === kind).length);
  }
  // Manual vitals every 3–5 min, plausible pressures.
  c.manualVitals.forEach((v, i) => {
    if (i > 0) expect(v.t - c.manualVitals[i - 1].t).toBeGreaterThanOrEqual(180);
    if (i > 0) expect(v.t - c.manualVitals[i - 1].t).toBeLessThanOrEqual(300);
    expect(v.sbp).toBeGreaterThan(70);
    expect(v.sbp).toBeLessThan(230);
    expect(v.dbp).toBeLessThan(v.sbp);
    expect(v.hr).toBeGreaterThan(30);
  });
  // Aldrete: from recovery start until ≥ 9, items 0–2, discharge after the last score.
  expect(c.aldrete[0].t).toBe(recovery);
  c.aldrete.forEach((a, i) => {
    for (const x of [a.activity, a.respiration, a.circulation, a.consciousness, a.spo2]) expect([0, 1, 2]).toContain(x);
    expect(a.total).toBe(a.activity + a.respiration + a.circulation + a.consciousness + a.spo2);
    if (i < c.aldrete.length - 1) expect(a.total).toBeLessThan(9);
  });
  expect(c.aldrete[c.aldrete.length - 1].total).toBeGreaterThanOrEqual(9);
  expect(ev(c, 'discharge')).toBeGreaterThan(c.aldrete[c.aldrete.length - 1].t);
  // Facts copied into the record.
  expect(r.case).toMatchObject({ weightKg: c.assessment.weightKg, heightCm: c.assessment.heightCm, asaClass: c.assessment.asaClass, procedure: c.procedureId });
  expect(['mmHg', 'kPa']).toContain(r.case.etco2Unit);
}

describe('one generated case', () => {
  it('comes out identical from the same stream and different from another', () => {
    expect(gen(11)).toEqual(gen(11));
    expect(JSON.stringify(gen(11).record.series)).not.toBe(JSON.stringify(gen(12).record.series));
  });

  it('holds every invariant for any seed, procedure and regimen', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1_000_000 }), fc.constantFrom(...PROCEDURE_IDS), fc.constantFrom<Regimen | undefined>(undefined, ...REGIMENS), (seed, proc, regimen) => {
        const c = gen(seed, proc, { regimen });
        if (regimen) expect(c.regimen).toBe(regimen);
        checkCompleteCase(c);
        expect(c.status).toBe('signed');
        expect(c.signed?.by).toBe('nurse.ada');
        expect(Date.parse(c.signed!.at)).toBeGreaterThan(Date.parse(c.record.case.start) + ev(c, 'discharge') * 1000);
      }),
      { numRuns: 60 },
    );
  });

  it('starts from a calm baseline: EtCO2 33–42, RR 10–20, SpO2 95–100 before the first dose', () => {
    for (let seed = 1; seed <= 40; seed++) {
      const c = gen(seed);
      const first = ev(c, 'sedation_start');
      const median = (ch: 'etco2' | 'rr' | 'spo2') => {
        const s = channel(c, ch);
        const xs = s.v.filter((_, i) => s.t[i] < first && s.t[i] >= first - 120).sort((a, b) => a - b);
        return xs[Math.floor(xs.length / 2)];
      };
      expect(median('etco2')).toBeGreaterThanOrEqual(31);
      expect(median('etco2')).toBeLessThanOrEqual(44);
      expect(median('rr')).toBeGreaterThanOrEqual(9);
      expect(median('rr')).toBeLessThanOrEqual(21);
      expect(median('spo2')).toBeGreaterThanOrEqual(95);
    }
  });

  it('doses like the unit does: propofol 20–100 mg boluses (rarely more) then 10–30 mg top-ups; midazolam ≤ 2 mg; fentanyl 25–100 mcg', () => {
    for (let seed = 1; seed <= 60; seed++) {
      const c = gen(seed, 'colonoscopy');
      const prop = c.record.doses.filter((d) => d.drug === 'propofol');
      if (prop.length) {
        expect(prop[0].amount >= 20 && (prop[0].amount <= 100 || [120, 130, 150].includes(prop[0].amount))).toBe(true);
        for (const d of prop.slice(1)) expect([10, 20, 30]).toContain(d.amount);
        for (let i = 2; i < prop.length; i++) expect(prop[i].t - prop[i - 1].t).toBeGreaterThanOrEqual(60);
      }
      for (const d of c.record.doses.filter((x) => x.drug === 'midazolam')) expect(d.amount).toBeLessThanOrEqual(2);
      for (const d of c.record.doses.filter((x) => x.drug === 'fentanyl')) expect(d.amount >= 25 && d.amount <= 100).toBe(true);
    }
  });

  it('draws what it says it injected: the series show each event exactly where the ground truth puts it', () => {
    let checked = 0;
    for (let seed = 1; seed <= 400 && checked < 60; seed++) {
      const c = gen(seed, seed % 2 ? 'ercp' : 'gastroscopy', { regimen: 'propofol' });
      const e = channel(c, 'etco2');
      const r = channel(c, 'rr');
      const o = channel(c, 'spo2');
      const at = (s: typeof e, t: number) => s.v[s.t.indexOf(t)];
      for (const x of c.injected) {
        checked++;
        const inside = Array.from({ length: x.end - x.start }, (_, k) => x.start + k);
        switch (x.kind) {
          case 'apnea': {
            expect(inside.every((t) => at(e, t) < 5 && at(r, t) === 0)).toBe(true);
            expect(at(e, x.start - 1)).toBeGreaterThanOrEqual(5);
            expect(at(e, x.end)).toBeGreaterThanOrEqual(5);
            // rules.md §5: abrupt = EtCO2 ≥ 25 mmHg at most 5 s before the first value < 5.
            const before = [1, 2, 3, 4, 5].map((k) => at(e, x.start - k));
            expect(before.some((v) => v >= 25)).toBe(x.onsetAbrupt);
            break;
          }
          case 'desaturation':
            expect(inside.every((t) => at(o, t) < 90)).toBe(true);
            expect(at(o, x.start - 1)).toBeGreaterThanOrEqual(90);
            expect(at(o, x.end)).toBeGreaterThanOrEqual(90);
            expect(Math.min(...inside.map((t) => at(o, t)))).toBe(x.value);
            break;
          case 'hypoventilation':
            expect(inside.every((t) => at(e, t) >= 50)).toBe(true);
            expect(at(e, x.start - 1)).toBeLessThan(50);
            expect(at(e, x.end)).toBeLessThan(50);
            break;
          case 'bradypnea':
            expect(inside.every((t) => at(r, t) >= 3 && at(r, t) <= 7)).toBe(true);
            break;
          case 'line_disconnection':
            // Abrupt: from a normal value to zero within 2 s, SpO2 unaffected.
            expect(at(e, x.start - 1)).toBeGreaterThanOrEqual(25);
            expect(inside.slice(1).every((t) => at(e, t) === 0)).toBe(true);
            expect(inside.every((t) => at(o, t) === undefined || at(o, t) >= 90)).toBe(true);
            break;
          case 'probe_off':
            if (x.mode === 'gap') expect(inside.every((t) => !o.t.includes(t))).toBe(true);
            else expect(inside.every((t) => at(o, t) === 0 && o.probeOff![o.t.indexOf(t)])).toBe(true);
            break;
        }
      }
    }
    expect(checked).toBeGreaterThan(20);
  });

  it('follows an apnea with a desaturation 30–60 s after its onset, and the nurse acts 5–40 s into the apnea', () => {
    let desats = 0;
    let manoeuvres = 0;
    for (let seed = 1; seed <= 600; seed++) {
      const c = gen(seed, 'ercp', { regimen: 'propofol_fentanyl' });
      for (const a of c.injected.filter((x) => x.kind === 'apnea')) {
        const d = c.injected.find((x) => x.kind === 'desaturation' && x.start > a.start && x.start - a.start <= 60);
        if (d) {
          desats++;
          expect(d.start - a.start).toBeGreaterThanOrEqual(30);
        }
        const window = c.record.interventions.filter((i) => i.t >= a.start && i.t <= a.end + 60);
        if (window.length) expect(window[0].t - a.start).toBeGreaterThanOrEqual(3);
        // With a desaturation the first manoeuvre may answer the falling SpO2 instead.
        const airway = window.filter((i) => ['stimulation', 'chin_lift', 'jaw_thrust'].includes(i.kind));
        if (airway.length && !d) {
          manoeuvres++;
          expect(airway[0].t - a.start).toBeGreaterThanOrEqual(5);
          expect(airway[0].t - a.start).toBeLessThanOrEqual(40);
        }
      }
    }
    expect(desats).toBeGreaterThan(10);
    expect(manoeuvres).toBeGreaterThan(50);
  });

  it('shows a sampling-line disconnection as EtCO2 falling to zero within 2 s', () => {
    let seen = 0;
    for (let seed = 1; seed <= 800 && seen < 5; seed++) {
      const c = gen(seed, 'gastroscopy');
      const x = c.injected.find((i) => i.kind === 'line_disconnection');
      if (!x) continue;
      seen++;
      const e = channel(c, 'etco2');
      expect(e.v[x.start - 1]).toBeGreaterThanOrEqual(25);
      expect(e.v[x.start + 1]).toBe(0);
      expect(runs(e.t, e.v, (v) => v < 5).some(([s]) => s === x.start || s === x.start + 1)).toBe(true);
    }
    expect(seen).toBe(5);
  });
});

describe('a case seen before it is finished', () => {
  const start = '2026-03-04T10:00:00Z';
  const full = gen(5, 'colonoscopy', { start });
  const at = (s: number) => new Date(Date.parse(start) + s * 1000).toISOString();

  it('is a draft with its facts but no data before its start', () => {
    const c = gen(5, 'colonoscopy', { start, now: at(-600) });
    expect(c.status).toBe('draft');
    expect(c.signed).toBeNull();
    expect(c.record.case).toEqual(full.record.case);
    expect(c.assessment).toEqual(full.assessment);
    expect([c.record.series.length, c.record.doses.length, c.record.events.length, c.manualVitals.length, c.aldrete.length]).toEqual([0, 0, 0, 0, 0]);
  });

  it('is in progress with exactly the data charted up to now, the same data the finished case has', () => {
    const nowS = ev(full, 'procedure_start') + 300;
    const c = gen(5, 'colonoscopy', { start, now: at(nowS) });
    expect(c.status).toBe('in_progress');
    for (const s of c.record.series) {
      const f = full.record.series.find((x) => x.channel === s.channel)!;
      expect(s.t[s.t.length - 1]).toBeLessThanOrEqual(nowS);
      expect(s.v).toEqual(f.v.slice(0, s.v.length));
    }
    expect(c.record.events.map((e) => e.kind)).toEqual(['sedation_start', 'procedure_start']);
    expect(c.record.doses).toEqual(full.record.doses.filter((d) => d.t <= nowS));
  });

  it('stays in progress in recovery with the full monitor record, and is signed after discharge', () => {
    const inRecovery = gen(5, 'colonoscopy', { start, now: at(ev(full, 'recovery_start') + 60) });
    expect(inRecovery.status).toBe('in_progress');
    expect(inRecovery.record.series).toEqual(full.record.series);
    expect(inRecovery.record.events.some((e) => e.kind === 'discharge')).toBe(false);
    const later = gen(5, 'colonoscopy', { start, now: at(ev(full, 'discharge') + 7200) });
    expect(later).toEqual(full);
  });
});
