import { describe, expect, it } from 'vitest';
import { doseCaution, vitalsOverdue } from '@/lib/domain/doseTotals';

describe('the dose caution (a per-unit setting, shown not enforced)', () => {
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
