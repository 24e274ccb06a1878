import { describe, expect, it } from 'vitest';
import { STOP_BANG_ITEMS, STOP_BANG_SPECS, STOP_ITEMS, stopBang, stopBangFromFacts, StopBangItemsSchema, type StopBangItems } from '@/lib/domain/stopBang';

// Sources (references.md, "Scales and scores"; found):
//   Chung F et al. 2008, Anesthesiology 108:812-21 — the eight yes/no items; BMI > 35 kg/m², age > 50 y,
//     neck circumference > 40 cm, male sex.
//   Chung F et al. 2016, Chest 149:631-8 — 0–2 low, 3–4 intermediate, 5–8 high risk; also high risk with
//     ≥ 2 of the four STOP items plus male sex, or plus BMI > 35 kg/m², or plus a large neck.

const none: StopBangItems = { snoring: false, tired: false, observedApnea: false, pressure: false, bmiOver35: false, ageOver50: false, neckOver40: false, male: false };
const yes = (...keys: (keyof StopBangItems)[]): StopBangItems => ({ ...none, ...Object.fromEntries(keys.map((k) => [k, true])) });

describe('STOP-Bang score and band (Chung 2016, Chest 149:631-8)', () => {
  it('scores one point per "yes": no item is 0, low risk', () => {
    expect(stopBang(none)).toMatchObject({ score: 0, stopScore: 0, band: 'low' });
  });

  it('calls 2 low and 3 intermediate (0–2 low, 3–4 intermediate)', () => {
    expect(stopBang(yes('snoring', 'ageOver50'))).toMatchObject({ score: 2, band: 'low' });
    expect(stopBang(yes('snoring', 'ageOver50', 'pressure'))).toMatchObject({ score: 3, stopScore: 2, band: 'intermediate' });
  });

  it('calls 3 and 4 intermediate when the extra rule does not apply (1 STOP item, or 2 with age only)', () => {
    expect(stopBang(yes('snoring', 'ageOver50', 'male')).band).toBe('intermediate');
    expect(stopBang(yes('snoring', 'ageOver50', 'male', 'bmiOver35')).band).toBe('intermediate');
    expect(stopBang(yes('snoring', 'tired', 'ageOver50'))).toMatchObject({ score: 3, stopScore: 2, band: 'intermediate' });
    expect(stopBang(yes('snoring', 'tired', 'observedApnea', 'ageOver50'))).toMatchObject({ score: 4, band: 'intermediate' });
  });

  it('calls 5 to 8 high (5–8 high)', () => {
    expect(stopBang(yes('snoring', 'ageOver50', 'male', 'bmiOver35', 'neckOver40'))).toMatchObject({ score: 5, stopScore: 1, band: 'high' });
    expect(stopBang(yes(...STOP_BANG_ITEMS))).toMatchObject({ score: 8, stopScore: 4, band: 'high' });
  });

  it('calls ≥ 2 STOP items plus male sex high at a score of 3', () => {
    const r = stopBang(yes('snoring', 'tired', 'male'));
    expect(r).toMatchObject({ score: 3, stopScore: 2, band: 'high' });
    expect(r.reasons).toEqual(['score 3 of 8: 3–4 is intermediate risk', '2 of the 4 STOP items plus male sex: high risk']);
  });

  it('calls ≥ 2 STOP items plus BMI > 35, or plus neck > 40 cm, high', () => {
    expect(stopBang(yes('observedApnea', 'pressure', 'bmiOver35')).band).toBe('high');
    expect(stopBang(yes('tired', 'pressure', 'neckOver40')).band).toBe('high');
    expect(stopBang(yes('snoring', 'ageOver50', 'pressure')).reasons[1]).toBeUndefined();
  });

  it('agrees with the published rules on all 256 combinations of answers', () => {
    for (let mask = 0; mask < 256; mask++) {
      const items = Object.fromEntries(STOP_BANG_ITEMS.map((k, i) => [k, Boolean(mask & (1 << i))])) as StopBangItems;
      const score = STOP_BANG_ITEMS.reduce((n, k) => n + (items[k] ? 1 : 0), 0);
      const stop = STOP_ITEMS.reduce((n, k) => n + (items[k] ? 1 : 0), 0);
      let expected: string;
      if (score >= 5) expected = 'high';
      else if (stop >= 2 && (items.male || items.bmiOver35 || items.neckOver40)) expected = 'high';
      else if (score >= 3) expected = 'intermediate';
      else expected = 'low';
      expect(stopBang(items), JSON.stringify(items)).toMatchObject({ score, stopScore: stop, band: expected });
    }
  });

  it('holds the eight items as data, spelling S-T-O-P-B-A-N-G, STOP answered by the patient', () => {
    expect(STOP_BANG_ITEMS.map((k) => STOP_BANG_SPECS[k].letter).join('')).toBe('STOPBANG');
    expect(STOP_ITEMS.every((k) => STOP_BANG_SPECS[k].from === 'patient')).toBe(true);
    expect(STOP_BANG_SPECS.neckOver40.question).toMatch(/40 cm/);
    expect(StopBangItemsSchema.safeParse(none).success).toBe(true);
    expect(StopBangItemsSchema.safeParse({ ...none, male: 'yes' }).success).toBe(false);
  });
});

