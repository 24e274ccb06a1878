import type { Rule, RuleSet, RuleTerm } from '@/lib/domain/ruleSet';

/**
 * Built-in rule sets, as data. A built-in is never edited in place: a change is a new object with
 * the next `version`, appended here beside the old one, so every stored result stays reproducible.
 * Thresholds are in engine units (EtCO2 mmHg, SpO2 %, RR /min). Sources follow
 * ../shared/design/references.md; "from memory" is said where that list says it.
 */

const etco2Below5: RuleTerm = { channel: 'etco2', comparator: '<', threshold: 5 };
const rrZero: RuleTerm = { channel: 'rr', comparator: '=', threshold: 0 };

function deepFreeze<T>(x: T): T {
  if (x !== null && typeof x === 'object' && !Object.isFrozen(x)) {
    Object.freeze(x);
    for (const v of Object.values(x)) deepFreeze(v);
  }
  return x;
}

/** `plateau-default` version 1: exactly the table of rules.md §4. */
export const PLATEAU_DEFAULT_V1: RuleSet = deepFreeze({
  id: 'plateau-default',
  version: 1,
  description: 'Plateau default respiratory-event rules (rules.md §4).',
  rules: [
    {
      id: 'apnea',
      description: 'Apnea: EtCO2 < 5 mmHg or RR = 0 for at least 20 s.',
      source:
        'Conway A et al. 2019, J Clin Monit Comput (apnea > 20 s sensitivity analysis); ≥ 20 s is also the usual clinical cut-off (common practice).',
      terms: [etco2Below5, rrZero],
      combine: 'any',
      minDurationS: 20,
    },
    {
      id: 'prolonged_apnea',
      description: 'Prolonged apnea: EtCO2 < 5 mmHg or RR = 0 for at least 60 s.',
      source: 'Mason KP et al. 2012, Br J Anaesth 108:13-20 (apnea > 60 s counted as prolonged; compared with ≥ here).',
      terms: [etco2Below5, rrZero],
      combine: 'any',
      minDurationS: 60,
      major: true,
    },
    {
      id: 'hypoventilation',
      description: 'Hypoventilation: EtCO2 ≥ 50 mmHg or ≥ baseline + 10 mmHg for at least 30 s.',
      source:
        'EtCO2 > 50 mmHg and a 10 mmHg change from baseline: Burton JH et al. 2006, Acad Emerg Med 13:500-4 (from memory); Deitch K et al. 2010, Ann Emerg Med 55:258-64. 30 s persistence: Langhan ML et al. 2011, Pediatr Emerg Care.',
      terms: [
        { channel: 'etco2', comparator: '>=', threshold: 50 },
        { channel: 'etco2', comparator: '>=', threshold: 10, relativeTo: 'baseline', relativeKind: 'absolute-delta' },
      ],
      combine: 'any',
      minDurationS: 30,
    },
    {
      id: 'low_etco2',
      description: 'Low EtCO2 with breaths present: EtCO2 ≤ baseline − 10 mmHg and ≥ 5 mmHg for at least 30 s.',
      source:
        'Falling EtCO2 with breaths present: hypopneic hypoventilation, hyperventilation, or more dead space / less perfusion (Krauss B, Hess DR 2007, Ann Emerg Med 50:172-181, from memory).',
      terms: [
        { channel: 'etco2', comparator: '<=', threshold: -10, relativeTo: 'baseline', relativeKind: 'absolute-delta' },
        { channel: 'etco2', comparator: '>=', threshold: 5 },
      ],
      combine: 'all',
      minDurationS: 30,
    },
    {
      id: 'bradypnea',
      description: 'Bradypnea: 0 < RR < 8 /min for at least 30 s.',
      source: 'Conway A et al. 2019, J Clin Monit Comput (RR < 8 /min); duration: common practice.',
      terms: [
        { channel: 'rr', comparator: '<', threshold: 8 },
        { channel: 'rr', comparator: '>', threshold: 0 },
      ],
      combine: 'all',
      minDurationS: 30,
    },
    {
      id: 'hypoxemia',
      description: 'Hypoxemia: SpO2 < 90 % for at least 15 s.',
      source: 'Qadeer MA et al. 2009, Gastroenterology 136:1568-76 (from memory, moderate confidence).',
      terms: [{ channel: 'spo2', comparator: '<', threshold: 90 }],
      combine: 'any',
      minDurationS: 15,
    },
    {
      id: 'severe_hypoxemia',
      description: 'Severe hypoxemia: SpO2 < 85 % for any covered time.',
      source: 'Friedrich-Rust M et al. 2014, Endoscopy 46:236-44; Beitz A et al. 2012, Am J Gastroenterol.',
      terms: [{ channel: 'spo2', comparator: '<', threshold: 85 }],
      combine: 'any',
      minDurationS: 0,
    },
    {
      id: 'prolonged_hypoxemia',
      description: 'Prolonged hypoxemia: SpO2 < 90 % for at least 60 s.',
      source: 'Mason KP et al. 2012, Br J Anaesth 108:13-20 (their "> 60 s"; Plateau compares every duration with ≥).',
      terms: [{ channel: 'spo2', comparator: '<', threshold: 90 }],
      combine: 'any',
      minDurationS: 60,
      major: true,
    },
    {
      id: 'critical_hypoxemia',
      description: 'Critical hypoxemia: SpO2 < 75 % for any covered time.',
      source: 'Mason KP et al. 2012, Br J Anaesth 108:13-20.',
      terms: [{ channel: 'spo2', comparator: '<', threshold: 75 }],
      combine: 'any',
      minDurationS: 0,
      major: true,
    },
  ],
});

