import { describe, expect, it } from 'vitest';
import type { CaseRecord } from '@/lib/domain/caseRecord';
import { co2Gaps, paco2ToMmHg } from '@/lib/rules/co2Gap';

const rec = (unit: 'mmHg' | 'kPa', f: (t: number) => number, to = 1200, from = 0): CaseRecord => {
  const t: number[] = [];
  for (let s = from; s < to; s++) t.push(s);
  return { case: { start: '2026-03-02T09:00:00Z', etco2Unit: unit }, series: [{ channel: 'etco2', unit, source: 'monitor', t, v: t.map(f) }], doses: [], interventions: [], events: [] };
};

describe('the arterial-to-end-tidal CO2 gap (usual: a few mmHg — common practice)', () => {
  it('pairs the gas with the median EtCO2 of the minute around it (± 30 s)', () => {
    // EtCO2 rises 1 mmHg every 10 s; the window 570–630 s holds 57…63 → median 60.
    const [g] = co2Gaps(rec('mmHg', (t) => Math.floor(t / 10)), [{ t: 600, paco2MmHg: 64 }]);
    expect(g).toMatchObject({ etco2MmHg: 60, samples: 61, gapMmHg: 4, status: 'within_usual' });
  });

  it('marks a gap above 5 mmHg as wide, and exactly 5 as usual', () => {
    const flat = rec('mmHg', () => 38);
    expect(co2Gaps(flat, [{ t: 300, paco2MmHg: 43 }])[0].status).toBe('within_usual');
    expect(co2Gaps(flat, [{ t: 300, paco2MmHg: 43.1 }])[0]).toMatchObject({ gapMmHg: 5.1, status: 'wide' });
  });

  it('works in kPa: EtCO2 5.0 kPa is 37.5 mmHg; a PaCO2 of 5.6 kPa is 42 mmHg (1 kPa = 7.50062 mmHg)', () => {
    const [g] = co2Gaps(rec('kPa', () => 5.0), [{ t: 300, paco2MmHg: paco2ToMmHg(5.6, 'kPa') }]);
    expect(g.etco2MmHg).toBe(37.5);
    expect(g.paco2MmHg).toBe(42);
    expect(g.gapMmHg).toBe(4.5);
  });

  it('says so when no EtCO2 lies near the gas, instead of inventing a value', () => {
    const [g] = co2Gaps(rec('mmHg', () => 38, 600), [{ t: 700, paco2MmHg: 45 }]);
    expect(g).toMatchObject({ etco2MmHg: null, gapMmHg: null, status: 'no_etco2' });
    expect(g.message).toMatch(/No EtCO2 was recorded within 30 s/);
  });

  it('trends the gap over several gases in time order', () => {
    const r = co2Gaps(rec('mmHg', () => 35, 3600), [{ t: 2400, paco2MmHg: 47 }, { t: 600, paco2MmHg: 39 }, { t: 1800, paco2MmHg: 42 }]);
    expect(r.map((x) => [x.t, x.gapMmHg, x.changeMmHg])).toEqual([[600, 4, null], [1800, 7, 3], [2400, 12, 5]]);
  });
});
