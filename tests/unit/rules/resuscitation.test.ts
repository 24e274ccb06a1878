import { describe, expect, it } from 'vitest';
import type { CaseRecord } from '@/lib/domain/caseRecord';
import { analyzeResuscitation, PLATEAU_RESUSCITATION_V1, ResuscitationRules } from '@/lib/rules/resuscitation';

/** EtCO2 at 1 Hz from `from` to `to` (exclusive), value per second given by f. */
function record(parts: { from: number; to: number; f: (t: number) => number }[], extra: Partial<CaseRecord> = {}): CaseRecord {
  const t: number[] = [];
  const v: number[] = [];
  for (const p of parts) for (let s = p.from; s < p.to; s++) {
    t.push(s);
    v.push(p.f(s));
  }
  return {
    case: { start: '2026-03-02T09:00:00Z', etco2Unit: 'mmHg' },
    series: [{ channel: 'etco2', unit: 'mmHg', source: 'monitor', t, v }],
    doses: [],
    interventions: [{ t: 100, kind: 'chest_compressions' }],
    events: [],
    ...extra,
  };
}

describe('resuscitation rules as data', () => {
  it('validate with their schema and carry an id, a version and sources', () => {
    expect(ResuscitationRules.parse(PLATEAU_RESUSCITATION_V1)).toMatchObject({ id: 'plateau-resuscitation', version: 1 });
    expect(PLATEAU_RESUSCITATION_V1.targets.source).toMatch(/from memory/);
  });
});

describe('compression time and per-minute EtCO2 (targets: at least 10, ideally above 15 mmHg — common practice, AHA 2020 from memory)', () => {
  it('gives nothing for a case without chest compressions', () => {
    expect(analyzeResuscitation(record([{ from: 0, to: 300, f: () => 38 }], { interventions: [] }))).toBeNull();
  });

  it('counts compression time without the pauses and runs the clock to "now" while compressions go on', () => {
    const r = analyzeResuscitation(record([{ from: 0, to: 600, f: () => 18 }], { events: [{ t: 220, kind: 'compressions_paused' }, { t: 230, kind: 'compressions_resumed' }] }), PLATEAU_RESUSCITATION_V1, { nowS: 400 })!;
    expect(r.active).toBe(true);
    expect(r.periods).toEqual([{ start: 100, end: 220, endedBy: 'paused' }, { start: 230, end: null, endedBy: null }]);
    expect(r.compressionS).toBe(120 + 170);
  });

  it('puts a minute at exactly 10 mmHg at the minimum, just below it below, and above 15 as good', () => {
    const r = analyzeResuscitation(
      record([
        { from: 100, to: 160, f: () => 10 },
        { from: 160, to: 220, f: () => 9.9 },
        { from: 220, to: 280, f: () => 15 },
        { from: 280, to: 340, f: () => 15.1 },
      ], { events: [{ t: 340, kind: 'compressions_stopped' }] }),
    )!;
    expect(r.minutes.map((m) => [m.minute, m.medianMmHg, m.band])).toEqual([
      [1, 10, 'minimum'],
      [2, 9.9, 'below_minimum'],
      [3, 15, 'minimum'],
      [4, 15.1, 'good'],
    ]);
    expect(r.active).toBe(false);
  });
});

describe("the fatigue flag (Plateau's choice: two falls in a row, at least 4 mmHg in all)", () => {
  const minutes = (values: number[]) => values.map((x, i) => ({ from: 100 + i * 60, to: 160 + i * 60, f: () => x }));
  it('flags 20 → 18 → 16 (two falls, 4 mmHg)', () => {
    const r = analyzeResuscitation(record(minutes([20, 18, 16]), { events: [{ t: 280, kind: 'compressions_stopped' }] }))!;
    expect(r.fatigueFlags).toEqual([{ t: 280, minute: 3, fromMmHg: 20, toMmHg: 16 }]);
  });
  it('does not flag 20 → 18.5 → 16.5 (3.5 mmHg in all), nor a single fall of 8 mmHg', () => {
    expect(analyzeResuscitation(record(minutes([20, 18.5, 16.5]), { events: [{ t: 280, kind: 'compressions_stopped' }] }))!.fatigueFlags).toEqual([]);
    expect(analyzeResuscitation(record(minutes([20, 12, 12]), { events: [{ t: 280, kind: 'compressions_stopped' }] }))!.fatigueFlags).toEqual([]);
  });
});

describe('the possible-return-of-circulation flag (common practice: abrupt sustained rise of about 10 mmHg, from memory)', () => {
  it('prompts at a sustained rise of 10 mmHg', () => {
    const r = analyzeResuscitation(record([{ from: 100, to: 300, f: (t) => (t < 200 ? 14 : 24) }]))!;
    expect(r.possibleRoscFlags).toHaveLength(1);
    expect(r.possibleRoscFlags[0]).toMatchObject({ beforeMmHg: 14, afterMmHg: 24 });
    expect(r.possibleRoscFlags[0].t).toBe(200);
  });
  it('does not prompt at a rise of 9.9 mmHg, nor at a 10 mmHg spike that is not sustained', () => {
    expect(analyzeResuscitation(record([{ from: 100, to: 300, f: (t) => (t < 200 ? 14 : 23.9) }]))!.possibleRoscFlags).toEqual([]);
    expect(analyzeResuscitation(record([{ from: 100, to: 300, f: (t) => (t >= 200 && t < 210 ? 30 : 14) }]))!.possibleRoscFlags).toEqual([]);
  });
});

describe('the timeline', () => {
  it('lists compressions, shocks, drugs and the recorded return of circulation in order', () => {
    const r = analyzeResuscitation(
      record([{ from: 0, to: 400, f: () => 16 }], {
        doses: [{ t: 150, drug: 'epinephrine', amount: 1, unit: 'mg', route: 'IV' }],
        events: [{ t: 120, kind: 'shock' }, { t: 240, kind: 'shock' }, { t: 300, kind: 'rosc' }, { t: 310, kind: 'team_note', note: 'pulse present' }],
      }),
    )!;
    expect(r.timeline.map((x) => x.label)).toEqual(['Compressions started', 'Shock delivered', 'epinephrine 1 mg IV', 'Shock delivered', 'Return of circulation recorded', 'Team note']);
    expect(r.periods[0]).toEqual({ start: 100, end: 300, endedBy: 'rosc' });
    expect(r.timeline[5].note).toBe('pulse present');
  });
});