const DEITCH = 'Deitch K, Miner J et al. 2010, Ann Emerg Med 55:258-64 (abstract)';

/**
 * Deitch 2010: respiratory depression = EtCO2 > 50 mmHg, a 10 % change from baseline, or loss of
 * waveform; hypoxia SpO2 < 93 %. The abstract does not say whether the 10 % is relative or
 * absolute; this set reads it as relative (percent of baseline) in either direction.
 */
export const DEITCH_2010_V1: RuleSet = deepFreeze({
  id: 'deitch-2010',
  version: 1,
  description: 'Deitch et al. 2010 definitions (adult emergency sedation with propofol), 10 % read as relative.',
  rules: [
    {
      id: 'respiratory_depression',
      description: 'EtCO2 > 50 mmHg, a change of ≥ 10 % from baseline either way, or loss of waveform (EtCO2 < 5 mmHg), any covered time.',
      source: `${DEITCH}: EtCO2 > 50 mmHg, a 10 % change from baseline, or loss of waveform. Relative reading of the 10 %, loss of waveform as EtCO2 < 5 mmHg and no minimum duration (none stated; data logged every 5 s): Plateau's choices.`,
      terms: [
        { channel: 'etco2', comparator: '>', threshold: 50 },
        { channel: 'etco2', comparator: '>=', threshold: 10, relativeTo: 'baseline', relativeKind: 'percent' },
        { channel: 'etco2', comparator: '<=', threshold: -10, relativeTo: 'baseline', relativeKind: 'percent' },
        etco2Below5,
      ],
      combine: 'any',
      minDurationS: 0,
    },
    {
      id: 'hypoxia',
      description: 'SpO2 < 93 %, any covered time.',
      source: `${DEITCH}: hypoxia SpO2 < 93 %. No minimum duration stated: Plateau's choice.`,
      terms: [{ channel: 'spo2', comparator: '<', threshold: 93 }],
      combine: 'any',
      minDurationS: 0,
    },
  ],
});

const CONWAY = 'Conway A et al. 2019, J Clin Monit Comput (moderate sedation)';

