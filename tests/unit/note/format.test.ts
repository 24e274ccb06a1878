import { describe, expect, it } from 'vitest';
import { clockAt, formatChannelValue, formatDoseAmount, formatDuration, formatNumber, formatPerKg, formatSignificant } from '@/lib/note';

describe('formatting one way per quantity', () => {
  it('drops trailing zeros and never writes -0 or an exponent', () => {
    expect(formatNumber(2.5, 2)).toBe('2.5');
    expect(formatNumber(-0.0001, 1)).toBe('0');
    expect(formatNumber(1e-7, 3)).toBe('0');
    expect(formatNumber(120, 3)).toBe('120');
  });

  it('writes per-kg doses with three significant figures', () => {
    expect(formatSignificant(90 / 82)).toBe('1.1');
    expect(formatSignificant(2 / 82)).toBe('0.0244');
    expect(formatSignificant(1000 / 82)).toBe('12.2');
    expect(formatSignificant(999.7)).toBe('1000');
    expect(formatPerKg(50 / 82, 'mcg/kg')).toBe('0.61 mcg/kg');
  });

  it('writes durations in s, min and h, rounded to the second', () => {
    expect([0, 45, 59.6, 60, 125, 3600, 4380, 4385].map(formatDuration)).toEqual(['0 s', '45 s', '1 min', '1 min', '2 min 5 s', '1 h 0 min', '1 h 13 min', '1 h 13 min 5 s']);
  });

  it('writes kPa with two decimals and the other channels with one', () => {
    expect(formatChannelValue(50 / 7.50062, 'kPa')).toBe('6.67 kPa'); // references.md: 50 mmHg = 6.67 kPa
    expect(formatChannelValue(37.5, 'mmHg')).toBe('37.5 mmHg');
    expect(formatChannelValue(84, '%')).toBe('84 %');
    expect(formatDoseAmount(0.05, 'mg')).toBe('0.05 mg');
  });

  it('reads a case second as a clock time in the zone', () => {
    const start = Date.parse('2026-03-02T09:00:00Z');
    expect(clockAt(start, 615, 'Europe/Dublin')).toBe('09:10:15');
    expect(clockAt(start, 615, 'America/New_York')).toBe('04:10:15');
    expect(clockAt(start, 615, 'Australia/Sydney')).toBe('20:10:15'); // AEDT, UTC+11 on 2 March
  });
});
