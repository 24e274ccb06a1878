import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { CAPNOGRAPHY_COVERAGE_PCT, VITALS_GAP_LIMIT_S, catalogueVersions, describeIndicator, getCatalogue, type Indicator } from '@/lib/indicators/catalogue';
import { INTERVENTION_KINDS } from '@/lib/domain/intervention';
import { getBuiltInRuleSet } from '@/lib/rules';
import { row, type RowOptions } from './_rows';

const cat = getCatalogue(1);
const ind = (id: string) => cat.indicators.find((i) => i.id === id)!;
/** Is the row in the indicator's denominator, and in its numerator? */
const counts = (i: Indicator, o: RowOptions) => {
  const r = row(o);
  const inPop = i.population.every((c) => c.test(r));
  return { den: inPop, num: inPop && (i.kind === 'proportion' ? i.numerator.test(r) : i.value.of(r) !== null) };
};

describe('the indicator catalogue, version 1', () => {
  it('has not changed in place: its words equal the frozen copy (a change must be a new catalogue version)', () => {
    const frozen = JSON.parse(fs.readFileSync(path.join(__dirname, 'catalogue-v1.json'), 'utf8'));
    const now = {
      version: cat.version,
      ruleSet: cat.ruleSet,
      base: cat.base,
      indicators: cat.indicators.map((i) => ({ ...describeIndicator(i, cat), criteria: i.population.map((p) => ({ id: p.id, text: p.text, excluded: p.excluded, event: p.event ?? false })) })),
    };
    expect(now).toEqual(frozen);
  });

  it('is deep-frozen, and unknown versions are refused', () => {
    expect(Object.isFrozen(cat)).toBe(true);
    expect(Object.isFrozen(cat.indicators[0].population)).toBe(true);
    expect(() => getCatalogue(99)).toThrow(/catalogue version 99 does not exist/);
    expect(catalogueVersions()).toEqual([1]);
  });

  it('holds the required indicators, each with a unique id, a definition, a unit and sources', () => {
    const ids = cat.indicators.map((i) => i.id);
    expect(ids).toEqual([
      'hypoxemia', 'severe_hypoxemia', 'apnea', 'prolonged_apnea', 'positive_pressure_ventilation', 'reversal_agent',
      'level_supported_or_above', 'level_rescued', 'procedure_stopped', 'capnography_90', 'documentation_complete',
      'apnea_response_median', 'apnea_response_p90',
    ]);
    for (const i of cat.indicators) {
      expect(i.definition.length, i.id).toBeGreaterThan(40);
      expect(i.sources.length, i.id).toBeGreaterThan(0);
      expect(i.population.length, i.id).toBeGreaterThan(0);
    }
  });

  it('names a rule set that exists, and every rule it counts is in that rule set', () => {
    const rs = getBuiltInRuleSet(cat.ruleSet.id, cat.ruleSet.version)!;
    expect(rs).toBeDefined();
    const ruleIds = rs.rules.map((r) => r.id);
    for (const rule of ['hypoxemia', 'severe_hypoxemia', 'apnea', 'prolonged_apnea']) expect(ruleIds).toContain(rule);
  });

  it('counts intervention kinds that exist in the one kind → level table', () => {
    for (const kind of ['bag_mask', 'supraglottic_airway', 'intubation', 'naloxone', 'flumazenil', 'procedure_stopped']) expect(INTERVENTION_KINDS).toContain(kind);
  });

  it('keeps general anaesthesia out of every indicator, and minimal sedation out of the moderate/deep ones', () => {
    for (const i of cat.indicators) expect(counts(i, { depth: 'general' }).den, i.id).toBe(false);
    expect(counts(ind('hypoxemia'), { depth: 'minimal' }).den).toBe(true);
    expect(counts(ind('capnography_90'), { depth: 'minimal' }).den).toBe(false);
    expect(counts(ind('documentation_complete'), { depth: 'minimal' }).den).toBe(false);
    expect(counts(ind('capnography_90'), { depth: 'deep' }).den).toBe(true);
  });

  it('counts hypoxaemia only among cases with a valid SpO2 reading, and apnoea only among cases with capnography', () => {
    expect(counts(ind('hypoxemia'), { lowestSpo2: null, episodes: { hypoxemia: 1 } })).toEqual({ den: false, num: false });
    expect(counts(ind('hypoxemia'), { episodes: { hypoxemia: 2 } })).toEqual({ den: true, num: true });
    expect(counts(ind('severe_hypoxemia'), { episodes: { hypoxemia: 1 } })).toEqual({ den: true, num: false });
    expect(counts(ind('apnea'), { capno: 0, episodes: { apnea: 1 } }).den).toBe(false);
    expect(counts(ind('apnea'), { capno: null }).den).toBe(false);
    expect(counts(ind('apnea'), { capno: 40, episodes: { apnea: 1 } })).toEqual({ den: true, num: true });
    expect(counts(ind('prolonged_apnea'), { episodes: { apnea: 1 } }).num).toBe(false);
    expect(counts(ind('prolonged_apnea'), { episodes: { apnea: 1, prolonged_apnea: 1 } }).num).toBe(true);
  });

  it('leaves cases without a summary of the rule set out of the summary-based indicators only', () => {
    expect(counts(ind('apnea'), { noSummary: true }).den).toBe(false);
    expect(counts(ind('level_supported_or_above'), { noSummary: true }).den).toBe(false);
    expect(counts(ind('positive_pressure_ventilation'), { noSummary: true, interventions: ['bag_mask'] })).toEqual({ den: true, num: true });
    expect(counts(ind('documentation_complete'), { noSummary: true }).den).toBe(true);
  });

  it('counts bag-mask, supraglottic airway and intubation as positive-pressure ventilation; naloxone and flumazenil as reversal', () => {
    for (const k of ['bag_mask', 'supraglottic_airway', 'intubation']) expect(counts(ind('positive_pressure_ventilation'), { interventions: [k] }).num, k).toBe(true);
    for (const k of ['jaw_thrust', 'oral_airway', 'oxygen_increase']) expect(counts(ind('positive_pressure_ventilation'), { interventions: [k] }).num, k).toBe(false);
    expect(counts(ind('reversal_agent'), { interventions: ['flumazenil'] }).num).toBe(true);
    expect(counts(ind('reversal_agent'), { interventions: ['stimulation'] }).num).toBe(false);
    expect(counts(ind('procedure_stopped'), { interventions: ['procedure_stopped'] }).num).toBe(true);
  });

  it('grades supported-or-above and rescued from the stored case level', () => {
    expect(counts(ind('level_supported_or_above'), { caseLevel: 'corrected' }).num).toBe(false);
    expect(counts(ind('level_supported_or_above'), { caseLevel: 'supported' }).num).toBe(true);
    expect(counts(ind('level_supported_or_above'), { caseLevel: 'rescued' }).num).toBe(true);
    expect(counts(ind('level_rescued'), { caseLevel: 'supported' }).num).toBe(false);
    expect(counts(ind('level_rescued'), { caseLevel: 'rescued' }).num).toBe(true);
  });

  it(`meets the capnography standard at ${CAPNOGRAPHY_COVERAGE_PCT} % coverage and not at 89.9 %; no sedation time leaves the case out`, () => {
    expect(counts(ind('capnography_90'), { capno: 90 })).toEqual({ den: true, num: true });
    expect(counts(ind('capnography_90'), { capno: 89.9 })).toEqual({ den: true, num: false });
    expect(counts(ind('capnography_90'), { capno: 0 })).toEqual({ den: true, num: false });
    expect(counts(ind('capnography_90'), { capno: null }).den).toBe(false);
  });

  it(`calls documentation complete with every item and a BP/HR gap of at most ${VITALS_GAP_LIMIT_S} s (5 min + 30 s tolerance)`, () => {
    const doc = ind('documentation_complete');
    expect(counts(doc, { documentation: { longestVitalsGapS: 330 } }).num).toBe(true);
    expect(counts(doc, { documentation: { longestVitalsGapS: 330.5 } }).num).toBe(false);
    expect(counts(doc, { documentation: { longestVitalsGapS: null } })).toEqual({ den: true, num: false });
    expect(counts(doc, { documentation: { weight: false } }).num).toBe(false);
    expect(counts(doc, { documentation: { asaClass: false } }).num).toBe(false);
    expect(counts(doc, { documentation: { stopBang: false } }).num).toBe(false);
  });

  it('takes the apnoea response time only from cases with an apnoea episode and a recorded response', () => {
    const med = ind('apnea_response_median');
    expect(med.kind).toBe('quantile');
    expect(counts(med, { episodes: { apnea: 1 }, firstApneaResponseS: 12 })).toEqual({ den: true, num: true });
    expect(counts(med, { episodes: { apnea: 1 }, firstApneaResponseS: null }).den).toBe(false);
    expect(counts(med, { episodes: {}, firstApneaResponseS: 12 }).den).toBe(false);
    expect(med.kind === 'quantile' && med.p).toBe(0.5);
    const p90 = ind('apnea_response_p90');
    expect(p90.kind === 'quantile' && p90.p).toBe(0.9);
  });
});
