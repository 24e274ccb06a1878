import { describe, expect, it } from 'vitest';
import { buildIndicatorReport } from '@/lib/indicators/report';
import { getCatalogue } from '@/lib/indicators/catalogue';
import { parsePeriod } from '@/lib/indicators/period';
import { diffReports, publishedFingerprint } from '@/lib/indicators/diff';
import type { StatsRow } from '@/lib/domain/statsRow';
import { rows, SCOPE } from './_rows';

const build = (data: StatsRow[], generatedOn = '2026-12-01') =>
  buildIndicatorReport({ catalogue: getCatalogue(1), period: parsePeriod('2026-09')!, scope: SCOPE, rows: data, generatedOn });
const ppv = (date: string, n: number, x: number) => rows(n, x, { date }, { interventions: ['bag_mask'] });

describe('differences between issued versions', () => {
  it('lists the published cells that changed after late documentation, before and after', () => {
    const v1 = build([...ppv('2026-09-02', 100, 0), ...ppv('2026-07-02', 100, 20)]);
    const v2 = build([...ppv('2026-09-02', 100, 6), ...ppv('2026-07-02', 100, 20)], '2026-12-05');
    const d = diffReports(v1, v2, 1, 2);
    expect(d).toMatchObject({ fromVersion: 1, toVersion: 2 });
    const ppvChanges = d.changes.filter((c) => c.indicatorId === 'positive_pressure_ventilation');
    expect(ppvChanges).toContainEqual({ indicatorId: 'positive_pressure_ventilation', title: 'Cases with bag-mask or other positive-pressure ventilation', what: '2026-09 numerator', before: '0', after: '6' });
    expect(ppvChanges.map((c) => c.what)).toContain('2026-09 value');
    // nothing else moved: the other indicators did not change
    expect(new Set(d.changes.map((c) => c.indicatorId))).toEqual(new Set(['positive_pressure_ventilation']));
  });

  it('lists a changed chart period outside the three table rows', () => {
    const v1 = build([...ppv('2026-09-02', 100, 10), ...ppv('2026-03-02', 100, 10)]);
    const v2 = build([...ppv('2026-09-02', 100, 10), ...ppv('2026-03-02', 100, 12)]);
    const whats = diffReports(v1, v2, 1, 2).changes.map((c) => c.what);
    expect(whats).toContain('chart 2026-03');
    expect(whats).toContain('chart centre line');
  });

  it('does not reveal a change inside a suppressed cell: 2 → 3 cases stays "< 5" and the fingerprint is equal', () => {
    const v1 = build(ppv('2026-09-02', 100, 2));
    const v2 = build(ppv('2026-09-02', 100, 3), '2026-12-09');
    expect(diffReports(v1, v2, 1, 2).changes).toEqual([]);
    expect(publishedFingerprint(v1)).toBe(publishedFingerprint(v2));
  });

  it('ignores the day the report was generated and the issue stamp in the fingerprint', () => {
    const a = build(ppv('2026-09-02', 100, 9));
    const b = { ...build(ppv('2026-09-02', 100, 9), '2027-01-01'), issue: { reportKey: 'k', version: 2, issuedOn: '2027-01-01', issuedBy: 'X' } };
    expect(publishedFingerprint(a)).toBe(publishedFingerprint(b));
    expect(publishedFingerprint(a)).not.toBe(publishedFingerprint(build(ppv('2026-09-02', 100, 10))));
  });
});