/** Conway 2019: apnea = EtCO2 of zero (> 20 s in a sensitivity analysis); hypopnea > 10 % rise or fall; bradypnea RR < 8. */
export const CONWAY_2019_V1: RuleSet = deepFreeze({
  id: 'conway-2019',
  version: 1,
  description: 'Conway et al. 2019 capnography definitions (moderate sedation).',
  rules: [
    {
      id: 'apnea',
      description: 'EtCO2 of zero, any covered time.',
      source: `${CONWAY}: apnea = EtCO2 of zero.`,
      terms: [{ channel: 'etco2', comparator: '=', threshold: 0 }],
      combine: 'any',
      minDurationS: 0,
    },
    {
      id: 'apnea_20s',
      description: 'EtCO2 of zero for at least 20 s (sensitivity analysis).',
      source: `${CONWAY}: apnea > 20 s in a sensitivity analysis (compared with ≥ here).`,
      terms: [{ channel: 'etco2', comparator: '=', threshold: 0 }],
      combine: 'any',
      minDurationS: 20,
    },
    {
      id: 'hypopnea',
      description: 'EtCO2 more than 10 % above or below baseline, any covered time.',
      source: `${CONWAY}: hypopnea = > 10 % rise or fall from baseline EtCO2.`,
      terms: [
        { channel: 'etco2', comparator: '>', threshold: 10, relativeTo: 'baseline', relativeKind: 'percent' },
        { channel: 'etco2', comparator: '<', threshold: -10, relativeTo: 'baseline', relativeKind: 'percent' },
      ],
      combine: 'any',
      minDurationS: 0,
    },
    {
      id: 'bradypnea',
      description: 'Capnography RR < 8 /min, any covered time.',
      source: `${CONWAY}: bradypnea = capnography RR < 8 /min.`,
      terms: [{ channel: 'rr', comparator: '<', threshold: 8 }],
      combine: 'any',
      minDurationS: 0,
    },
  ],
});

const MASON = 'Mason KP et al. 2012, Br J Anaesth 108:13-20';

/**
 * Mason 2012 task-force numbers: desaturation < 90 % (serious when > 60 s or < 75 % at any time),
 * apnea (serious when > 60 s). Mason gives no capnographic apnea threshold; the EtCO2 < 5 mmHg or
 * RR = 0 condition is plateau-default's.
 */
export const MASON_2012_V1: RuleSet = deepFreeze({
  id: 'mason-2012',
  version: 1,
  description: 'Mason et al. 2012 sedation task-force desaturation and apnea numbers.',
  rules: [
    {
      id: 'desaturation',
      description: 'SpO2 < 90 %, any covered time (minor when 75–90 % for < 60 s).',
      source: `${MASON}: desaturation 75–90 % for < 60 s is minor.`,
      terms: [{ channel: 'spo2', comparator: '<', threshold: 90 }],
      combine: 'any',
      minDurationS: 0,
    },
    {
      id: 'prolonged_desaturation',
      description: 'SpO2 < 90 % for at least 60 s.',
      source: `${MASON}: < 90 % for > 60 s is among the most serious (compared with ≥ here).`,
      terms: [{ channel: 'spo2', comparator: '<', threshold: 90 }],
      combine: 'any',
      minDurationS: 60,
      major: true,
    },
    {
      id: 'critical_desaturation',
      description: 'SpO2 < 75 %, any covered time.',
      source: `${MASON}: desaturation < 75 % at any time is among the most serious.`,
      terms: [{ channel: 'spo2', comparator: '<', threshold: 75 }],
      combine: 'any',
      minDurationS: 0,
      major: true,
    },
    {
      id: 'apnea',
      description: 'EtCO2 < 5 mmHg or RR = 0 for at least 20 s (apnea not prolonged: minor).',
      source: `${MASON}: apnea not prolonged is minor. Condition and 20 s minimum from plateau-default (Mason gives neither).`,
      terms: [etco2Below5, rrZero],
      combine: 'any',
      minDurationS: 20,
    },
    {
      id: 'prolonged_apnea',
      description: 'EtCO2 < 5 mmHg or RR = 0 for at least 60 s.',
      source: `${MASON}: apnea > 60 s is among the most serious (compared with ≥ here). Condition from plateau-default.`,
      terms: [etco2Below5, rrZero],
      combine: 'any',
      minDurationS: 60,
      major: true,
    },
  ],
});

const HART = 'Hart LS et al. 1997, Pediatr Emerg Care 13:189-93';

