/**
 * Outside checks: each default threshold reproduces the published definition it cites, on a
 * constructed 1 Hz trace at the cut-off and just past it. Sources from
 * ../shared/design/references.md; "from memory" where that list says so.
 */
import { describe, expect, it } from 'vitest';
import { analyzeCase, BURTON_2006_V1, CONWAY_2019_V1, DEITCH_2010_V1, HART_1997_V1, PLATEAU_DEFAULT_V1, type RuleSet } from '@/lib/rules';
import { MMHG_PER_KPA, type Channel } from '@/lib/domain/channel';
import { caseOf, monitor, propofolAt, runs } from './_build';

const NORMAL: Record<'etco2' | 'rr' | 'spo2', number> = { etco2: 38, rr: 14, spo2: 98 };

/**
 * 200 s of normal values (dose at 150 s, so the baselines are EtCO2 38, RR 14, SpO2 98), then
 * `seconds` of `value` on one channel, then 100 s normal.
 */
function eventCase(channel: 'etco2' | 'rr' | 'spo2', value: number, seconds: number) {
  const series = (['etco2', 'rr', 'spo2'] as const).map((c: Channel & keyof typeof NORMAL) =>
    monitor(c, c === channel ? runs([NORMAL[c], 200], [value, seconds], [NORMAL[c], 100]) : runs([NORMAL[c], 300 + seconds])),
  );
  return caseOf(series, { doses: [propofolAt(150)] });
}

const rulesHit = (rs: RuleSet, channel: 'etco2' | 'rr' | 'spo2', value: number, seconds: number) =>
  [...new Set(analyzeCase(eventCase(channel, value, seconds), rs).episodes.map((e) => e.rule))].sort();

const D = PLATEAU_DEFAULT_V1;

describe('outside checks: plateau-default reproduces its cited definitions', () => {
  it('apnea ≥ 20 s — Conway A et al. 2019, J Clin Monit Comput (apnea > 20 s sensitivity analysis); 20 s is the usual cut-off (common practice)', () => {
    expect(rulesHit(D, 'etco2', 0, 20)).toContain('apnea');
    expect(rulesHit(D, 'etco2', 0, 19)).not.toContain('apnea');
    expect(rulesHit(D, 'rr', 0, 20)).toContain('apnea');
    expect(rulesHit(D, 'etco2', 4.9, 20)).toContain('apnea');
    expect(rulesHit(D, 'etco2', 5, 20)).not.toContain('apnea');
  });

  it('prolonged apnea ≥ 60 s — Mason KP et al. 2012, Br J Anaesth 108:13-20 (apnea > 60 s; compared with ≥ in Plateau)', () => {
    expect(rulesHit(D, 'etco2', 0, 60)).toContain('prolonged_apnea');
    expect(rulesHit(D, 'etco2', 0, 59)).not.toContain('prolonged_apnea');
  });

  it('hypoventilation EtCO2 ≥ 50 mmHg — Burton JH et al. 2006, Acad Emerg Med 13:500-4 (from memory); Deitch K et al. 2010, Ann Emerg Med 55:258-64 (> 50 mmHg)', () => {
    expect(rulesHit(D, 'etco2', 50, 30)).toContain('hypoventilation');
    expect(rulesHit(D, 'etco2', 50.1, 30)).toContain('hypoventilation'); // past Deitch's strict > 50
  });

  it('hypoventilation at baseline + 10 mmHg — Burton 2006 (absolute 10 mmHg change, from memory); Deitch 2010 (10 % change)', () => {
    expect(rulesHit(D, 'etco2', 48, 30)).toContain('hypoventilation'); // baseline 38 + 10
    expect(rulesHit(D, 'etco2', 47.9, 30)).not.toContain('hypoventilation');
  });

  it('30 s persistence — Langhan ML et al. 2011, Pediatr Emerg Care (a persistent change ≥ 30 s counted)', () => {
    expect(rulesHit(D, 'etco2', 55, 30)).toContain('hypoventilation');
    expect(rulesHit(D, 'etco2', 55, 29)).not.toContain('hypoventilation');
  });

  it('low EtCO2 ≤ baseline − 10 mmHg with breaths — Krauss B, Hess DR 2007, Ann Emerg Med 50:172-181 (from memory)', () => {
    expect(rulesHit(D, 'etco2', 28, 30)).toEqual(['low_etco2']);
    expect(rulesHit(D, 'etco2', 28.1, 30)).toEqual([]);
    expect(rulesHit(D, 'etco2', 28, 29)).toEqual([]); // a sample short of 30 s
    expect(rulesHit(D, 'etco2', 5, 30)).toEqual(['low_etco2']);
    expect(rulesHit(D, 'etco2', 4.9, 30)).toEqual(['apnea']); // no breaths: apnea, not low EtCO2
  });

  it('bradypnea RR < 8 /min — Conway A et al. 2019, J Clin Monit Comput; 30 s is common practice', () => {
    expect(rulesHit(D, 'rr', 7, 30)).toEqual(['bradypnea']);
    expect(rulesHit(D, 'rr', 8, 30)).toEqual([]);
    expect(rulesHit(D, 'rr', 7, 29)).toEqual([]);
  });

  it('hypoxemia SpO2 < 90 % for 15 s — Qadeer MA et al. 2009, Gastroenterology 136:1568-76 (from memory, moderate confidence)', () => {
    expect(rulesHit(D, 'spo2', 89, 15)).toEqual(['hypoxemia']);
    expect(rulesHit(D, 'spo2', 89, 14)).toEqual([]);
    expect(rulesHit(D, 'spo2', 90, 15)).toEqual([]);
  });

  it('severe hypoxemia SpO2 < 85 % at any time — Friedrich-Rust M et al. 2014, Endoscopy 46:236-44 (< 85 %); Beitz A et al. 2012, Am J Gastroenterol (≤ 85 %)', () => {
    expect(rulesHit(D, 'spo2', 84, 1)).toEqual(['severe_hypoxemia']);
    // Plateau follows Friedrich-Rust's strict < 85; Beitz would count 85 itself
    expect(rulesHit(D, 'spo2', 85, 1)).toEqual([]);
  });

  it('prolonged hypoxemia < 90 % for 60 s and critical < 75 % at any time — Mason KP et al. 2012, Br J Anaesth 108:13-20', () => {
    expect(rulesHit(D, 'spo2', 89, 60)).toEqual(['hypoxemia', 'prolonged_hypoxemia']);
    expect(rulesHit(D, 'spo2', 89, 59)).toEqual(['hypoxemia']);
    expect(rulesHit(D, 'spo2', 74, 1)).toEqual(['critical_hypoxemia', 'severe_hypoxemia']);
    expect(rulesHit(D, 'spo2', 75, 1)).toEqual(['severe_hypoxemia']);
  });
});