describe('STOP-Bang from facts (cut-offs of Chung 2008, Anesthesiology 108:812-21)', () => {
  const answers = { snoring: false, tired: false, observedApnea: false, pressure: false };

  it('counts BMI above 35 only: 35.0 is no, 35.1 is yes', () => {
    expect(stopBangFromFacts({ answers, bmi: 35, age: 40, sex: 'female', neckCm: 35 }).items.bmiOver35).toBe(false);
    expect(stopBangFromFacts({ answers, bmi: 35.1, age: 40, sex: 'female', neckCm: 35 }).items.bmiOver35).toBe(true);
  });

  it('counts age above 50 only: 50 is no, 51 is yes', () => {
    expect(stopBangFromFacts({ answers, bmi: 25, age: 50, sex: 'female', neckCm: 35 }).items.ageOver50).toBe(false);
    expect(stopBangFromFacts({ answers, bmi: 25, age: 51, sex: 'female', neckCm: 35 }).items.ageOver50).toBe(true);
  });

  it('counts a neck above 40 cm only: 40 is no, 40.5 is yes', () => {
    expect(stopBangFromFacts({ answers, bmi: 25, age: 40, sex: 'female', neckCm: 40 }).items.neckOver40).toBe(false);
    expect(stopBangFromFacts({ answers, bmi: 25, age: 40, sex: 'female', neckCm: 40.5 }).items.neckOver40).toBe(true);
  });

  it('counts male sex, not female', () => {
    expect(stopBangFromFacts({ answers, bmi: 25, age: 40, sex: 'male', neckCm: 35 }).items.male).toBe(true);
    expect(stopBangFromFacts({ answers, bmi: 25, age: 40, sex: 'female', neckCm: 35 }).items.male).toBe(false);
  });

  it('scores a snoring, hypertensive 62-year-old man with BMI 36 and a 43 cm neck 6 of 8, high', () => {
    const r = stopBangFromFacts({ answers: { ...answers, snoring: true, pressure: true }, bmi: 36, age: 62, sex: 'male', neckCm: 43 });
    expect(r).toMatchObject({ score: 6, band: 'high', unknown: [] });
  });

  it('counts unknown facts as no and says the score may be higher', () => {
    const r = stopBangFromFacts({ answers: { ...answers, snoring: true, tired: true }, bmi: null, age: 45, sex: 'unknown' });
    expect(r.unknown).toEqual(['bmiOver35', 'neckOver40', 'male']);
    expect(r).toMatchObject({ score: 2, band: 'low' });
    expect(r.reasons.at(-1)).toBe('not known, counted as no: BMI > 35, Neck > 40 cm, Male (the score may be higher)');
  });

  it('uses a direct neck answer only when the neck was not measured', () => {
    expect(stopBangFromFacts({ answers: { ...answers, neckOver40: true }, bmi: 25, age: 40, sex: 'female' }).items.neckOver40).toBe(true);
    expect(stopBangFromFacts({ answers: { ...answers, neckOver40: true }, bmi: 25, age: 40, sex: 'female', neckCm: 38 }).items.neckOver40).toBe(false);
  });
});
