import { describe, expect, it } from 'vitest';
import {
  DEMO_PROCEDURALISTS,
  DEMO_ROOMS,
  DEMO_STAFF,
  DEMO_UNIT,
  ageOn,
  createRng,
  generateDemoCase,
  generateDemoUnit,
  procedureType,
  wallTimeAt,
  type DemoCase,
  type DemoUnit,
} from '@/lib/demo';
import { isoWeekday, localDateOf } from '@/lib/demo/zonedTime';
import { measure, share } from './_helpers';

// A Wednesday in Irish Summer Time; six months back crosses the March clock change.
const NOW = '2026-05-13T11:45:00Z';
const TODAY = '2026-05-13';
const zone = DEMO_UNIT.timeZone;
const localDate = (c: DemoCase) => localDateOf(Date.parse(c.record.case.start), zone);
const localMin = (c: DemoCase) => {
  const w = wallTimeAt(Date.parse(c.record.case.start), zone);
  return w.hour * 60 + w.minute;
};
const evT = (c: DemoCase, kind: string) => c.record.events.find((e) => e.kind === kind)?.t ?? NaN;

// The seed the database seed script uses, and one other.
const units: [string, DemoUnit][] = [20260301, 7].map((seed) => [`seed ${seed}`, generateDemoUnit({ seed, now: NOW, months: 6, cases: 400 })]);

describe('the generated demo unit', () => {
  it('is the same byte for byte for the same options, and differs for another seed', () => {
    const a = generateDemoUnit({ seed: 'same', now: NOW, cases: 40 });
    const b = generateDemoUnit({ seed: 'same', now: NOW, cases: 40 });
    expect(JSON.stringify(a)).toBe(JSON.stringify(b));
    const c = generateDemoUnit({ seed: 'other', now: NOW, cases: 40 });
    expect(JSON.stringify(c.cases)).not.toBe(JSON.stringify(a.cases));
    expect(c.patients.map((p) => p.displayName)).not.toEqual(a.patients.map((p) => p.displayName));
  });

  it('generates each case from its own stream: a longer list today leaves every past case untouched', () => {
    const short = generateDemoUnit({ seed: 3, now: NOW, cases: 30, todayCases: 4 });
    const long = generateDemoUnit({ seed: 3, now: NOW, cases: 30, todayCases: 12 });
    const past = (u: DemoUnit) => u.cases.filter((c) => localDate(c) < TODAY);
    expect(past(long)).toEqual(past(short));
    // And a case is exactly what generateDemoCase makes from the stream `case:<key>`.
    const c = short.cases[7];
    const patient = short.patients.find((p) => p.mrn === c.patientMrn)!;
    const again = generateDemoCase(createRng(3).fork(`case:${c.key}`), {
      key: c.key, start: c.record.case.start, patient, procedureId: c.procedureId, roomId: c.roomId,
      proceduralistId: c.proceduralistId, nurseUsername: c.nurseUsername, now: NOW,
    });
    expect(again).toEqual(c);
  });

  it('refuses a "now" that is not an instant, and a history with no working day', () => {
    expect(() => generateDemoUnit({ seed: 1, now: 'yesterday' })).toThrow(/now is not an ISO instant/);
    expect(() => generateDemoUnit({ seed: 1, now: NOW, months: 0, cases: 5 })).toThrow(/no working day/);
    expect(generateDemoUnit({ seed: 1, now: NOW, months: 0, cases: 0 }).cases.every((c) => localDate(c) === TODAY)).toBe(true);
  });
});