/** Hart 1997: respiratory depression = SpO2 ≤ 90 % for > 1 min or any EtCO2 ≥ 50 mmHg. */
export const HART_1997_V1: RuleSet = deepFreeze({
  id: 'hart-1997',
  version: 1,
  description: 'Hart et al. 1997 respiratory-depression definition (paediatric sedation).',
  rules: [
    {
      id: 'hypoxemia',
      description: 'SpO2 ≤ 90 % for at least 60 s.',
      source: `${HART}: SpO2 ≤ 90 % for > 1 min (compared with ≥ here).`,
      terms: [{ channel: 'spo2', comparator: '<=', threshold: 90 }],
      combine: 'any',
      minDurationS: 60,
    },
    {
      id: 'hypercapnia',
      description: 'EtCO2 ≥ 50 mmHg, any covered time.',
      source: `${HART}: any EtCO2 ≥ 50 mmHg.`,
      terms: [{ channel: 'etco2', comparator: '>=', threshold: 50 }],
      combine: 'any',
      minDurationS: 0,
    },
  ],
});

const BURTON = 'Burton JH et al. 2006, Acad Emerg Med 13:500-4';

/** Burton 2006: SpO2 ≤ 92 % (found); EtCO2 ≥ 50 mmHg, an absolute 10 mmHg change, loss of waveform (from memory). */
export const BURTON_2006_V1: RuleSet = deepFreeze({
  id: 'burton-2006',
  version: 1,
  description: 'Burton et al. 2006 acute respiratory events (EtCO2 criteria from memory).',
  rules: [
    {
      id: 'hypoxia',
      description: 'SpO2 ≤ 92 %, any covered time.',
      source: `${BURTON}: SpO2 ≤ 92 % (found). No minimum duration: Plateau's choice.`,
      terms: [{ channel: 'spo2', comparator: '<=', threshold: 92 }],
      combine: 'any',
      minDurationS: 0,
    },
    {
      id: 'capnographic_change',
      description: 'EtCO2 ≥ 50 mmHg or ≥ 10 mmHg away from baseline either way, any covered time.',
      source: `${BURTON}: EtCO2 ≥ 50 mmHg or an absolute change of 10 mmHg (from memory).`,
      terms: [
        { channel: 'etco2', comparator: '>=', threshold: 50 },
        { channel: 'etco2', comparator: '>=', threshold: 10, relativeTo: 'baseline', relativeKind: 'absolute-delta' },
        { channel: 'etco2', comparator: '<=', threshold: -10, relativeTo: 'baseline', relativeKind: 'absolute-delta' },
      ],
      combine: 'any',
      minDurationS: 0,
    },
    {
      id: 'loss_of_waveform',
      description: 'EtCO2 < 5 mmHg, any covered time.',
      source: `${BURTON}: loss of waveform (from memory); read as EtCO2 < 5 mmHg, Plateau's choice.`,
      terms: [etco2Below5],
      combine: 'any',
      minDurationS: 0,
    },
  ],
});

/** Id of the rule set the engine uses when a case names none. */
export const DEFAULT_RULE_SET_ID = 'plateau-default';

const BUILT_IN: readonly RuleSet[] = Object.freeze([PLATEAU_DEFAULT_V1, DEITCH_2010_V1, CONWAY_2019_V1, MASON_2012_V1, HART_1997_V1, BURTON_2006_V1]);

/**
 * Every built-in rule set (each version), default first.
 *
 * @example
 * listBuiltInRuleSets().map((s) => `${s.id}@${s.version}`)
 * //=> ['plateau-default@1', 'deitch-2010@1', 'conway-2019@1', 'mason-2012@1', 'hart-1997@1', 'burton-2006@1']
 */
export function listBuiltInRuleSets(): readonly RuleSet[] {
  return BUILT_IN;
}

/**
 * A built-in rule set by id, at `version` or else its latest version; undefined when unknown.
 *
 * @example
 * getBuiltInRuleSet('plateau-default')?.rules.length
 * //=> 9
 */
export function getBuiltInRuleSet(id: string, version?: number): RuleSet | undefined {
  let best: RuleSet | undefined;
  for (const set of BUILT_IN) {
    if (set.id !== id) continue;
    if (version !== undefined) {
      if (set.version === version) return set;
    } else if (best === undefined || set.version > best.version) {
      best = set;
    }
  }
  return best;
}

/**
 * The rule of a set by id.
 *
 * @example
 * findRule(PLATEAU_DEFAULT_V1, 'hypoxemia')?.minDurationS
 * //=> 15
 */
export function findRule(ruleSet: RuleSet, ruleId: string): Rule | undefined {
  return ruleSet.rules.find((r) => r.id === ruleId);
}
