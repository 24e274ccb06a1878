import { describe, expect, it } from 'vitest';
import { doseCaution, drugTotals, vitalsOverdue } from '@/lib/domain/doseTotals';

describe('running dose totals', () => {
  it('adds doses per drug and gives the per-kg figure', () => {
    const t = drugTotals(
      [
        { drug: 'propofol', amount: 40, unit: 'mg' },
        { drug: 'fentanyl', amount: 50, unit: 'mcg' },
        { drug: 'propofol', amount: 20, unit: 'mg' },
        { drug: 'propofol', amount: 30, unit: 'mg' },
      ],
      75,
    );
    expect(t).toEqual([
      { drug: 'propofol', unit: 'mg', total: 90, doses: 3, perKg: 1.2 },
      { drug: 'fentanyl', unit: 'mcg', total: 50, doses: 1, perKg: 0.667 },
    ]);
  });

  it('leaves voided doses out and converts mcg and g into the first dose unit', () => {
    const t = drugTotals(
      [
        { drug: 'midazolam', amount: 1, unit: 'mg' },
        { drug: 'midazolam', amount: 500, unit: 'mcg' },
        { drug: 'midazolam', amount: 5, unit: 'mg', voided: true },
      ],
      null,
    );
    expect(t).toEqual([{ drug: 'midazolam', unit: 'mg', total: 1.5, doses: 2, perKg: null }]);
  });

  it('flags a single dose above the unit setting, and not one at it', () => {
    expect(doseCaution(101, { cautionAbove: 100 })).toBe(true);
    expect(doseCaution(100, { cautionAbove: 100 })).toBe(false);
    expect(doseCaution(1000, { cautionAbove: null })).toBe(false);
  });
});

describe('the 5-minute BP/HR reminder (common practice; ASA 2018 moderate-sedation guideline, wording from memory)', () => {
  const base = { sedationStartS: 100, sedationEndS: null, depth: 'moderate', intervalMin: 5 };
  it('is due once the last reading is more than 5 minutes old during moderate sedation', () => {
    expect(vitalsOverdue({ ...base, nowS: 400 + 300, lastReadingS: 400 })).toBeNull();
    expect(vitalsOverdue({ ...base, nowS: 400 + 301, lastReadingS: 400 })).toBe(1);
  });
  it('counts from sedation start when no reading was taken during sedation', () => {
    expect(vitalsOverdue({ ...base, nowS: 100 + 360, lastReadingS: 20 })).toBe(60);
  });
  it('is not shown for minimal sedation, before sedation starts, or after it ends', () => {
    expect(vitalsOverdue({ ...base, depth: 'minimal', nowS: 5000, lastReadingS: null })).toBeNull();
    expect(vitalsOverdue({ ...base, sedationStartS: null, nowS: 5000, lastReadingS: null })).toBeNull();
    expect(vitalsOverdue({ ...base, sedationEndS: 900, nowS: 5000, lastReadingS: null })).toBeNull();
  });
});