describe("today's list at any hour", () => {
  it('fills all four rooms within 08:00–17:00, and from 09:00 to 16:00 always has a case under way', () => {
    for (const seed of [1, 2, 3]) {
      for (const hhmm of ['07:30', '09:00', '10:20', '12:45', '14:10', '16:00', '18:30']) {
        const now = new Date(Date.parse(`2026-05-13T${hhmm}:00+01:00`)).toISOString();
        const u = generateDemoUnit({ seed, now, cases: 0 });
        expect(new Set(u.cases.map((c) => c.roomId)).size).toBe(4);
        const byRoom = new Map<string, [number, number][]>();
        for (const c of u.cases) {
          const a = localMin(c);
          const b = a + procedureType(c.procedureId).slotMin;
          expect(a).toBeGreaterThanOrEqual(8 * 60);
          expect(b).toBeLessThanOrEqual(17 * 60);
          byRoom.set(c.roomId, [...(byRoom.get(c.roomId) ?? []), [a, b]]);
        }
        for (const xs of byRoom.values()) for (let i = 1; i < xs.length; i++) expect(xs[i][0]).toBeGreaterThanOrEqual(xs[i - 1][1]);
        const statuses = u.cases.map((c) => c.status);
        if (hhmm === '07:30') expect(statuses.every((x) => x === 'draft')).toBe(true);
        if (hhmm >= '09:00' && hhmm <= '16:00') expect(statuses).toContain('in_progress');
        // After hours the statuses are judged at 15:30, so the demo still has open cases to chart.
        if (hhmm === '18:30') {
          expect(statuses).toContain('signed');
          expect(statuses.some((x) => x !== 'signed')).toBe(true);
        }
      }
    }
  });
});