describe('outside checks: the alternate rule sets reproduce their papers', () => {
  it('Deitch K, Miner J et al. 2010, Ann Emerg Med 55:258-64: EtCO2 > 50 mmHg, a 10 % change (read as relative), SpO2 < 93 %', () => {
    expect(rulesHit(DEITCH_2010_V1, 'etco2', 50, 5)).toEqual(['respiratory_depression']); // 50 ≥ 38 × 1.1
    expect(rulesHit(DEITCH_2010_V1, 'etco2', 41.8, 5)).toEqual(['respiratory_depression']);
    expect(rulesHit(DEITCH_2010_V1, 'etco2', 41.7, 5)).toEqual([]);
    expect(rulesHit(DEITCH_2010_V1, 'etco2', 34.2, 5)).toEqual(['respiratory_depression']);
    expect(rulesHit(DEITCH_2010_V1, 'etco2', 34.3, 5)).toEqual([]);
    expect(rulesHit(DEITCH_2010_V1, 'spo2', 92.9, 5)).toEqual(['hypoxia']);
    expect(rulesHit(DEITCH_2010_V1, 'spo2', 93, 5)).toEqual([]);
  });

  it('Conway A et al. 2019, J Clin Monit Comput: apnea EtCO2 = 0 (> 20 s sensitivity), hypopnea > 10 % from baseline, bradypnea RR < 8', () => {
    expect(rulesHit(CONWAY_2019_V1, 'etco2', 0, 20)).toEqual(['apnea', 'apnea_20s', 'hypopnea']);
    expect(rulesHit(CONWAY_2019_V1, 'etco2', 0, 19)).toEqual(['apnea', 'hypopnea']);
    expect(rulesHit(CONWAY_2019_V1, 'etco2', 41.8, 5)).toEqual([]); // exactly 10 % is not > 10 %
    expect(rulesHit(CONWAY_2019_V1, 'etco2', 41.9, 5)).toEqual(['hypopnea']);
    expect(rulesHit(CONWAY_2019_V1, 'rr', 7, 5)).toEqual(['bradypnea']);
  });

  it('Hart LS et al. 1997, Pediatr Emerg Care 13:189-93: SpO2 ≤ 90 % for > 1 min or any EtCO2 ≥ 50 mmHg', () => {
    expect(rulesHit(HART_1997_V1, 'spo2', 90, 60)).toEqual(['hypoxemia']);
    expect(rulesHit(HART_1997_V1, 'spo2', 90, 59)).toEqual([]);
    expect(rulesHit(HART_1997_V1, 'etco2', 50, 1)).toEqual(['hypercapnia']);
    expect(rulesHit(HART_1997_V1, 'etco2', 49.9, 1)).toEqual([]);
  });

  it('Burton JH et al. 2006, Acad Emerg Med 13:500-4: SpO2 ≤ 92 % (found); EtCO2 ≥ 50 or a 10 mmHg change (from memory)', () => {
    expect(rulesHit(BURTON_2006_V1, 'spo2', 92, 1)).toEqual(['hypoxia']);
    expect(rulesHit(BURTON_2006_V1, 'spo2', 92.1, 1)).toEqual([]);
    expect(rulesHit(BURTON_2006_V1, 'etco2', 28, 1)).toEqual(['capnographic_change']);
    expect(rulesHit(BURTON_2006_V1, 'etco2', 28.1, 1)).toEqual([]);
  });
});

describe('outside checks: units', () => {
  it('derives 1 kPa = 7.50062 mmHg from 760 mmHg = 101.325 kPa (references.md, Units)', () => {
    expect(760 / 101.325).toBeCloseTo(7.50062, 5);
    expect(MMHG_PER_KPA).toBe(760 / 101.325);
    expect(1 / MMHG_PER_KPA).toBeCloseTo(0.133322, 6);
    expect(50 / MMHG_PER_KPA).toBeCloseTo(6.67, 2);
  });
});
