import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { packStatsRow, unpackStatsRow, type UnpackContext } from '@/lib/domain/statsRowCodec';
import type { StatsRow } from '@/lib/domain/statsRow';
import { REGIMENS } from '@/lib/domain/regimen';

const RULE_IDS = ['apnea', 'hypoventilation', 'hypoxemia'];
const names = { room: new Map([['r1', 'Room 1']]), proceduralist: new Map([['p1', 'Dr One']]), user: new Map([['n1', 'Nurse One']]) };
const ctx: UnpackContext = { unitId: 'unit-a', status: 'signed', ruleSetId: 'plateau-default', ruleSetVersion: 1, ruleIds: RULE_IDS, names };

// JSON has no −0 (it reads back as 0), and no stored figure is −0: the generator leaves it out.
const num = fc.oneof(fc.constant(null), fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e6, max: 1e6 }).map((x) => (Object.is(x, -0) ? 0 : x)));
const dur = fc.double({ min: 0, max: 1e4, noNaN: true }).map((x) => (Object.is(x, -0) ? 0 : x));
const ruleFacts = fc.record({ episodes: fc.nat(5), totalDurationS: dur, maxDurationS: dur, firstResponseS: num });
const row: fc.Arbitrary<StatsRow> = fc
  .record({
    caseId: fc.string({ minLength: 1 }),
    key: fc.oneof(fc.constant(null), fc.string()),
    date: fc.date({ min: new Date('2020-01-01'), max: new Date('2030-12-31'), noInvalidDate: true }).map((d) => d.toISOString().slice(0, 10)),
    roomId: fc.constantFrom(null, 'r1', 'r-gone'),
    procedureType: fc.constantFrom('gastroscopy', 'colonoscopy'),
    plannedDepth: fc.constantFrom('minimal', 'moderate', 'deep', 'general'),
    asaClass: fc.constantFrom(null, 'I', 'II', 'III'),
    asaEmergency: fc.boolean(),
    ageYears: fc.oneof(fc.constant(null), fc.nat(110)),
    sex: fc.constantFrom('female', 'male', 'other', 'unknown'),
    bmi: num,
    stopBangScore: fc.oneof(fc.constant(null), fc.nat(8)),
    stopBangBand: fc.constantFrom(null, 'low', 'intermediate', 'high'),
    regimen: fc.constantFrom(...REGIMENS),
    proceduralistId: fc.constantFrom(null, 'p1'),
    nurseId: fc.constantFrom(null, 'n1', 'n-gone'),
    interventions: fc.array(fc.constantFrom('jaw_thrust', 'bag_mask', 'naloxone')),
    summary: fc.oneof(
      fc.constant(null),
      fc.record({
        caseLevel: fc.constantFrom('none', 'observed', 'corrected', 'supported', 'rescued'),
        majorPhysiology: fc.boolean(),
        episodeCount: fc.nat(20),
        lowestSpo2: num,
        capnoCoveragePct: num,
        sedationS: num,
        firstApneaResponseS: num,
        rules: fc.tuple(ruleFacts, ruleFacts, ruleFacts).map((fs) => Object.fromEntries(RULE_IDS.map((id, i) => [id, fs[i]]))),
      }),
    ),
    documentation: fc.record({ asaClass: fc.boolean(), weight: fc.boolean(), stopBang: fc.boolean(), longestVitalsGapS: num }),
  })
  .map((r) => ({
    ...r,
    unitId: 'unit-a',
    month: r.date.slice(0, 7),
    status: 'signed',
    room: r.roomId === 'r1' ? 'Room 1' : null,
    proceduralist: r.proceduralistId === 'p1' ? 'Dr One' : null,
    nurse: r.nurseId === 'n1' ? 'Nurse One' : null,
    summary: r.summary ? { ...r.summary, ruleSetId: 'plateau-default', ruleSetVersion: 1, caseLevel: r.summary.caseLevel as NonNullable<StatsRow['summary']>['caseLevel'] } : null,
  }));

describe('the packed statistics row of the rollup', () => {
  it('unpacks to the row it packed, through JSON, for any row (property)', () => {
    fc.assert(
      fc.property(row, fc.integer({ min: 0, max: 4e12 }), (r, startMs) => {
        const packed = JSON.parse(JSON.stringify(packStatsRow(r, startMs)));
        expect(unpackStatsRow(packed, ctx)).toEqual(r);
        expect(packed[3]).toBe(startMs);
      }),
    );
  });

  it('leaves out rules without an episode and gives them back as zero', () => {
    const r = fc.sample(row.filter((x) => x.summary !== null), { numRuns: 1, seed: 4 })[0];
    r.summary!.rules = { apnea: { episodes: 2, totalDurationS: 61.5, maxDurationS: 40, firstResponseS: 12 }, hypoventilation: { episodes: 0, totalDurationS: 0, maxDurationS: 0, firstResponseS: null }, hypoxemia: { episodes: 0, totalDurationS: 0, maxDurationS: 0, firstResponseS: null } };
    const packed = packStatsRow(r, 0);
    expect(packed[19]![7]).toEqual([['apnea', 2, 61.5, 40, 12]]);
    expect(unpackStatsRow(packed, ctx).summary!.rules.hypoxemia).toEqual({ episodes: 0, totalDurationS: 0, maxDurationS: 0, firstResponseS: null });
  });

  it('takes names from the context when unpacking, so a renamed room shows its new name', () => {
    const r = fc.sample(row, { numRuns: 1, seed: 9 })[0];
    const packed = packStatsRow({ ...r, roomId: 'r1', room: 'Room 1' }, 0);
    expect(unpackStatsRow(packed, { ...ctx, names: { ...names, room: new Map([['r1', 'Endoscopy 1']]) } }).room).toBe('Endoscopy 1');
  });
});