describe.each(units)('the demo unit, %s', (_name, u) => {
  const past = u.cases.filter((c) => localDate(c) < TODAY);
  const today = u.cases.filter((c) => localDate(c) === TODAY);

  it('returns the unit, its people, formulary, procedures, patients and 400 past cases keyed demo-0001… in order of start', () => {
    expect(Object.keys(u).sort()).toEqual(['cases', 'formulary', 'patients', 'proceduralists', 'procedures', 'rooms', 'staff', 'unit']);
    expect(past).toHaveLength(400);
    expect(u.cases.length).toBe(past.length + today.length);
    u.cases.forEach((c, i) => expect(c.key).toBe(`demo-${String(i + 1).padStart(4, '0')}`));
    for (let i = 1; i < u.cases.length; i++) expect(u.cases[i].record.case.start >= u.cases[i - 1].record.case.start).toBe(true);
  });

  it('books past cases on working days between 08:00 and 17:00 local time, within the last six months', () => {
    for (const c of past) {
      expect(isoWeekday(localDate(c))).toBeLessThanOrEqual(5);
      expect(localDate(c) >= '2025-11-13').toBe(true);
      expect(localMin(c)).toBeGreaterThanOrEqual(8 * 60);
      expect(localMin(c) + procedureType(c.procedureId).slotMin).toBeLessThanOrEqual(17 * 60);
    }
    // Both sides of the clock change are there, and 08:00 stays 08:00 local on both.
    expect(past.some((c) => c.record.case.start < '2026-03-29')).toBe(true);
    expect(past.some((c) => c.record.case.start > '2026-03-30')).toBe(true);
  });

  it('never has two patients in one room at once, and puts each case in a room and with a proceduralist equipped for it', () => {
    const byRoom = new Map<string, DemoCase[]>();
    for (const c of u.cases) byRoom.set(c.roomId, [...(byRoom.get(c.roomId) ?? []), c]);
    for (const list of byRoom.values()) {
      for (let i = 1; i < list.length; i++) {
        const prev = list[i - 1];
        const prevEnd = Date.parse(prev.record.case.start) + procedureType(prev.procedureId).slotMin * 60_000;
        expect(Date.parse(list[i].record.case.start)).toBeGreaterThanOrEqual(prevEnd);
      }
    }
    for (const c of u.cases) {
      expect(DEMO_ROOMS.find((r) => r.id === c.roomId)!.procedures).toContain(c.procedureId);
      expect(DEMO_PROCEDURALISTS.find((p) => p.id === c.proceduralistId)!.procedures).toContain(c.procedureId);
      expect(DEMO_STAFF.find((s) => s.username === c.nurseUsername)?.sedates).toBe(true);
    }
    // One sedation nurse per room and day; nobody in two rooms on the same day.
    const nurseDay = new Map<string, string>();
    for (const c of u.cases) {
      const k = `${localDate(c)}|${c.nurseUsername}`;
      expect(nurseDay.get(k) ?? c.roomId).toBe(c.roomId);
      nurseDay.set(k, c.roomId);
    }
  });

  it('has signed every past case, and today shows what is done, under way and still to come', () => {
    const nowMs = Date.parse(NOW);
    for (const c of past) {
      expect(c.status).toBe('signed');
      expect(Date.parse(c.signed!.at)).toBeLessThan(nowMs);
    }
    expect(today.length).toBeGreaterThanOrEqual(8);
    expect(new Set(today.map((c) => c.roomId)).size).toBe(4);
    for (const c of today) {
      const startMs = Date.parse(c.record.case.start);
      if (startMs > nowMs) {
        expect(c.status).toBe('draft');
        expect(c.record.series).toEqual([]);
        expect(c.record.case.weightKg).toBeGreaterThan(0);
      } else if (c.status === 'in_progress') {
        for (const s of c.record.series) expect(startMs + s.t[s.t.length - 1] * 1000).toBeLessThanOrEqual(nowMs);
        expect(c.signed).toBeNull();
      } else {
        expect(c.status).toBe('signed');
      }
    }
    const statuses = new Set(today.map((c) => c.status));
    expect(statuses).toContain('draft');
    expect(statuses).toContain('in_progress');
  });

  it('brings some patients back: 10–30 % of past cases are a repeat visit, never twice on one day', () => {
    const mrns = new Set(u.patients.map((p) => p.mrn));
    for (const c of u.cases) expect(mrns.has(c.patientMrn)).toBe(true);
    for (const p of u.patients) expect(p.mrn).toMatch(/^KBD-\d{6}$/);
    const seen = new Set<string>();
    let repeats = 0;
    const visitDays = new Set<string>();
    for (const c of past) {
      if (seen.has(c.patientMrn)) repeats++;
      seen.add(c.patientMrn);
      const k = `${c.patientMrn}|${localDate(c)}`;
      expect(visitDays.has(k)).toBe(false);
      visitDays.add(k);
    }
    expect(repeats / past.length).toBeGreaterThanOrEqual(0.1);
    expect(repeats / past.length).toBeLessThanOrEqual(0.3);
    for (const c of u.cases) {
      const p = u.patients.find((x) => x.mrn === c.patientMrn)!;
      expect(c.assessment.ageYears).toBe(ageOn(p.birthDate, c.record.case.start.slice(0, 10)));
      expect(c.assessment.ageYears).toBeGreaterThanOrEqual(18);
      expect(c.assessment.sex).toBe(p.sex);
    }
  });

  // The ranges below are the demo's own invented targets (docs/demo.md), wide enough for any seed.
  it('has the documented procedure, ASA and regimen mix', () => {
    const proc = (id: string) => share(past, (c) => c.procedureId === id);
    expect(proc('gastroscopy')).toBeGreaterThanOrEqual(0.22);
    expect(proc('gastroscopy')).toBeLessThanOrEqual(0.38);
    expect(proc('colonoscopy')).toBeGreaterThanOrEqual(0.27);
    expect(proc('colonoscopy')).toBeLessThanOrEqual(0.43);
    expect(proc('ercp')).toBeGreaterThanOrEqual(0.04);
    expect(proc('ercp')).toBeLessThanOrEqual(0.13);
    expect(proc('eus')).toBeGreaterThanOrEqual(0.05);
    expect(proc('eus')).toBeLessThanOrEqual(0.15);
    expect(proc('bronchoscopy')).toBeGreaterThanOrEqual(0.11);
    expect(proc('bronchoscopy')).toBeLessThanOrEqual(0.23);

    const asa = (n: string) => share(past, (c) => c.assessment.asaClass.replace(/E$/, '') === n);
    expect(asa('I')).toBeGreaterThanOrEqual(0.15);
    expect(asa('I')).toBeLessThanOrEqual(0.32);
    expect(asa('II')).toBeGreaterThanOrEqual(0.38);
    expect(asa('II')).toBeLessThanOrEqual(0.58);
    expect(asa('III')).toBeGreaterThanOrEqual(0.15);
    expect(asa('III')).toBeLessThanOrEqual(0.32);
    expect(asa('IV')).toBeGreaterThanOrEqual(0.02);
    expect(asa('IV')).toBeLessThanOrEqual(0.1);
    expect(share(past, (c) => c.assessment.asaClass.endsWith('E'))).toBeLessThanOrEqual(0.04);

    const reg = (r: string) => share(past, (c) => c.regimen === r);
    expect(reg('propofol')).toBeGreaterThanOrEqual(0.33);
    expect(reg('propofol')).toBeLessThanOrEqual(0.5);
    expect(reg('propofol_fentanyl')).toBeGreaterThanOrEqual(0.2);
    expect(reg('propofol_fentanyl')).toBeLessThanOrEqual(0.35);
    expect(reg('midazolam_fentanyl')).toBeGreaterThanOrEqual(0.2);
    expect(reg('midazolam_fentanyl')).toBeLessThanOrEqual(0.36);
    expect(reg('ketamine')).toBeGreaterThanOrEqual(0.01);
    expect(reg('ketamine')).toBeLessThanOrEqual(0.07);
  });

  it('has a plausible patient mix: BMI, STOP-Bang, airway and the kPa display', () => {
    expect(share(past, (c) => c.assessment.bmi > 35)).toBeGreaterThanOrEqual(0.05);
    expect(share(past, (c) => c.assessment.bmi > 35)).toBeLessThanOrEqual(0.2);
    for (const c of past) {
      const a = c.assessment;
      expect(a.bmi).toBeGreaterThan(15);
      expect(a.bmi).toBeLessThan(60);
      expect(a.heightCm).toBeGreaterThanOrEqual(a.sex === 'female' ? 145 : 155);
      expect(a.stopBang.bmiOver35).toBe(a.bmi > 35 || (a.bmi === 35 && a.weightKg / (a.heightCm / 100) ** 2 > 35));
      expect(a.stopBang.male).toBe(a.sex === 'male');
      expect(a.fasting.clearFluidsH).toBeLessThanOrEqual(a.fasting.solidsH);
    }
    // STOP-Bang rises with BMI: the obese score higher on average.
    const meanScore = (xs: DemoCase[]) => xs.reduce((s, c) => s + c.assessment.stopBang.score, 0) / xs.length;
    expect(meanScore(past.filter((c) => c.assessment.bmi > 32))).toBeGreaterThan(meanScore(past.filter((c) => c.assessment.bmi < 25)) + 1);
    expect(share(past, (c) => c.assessment.mallampati === 'III' || c.assessment.mallampati === 'IV')).toBeGreaterThanOrEqual(0.15);
    expect(share(past, (c) => c.assessment.mallampati === 'III' || c.assessment.mallampati === 'IV')).toBeLessThanOrEqual(0.45);
    expect(share(past, (c) => c.record.case.etco2Unit === 'kPa')).toBeGreaterThanOrEqual(0.05);
    expect(share(past, (c) => c.record.case.etco2Unit === 'kPa')).toBeLessThanOrEqual(0.16);
  });

  it('has respiratory events at the documented rates, serious ones rare', () => {
    const m = new Map(past.map((c) => [c.key, measure(c)]));
    const rate = (xs: DemoCase[], pred: (x: ReturnType<typeof measure>) => boolean) => share(xs, (c) => pred(m.get(c.key)!));
    const propofol = past.filter((c) => c.regimen === 'propofol' || c.regimen === 'propofol_fentanyl');
    const midazolam = past.filter((c) => c.regimen === 'midazolam_fentanyl');
    // An apnea-like run: EtCO2 < 5 mmHg for ≥ 20 s (this includes the odd line disconnection).
    expect(rate(propofol, (x) => x.apneaS >= 20)).toBeGreaterThanOrEqual(0.15);
    expect(rate(propofol, (x) => x.apneaS >= 20)).toBeLessThanOrEqual(0.35);
    expect(rate(midazolam, (x) => x.apneaS >= 20)).toBeGreaterThanOrEqual(0.02);
    expect(rate(midazolam, (x) => x.apneaS >= 20)).toBeLessThanOrEqual(0.18);
    expect(rate(midazolam, (x) => x.apneaS >= 20)).toBeLessThan(rate(propofol, (x) => x.apneaS >= 20));
    expect(rate(past, (x) => x.hypoventilationS > 30)).toBeGreaterThanOrEqual(0.04);
    expect(rate(past, (x) => x.hypoventilationS > 30)).toBeLessThanOrEqual(0.16);
    expect(rate(past, (x) => x.bradypneaS >= 30)).toBeGreaterThanOrEqual(0.03);
    expect(rate(past, (x) => x.bradypneaS >= 30)).toBeLessThanOrEqual(0.14);
    expect(rate(past, (x) => x.below90S >= 15)).toBeGreaterThanOrEqual(0.05);
    expect(rate(past, (x) => x.below90S >= 15)).toBeLessThanOrEqual(0.16);
    expect(rate(past, (x) => x.minSpo2 < 85)).toBeGreaterThanOrEqual(0.005);
    expect(rate(past, (x) => x.minSpo2 < 85)).toBeLessThanOrEqual(0.05);
    expect(rate(past, (x) => x.minSpo2 < 75)).toBeLessThanOrEqual(0.015);
    expect(rate(past, (x) => x.apneaS >= 60)).toBeLessThanOrEqual(0.04);
    // Serious (Mason et al. 2012 thresholds): prolonged apnea, SpO2 < 90 % for ≥ 60 s, or < 75 %.
    expect(rate(past, (x) => x.apneaS >= 60 || x.below90S >= 60 || x.minSpo2 < 75)).toBeLessThan(0.05);
    // Artefacts.
    expect(share(past, (c) => c.injected.some((e) => e.kind === 'line_disconnection'))).toBeLessThanOrEqual(0.05);
    expect(share(past, (c) => c.injected.some((e) => e.kind === 'probe_off'))).toBeGreaterThanOrEqual(0.02);
    expect(share(past, (c) => c.injected.some((e) => e.kind === 'probe_off'))).toBeLessThanOrEqual(0.11);
  });

  it('charts interventions in proportion: most cases need none, support is rare, rescue never', () => {
    const kinds = (c: DemoCase) => new Set(c.record.interventions.map((i) => i.kind));
    expect(share(past, (c) => c.record.interventions.length === 0)).toBeGreaterThanOrEqual(0.55);
    expect(share(past, (c) => kinds(c).has('bag_mask'))).toBeLessThanOrEqual(0.03);
    expect(share(past, (c) => kinds(c).has('naloxone') || kinds(c).has('flumazenil'))).toBeLessThanOrEqual(0.02);
    expect(share(past, (c) => kinds(c).has('procedure_stopped'))).toBeLessThanOrEqual(0.01);
    expect(past.some((c) => ['intubation', 'chest_compressions', 'icu_transfer', 'death'].some((k) => kinds(c).has(k as never)))).toBe(false);
    // Doses far above usual happen, but rarely.
    expect(share(past, (c) => c.record.doses.some((d) => u.formulary.find((f) => f.drug === d.drug)!.cautionAbove < d.amount))).toBeLessThanOrEqual(0.03);
  });

  it('keeps the monitor record in the size the brief expects (about 400 cases × 40 min × 4 channels)', () => {
    const samples = past.reduce((s, c) => s + c.record.series.reduce((k, x) => k + x.t.length, 0), 0);
    expect(samples).toBeGreaterThan(400 * 20 * 60 * 4);
    expect(samples).toBeLessThan(400 * 60 * 60 * 4);
    const minutes = past.map((c) => evT(c, 'recovery_start') / 60);
    expect(Math.min(...minutes)).toBeGreaterThan(10);
  });
});
