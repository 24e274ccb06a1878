import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { breakdown, breakdowns, DIMENSIONS, figureCatalogue, selectCases, dimensionValue } from '@/lib/review';
import type { StatsRow } from '@/lib/domain/statsRow';
import { row, RULES } from './_rows';

const FIGURES = figureCatalogue(RULES, 60);

const arbRow = fc
  .record({
    procedureType: fc.constantFrom('gastroscopy', 'colonoscopy', 'ercp', 'bronchoscopy'),
    regimen: fc.constantFrom('propofol', 'propofol_opioid', 'benzodiazepine_opioid', 'none' as const),
    asaClass: fc.constantFrom('I', 'II', 'III', null),
    bmi: fc.option(fc.double({ min: 15, max: 55, noNaN: true }), { nil: null }),
    stopBangBand: fc.constantFrom('low', 'intermediate', 'high', null),
    ageYears: fc.option(fc.integer({ min: 10, max: 95 }), { nil: null }),
    plannedDepth: fc.constantFrom('minimal', 'moderate', 'deep'),
    roomId: fc.constantFrom('room-1', 'room-2', null),
    proceduralistId: fc.constantFrom('dr-a', 'dr-b', null),
    nurseId: fc.constantFrom('nurse-a', 'nurse-b', 'nurse-c', null),
    apnea: fc.integer({ min: 0, max: 2 }),
    hypoxemia: fc.integer({ min: 0, max: 1 }),
    level: fc.constantFrom('none', 'observed', 'corrected', 'supported', 'rescued' as const),
    hasSummary: fc.boolean(),
  })
  .map((r) =>
    row({
      procedureType: r.procedureType,
      regimen: r.regimen,
      asaClass: r.asaClass,
      bmi: r.bmi,
      stopBangBand: r.stopBangBand as StatsRow['stopBangBand'],
      ageYears: r.ageYears,
      plannedDepth: r.plannedDepth,
      roomId: r.roomId,
      room: r.roomId ? r.roomId.replace('room-', 'Room ') : null,
      proceduralistId: r.proceduralistId,
      proceduralist: r.proceduralistId,
      nurseId: r.nurseId,
      nurse: r.nurseId,
      episodes: { apnea: r.apnea, hypoxemia: r.hypoxemia },
      summary: r.hasSummary ? { caseLevel: r.level, majorPhysiology: r.level === 'rescued' } : null,
    }),
  );

describe('breakdown tables', () => {
  it('have rows that add up to the total, case counts and every figure, for every dimension', () => {
    fc.assert(
      fc.property(fc.array(arbRow, { maxLength: 60 }), (rows) => {
        const reviewed = rows.filter((r) => r.summary).length;
        for (const d of DIMENSIONS) {
          const b = breakdown(rows, d, FIGURES);
          expect(b.total.cases).toBe(reviewed);
          expect(b.rows.reduce((a, r) => a + r.cases, 0)).toBe(reviewed);
          for (const f of FIGURES) expect(b.rows.reduce((a, r) => a + r.cells[f.id].numerator, 0)).toBe(b.total.cells[f.id].numerator);
          expect(new Set(b.rows.map((r) => r.key)).size).toBe(b.rows.length);
        }
      }),
      { numRuns: 150 },
    );
  });

  it('puts missing facts in a row of their own rather than dropping the case', () => {
    const rows = [row({ asaClass: null }), row({ asaClass: 'II' }), row({ bmi: null }), row({ stopBangBand: null }), row({ roomId: null, room: null })];
    const asa = breakdown(rows, 'asa', FIGURES);
    expect(asa.rows.map((r) => [r.key, r.cases])).toEqual([['II', 4], ['unknown', 1]]);
    expect(breakdown(rows, 'bmi', FIGURES).rows.find((r) => r.key === 'unknown')?.cases).toBe(1);
    expect(breakdown(rows, 'stopbang', FIGURES).rows.find((r) => r.key === 'unknown')?.label).toBe('STOP-Bang not answered');
    expect(breakdown(rows, 'room', FIGURES).rows.at(-1)).toMatchObject({ key: 'none', label: 'No room', cases: 1 });
  });

  it('bands BMI and age with the cut points of lib/domain/regimen and orders the bands naturally', () => {
    const rows = [row({ bmi: 41 }), row({ bmi: 18 }), row({ bmi: 25 }), row({ bmi: 24.9 }), row({ ageYears: 80 }), row({ ageYears: 17 })];
    expect(breakdown(rows, 'bmi', FIGURES).rows.map((r) => r.key)).toEqual(['< 18.5', '18.5–24.9', '25–29.9', '≥ 40']);
    expect(breakdown(rows, 'age', FIGURES).rows.map((r) => r.key)).toEqual(['< 18', '40–59', '≥ 80']);
  });

  it('gives each cell the proportion of its own row, and the case list of a cell has that many cases', () => {
    const rows = [row({ proceduralistId: 'dr-b', proceduralist: 'Dr B', episodes: { apnea: 1 } }), row({ proceduralistId: 'dr-b', proceduralist: 'Dr B' }), row({ episodes: { apnea: 1 } })];
    const b = breakdown(rows, 'proceduralist', FIGURES);
    const drB = b.rows.find((r) => r.key === 'dr-b')!;
    expect(drB.cells['rule:apnea']).toMatchObject({ numerator: 1, denominator: 2, rate: 0.5 });
    for (const r of b.rows) {
      const listed = selectCases(rows, { figure: 'rule:apnea', dim: 'proceduralist', value: r.key }, { ruleIds: RULES, responseLimitS: 60 });
      expect(listed.length).toBe(r.cells['rule:apnea'].numerator);
      expect(listed.every((x) => dimensionValue(x, 'proceduralist').key === r.key)).toBe(true);
    }
  });
});

describe('all breakdowns at once', () => {
  it('give the same tables as one breakdown at a time', () => {
    fc.assert(
      fc.property(fc.array(arbRow, { maxLength: 40 }), (rows) => {
        expect(breakdowns(rows, DIMENSIONS, FIGURES)).toEqual(DIMENSIONS.map((d) => breakdown(rows, d, FIGURES)));
      }),
      { numRuns: 60 },
    );
  });
});
