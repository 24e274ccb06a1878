/**
 * The safety-indicator catalogue as data. A catalogue version is frozen: a definition never
 * changes in place. Changing a definition, a cut-off or the rule set means a new catalogue
 * version added beside the old one, so every issued report can be reproduced from the version it
 * names (docs/indicators.md).
 *
 * Every indicator counts *cases*, not episodes, among the signed cases of a period and scope
 * (the loader, lib/db/statsRows, gives only signed cases). Each indicator's population is a list
 * of criteria that must all hold; a case that fails one is excluded from that indicator and
 * counted under the first criterion it fails. Pure: no I/O.
 */
import type { StatsRow } from '@/lib/domain/statsRow';
import type { RuleSetRef } from '@/lib/domain/ruleSet';

export type IndicatorUnit = 'per100' | 'per1000' | 'percent' | 'seconds';

export interface Criterion {
  id: string;
  /** What the criterion keeps, in words ("planned depth moderate or deep"). */
  text: string;
  /** The exclusion reason shown for cases that fail it ("planned minimal sedation"). */
  excluded: string;
  /**
   * True when the criterion is itself an event (e.g. "had an apnoea episode"): the number of
   * cases it excludes is a count of patients with or without an event, so reports never
   * publish it (it would undo small-cell suppression elsewhere).
   */
  event?: boolean;
  test: (row: StatsRow) => boolean;
}

interface IndicatorBase {
  /** Stable id, the CSV/JSON key (snake_case). */
  id: string;
  title: string;
  /** The definition in words, printed beneath every table. */
  definition: string;
  unit: IndicatorUnit;
  /** Denominator: every criterion must hold (inclusion); a case failing one is excluded. */
  population: readonly Criterion[];
  /** Direction of improvement, for reading the trend. */
  higherIsBetter: boolean;
  /** Where the definition comes from (references.md wording: found / from memory / common practice). */
  sources: readonly string[];
}

/** Cases with the event among the population, as a rate per 100 / 1,000 cases or a %. */
export interface ProportionIndicator extends IndicatorBase {
  kind: 'proportion';
  unit: 'per100' | 'per1000' | 'percent';
  numerator: { text: string; test: (row: StatsRow) => boolean };
}

/** A quantile of one number per case (seconds) among the population. */
export interface QuantileIndicator extends IndicatorBase {
  kind: 'quantile';
  unit: 'seconds';
  /** 0.5 for the median, 0.9 for the 90th percentile (Hyndman & Fan type 7, lib/stats). */
  p: number;
  value: { text: string; of: (row: StatsRow) => number | null };
}

export type Indicator = ProportionIndicator | QuantileIndicator;

export interface Catalogue {
  version: number;
  /** The rule set whose stored per-case summaries every indicator reads. */
  ruleSet: RuleSetRef;
  /** Who every indicator starts from, in words. */
  base: string;
  indicators: readonly Indicator[];
}

/** Longest allowed gap between manual BP/HR readings during sedation: 5 min plus 30 s tolerance. */
export const VITALS_GAP_LIMIT_S = 330;
/** Share of the sedation time that capnography must cover. */
export const CAPNOGRAPHY_COVERAGE_PCT = 90;

const SEDATION_DEPTHS = ['minimal', 'moderate', 'deep'];

function deepFreeze<T>(o: T): T {
  if (o && typeof o === 'object' && !Object.isFrozen(o)) {
    Object.freeze(o);
    for (const v of Object.values(o as Record<string, unknown>)) deepFreeze(v);
  }
  return o;
}

function episodes(r: StatsRow, rule: string): number {
  return r.summary?.rules[rule]?.episodes ?? 0;
}

function hasAny(r: StatsRow, kinds: readonly string[]): boolean {
  return r.interventions.some((k) => kinds.includes(k));
}

/** Catalogue version 1: rule set plateau-default version 1 (rules.md §4). */
function catalogueV1(): Catalogue {
  const ruleSet = { id: 'plateau-default', version: 1 };
  const rs = `${ruleSet.id} v${ruleSet.version}`;
  const sedation: Criterion = {
    id: 'sedation',
    text: 'planned depth minimal, moderate or deep (procedural sedation)',
    excluded: 'planned general anaesthesia or depth not recorded',
    test: (r) => SEDATION_DEPTHS.includes(r.plannedDepth),
  };
  const moderateOrDeep: Criterion = {
    id: 'moderate_or_deep',
    text: 'planned depth moderate or deep',
    excluded: 'planned minimal sedation, general anaesthesia or depth not recorded',
    test: (r) => r.plannedDepth === 'moderate' || r.plannedDepth === 'deep',
  };
  const summary: Criterion = {
    id: 'summary',
    text: `a stored analysis (case summary) for rule set ${rs}`,
    excluded: `no case summary for rule set ${rs}`,
    test: (r) => r.summary !== null && r.summary.ruleSetId === ruleSet.id && r.summary.ruleSetVersion === ruleSet.version,
  };
  const spo2: Criterion = {
    id: 'spo2_monitored',
    text: 'at least one valid SpO2 reading (probe-off and 0 % readings do not count)',
    excluded: 'no valid SpO2 reading',
    test: (r) => r.summary?.lowestSpo2 != null,
  };
  const capno: Criterion = {
    id: 'capnography_monitored',
    text: 'EtCO2 monitored for part of the sedation time (capnography coverage > 0 %)',
    excluded: 'no capnography during the sedation time, or no sedation time recorded',
    test: (r) => (r.summary?.capnoCoveragePct ?? 0) > 0,
  };
  const sedationTime: Criterion = {
    id: 'sedation_time',
    text: 'a sedation time (start and end) that capnography coverage can be measured against',
    excluded: 'no sedation time recorded',
    test: (r) => r.summary?.capnoCoveragePct != null,
  };
  const hadApnea: Criterion = {
    id: 'apnea_episode',
    text: `at least one apnea episode (rule apnea of ${rs})`,
    excluded: 'no apnea episode',
    event: true,
    test: (r) => episodes(r, 'apnea') > 0,
  };
  const responded: Criterion = {
    id: 'apnea_response_recorded',
    text: 'an intervention recorded between the first apnea episode’s onset and 60 s after its end',
    excluded: 'first apnea episode without a recorded intervention',
    event: true,
    test: (r) => r.summary?.firstApneaResponseS != null,
  };
  const ppv = ['bag_mask', 'supraglottic_airway', 'intubation'] as const;
  const reversal = ['naloxone', 'flumazenil'] as const;
  const mason = 'Mason KP et al. 2012, Br J Anaesth 108:13-20 (found)';
  const roback = 'Roback MG et al. 2018, Br J Anaesth 120:164-172 (found)';

  const indicators: Indicator[] = [
    {
      kind: 'proportion',
      id: 'hypoxemia',
      title: 'Cases with hypoxaemia',
      definition: `Sedation cases with at least one hypoxaemia episode — SpO2 < 90 % for ≥ 15 s (rule hypoxemia of ${rs}) — per 100 sedation cases monitored with SpO2.`,
      unit: 'per100',
      population: [sedation, summary, spo2],
      numerator: { text: `≥ 1 episode of rule hypoxemia (SpO2 < 90 % for ≥ 15 s)`, test: (r) => episodes(r, 'hypoxemia') > 0 },
      higherIsBetter: false,
      sources: ['Qadeer MA et al. 2009, Gastroenterology 136:1568-76 (from memory, moderate confidence)'],
    },
    {
      kind: 'proportion',
      id: 'severe_hypoxemia',
      title: 'Cases with severe hypoxaemia',
      definition: `Sedation cases with any observed time at SpO2 < 85 % (rule severe_hypoxemia of ${rs}) per 100 sedation cases monitored with SpO2.`,
      unit: 'per100',
      population: [sedation, summary, spo2],
      numerator: { text: '≥ 1 episode of rule severe_hypoxemia (SpO2 < 85 %, any covered time)', test: (r) => episodes(r, 'severe_hypoxemia') > 0 },
      higherIsBetter: false,
      sources: ['Friedrich-Rust M et al. 2014, Endoscopy 46:236-44 (found)', 'Beitz A et al. 2012, Am J Gastroenterol (found)'],
    },
    {
      kind: 'proportion',
      id: 'apnea',
      title: 'Cases with apnoea ≥ 20 s',
      definition: `Sedation cases with at least one apnoea episode — EtCO2 < 5 mmHg or RR = 0 for ≥ 20 s (rule apnea of ${rs}) — per 100 sedation cases monitored with capnography.`,
      unit: 'per100',
      population: [sedation, summary, capno],
      numerator: { text: '≥ 1 episode of rule apnea (EtCO2 < 5 mmHg or RR = 0 for ≥ 20 s)', test: (r) => episodes(r, 'apnea') > 0 },
      higherIsBetter: false,
      sources: ['Conway A et al. 2019, J Clin Monit Comput (apnea > 20 s; found)'],
    },
    {
      kind: 'proportion',
      id: 'prolonged_apnea',
      title: 'Cases with prolonged apnoea (≥ 60 s)',
      definition: `Sedation cases with at least one apnoea episode of ≥ 60 s (rule prolonged_apnea of ${rs}) per 100 sedation cases monitored with capnography.`,
      unit: 'per100',
      population: [sedation, summary, capno],
      numerator: { text: '≥ 1 episode of rule prolonged_apnea (EtCO2 < 5 mmHg or RR = 0 for ≥ 60 s)', test: (r) => episodes(r, 'prolonged_apnea') > 0 },
      higherIsBetter: false,
      sources: [mason],
    },
    {
      kind: 'proportion',
      id: 'positive_pressure_ventilation',
      title: 'Cases with bag-mask or other positive-pressure ventilation',
      definition: 'Sedation cases with a recorded bag-mask ventilation, supraglottic airway or tracheal intubation (each delivers positive-pressure ventilation) per 1,000 sedation cases.',
      unit: 'per1000',
      population: [sedation],
      numerator: { text: 'an intervention bag_mask, supraglottic_airway or intubation recorded (not voided)', test: (r) => hasAny(r, ppv) },
      higherIsBetter: false,
      sources: [roback, mason],
    },
    {
      kind: 'proportion',
      id: 'reversal_agent',
      title: 'Cases given a reversal agent',
      definition: 'Sedation cases with naloxone or flumazenil recorded as an intervention per 1,000 sedation cases.',
      unit: 'per1000',
      population: [sedation],
      numerator: { text: 'an intervention naloxone or flumazenil recorded (not voided)', test: (r) => hasAny(r, reversal) },
      higherIsBetter: false,
      sources: [roback, mason],
    },
    {
      kind: 'proportion',
      id: 'level_supported_or_above',
      title: 'Cases at level supported or above',
      definition: `Sedation cases whose case level (rules.md §6, from the stored analysis of ${rs}) is supported or rescued, per 100 sedation cases.`,
      unit: 'per100',
      population: [sedation, summary],
      numerator: { text: 'case level supported or rescued', test: (r) => r.summary?.caseLevel === 'supported' || r.summary?.caseLevel === 'rescued' },
      higherIsBetter: false,
      sources: ['Plateau levels (rules.md §6), grading by the intervention needed after Mason KP et al. 2012'],
    },
    {
      kind: 'proportion',
      id: 'level_rescued',
      title: 'Cases at level rescued',
      definition: `Sedation cases whose case level (rules.md §6, from the stored analysis of ${rs}) is rescued — tracheal intubation, chest compressions, unplanned ICU admission or transfer, or death — per 1,000 sedation cases.`,
      unit: 'per1000',
      population: [sedation, summary],
      numerator: { text: 'case level rescued', test: (r) => r.summary?.caseLevel === 'rescued' },
      higherIsBetter: false,
      sources: ['Plateau levels (rules.md §6), grading by the intervention needed after Mason KP et al. 2012'],
    },
    {
      kind: 'proportion',
      id: 'procedure_stopped',
      title: 'Procedures stopped early because of sedation',
      definition: 'Sedation cases with the intervention “procedure stopped early” recorded (the bedside records it only as a response to a sedation problem) per 1,000 sedation cases.',
      unit: 'per1000',
      population: [sedation],
      numerator: { text: 'an intervention procedure_stopped recorded (not voided)', test: (r) => r.interventions.includes('procedure_stopped') },
      higherIsBetter: false,
      sources: [roback],
    },
    {
      kind: 'proportion',
      id: 'capnography_90',
      title: 'Capnography for ≥ 90 % of sedation time (moderate and deep sedation)',
      definition: `Moderate and deep sedation cases whose EtCO2 monitor samples cover ≥ ${CAPNOGRAPHY_COVERAGE_PCT} % of the sedation time (capnography coverage of the stored analysis, ${rs}), as a % of moderate and deep sedation cases with a recorded sedation time.`,
      unit: 'percent',
      population: [moderateOrDeep, summary, sedationTime],
      numerator: { text: `capnography coverage ≥ ${CAPNOGRAPHY_COVERAGE_PCT} % of the sedation time`, test: (r) => (r.summary?.capnoCoveragePct ?? 0) >= CAPNOGRAPHY_COVERAGE_PCT },
      higherIsBetter: true,
      sources: [
        'ASA Standards for Basic Anesthetic Monitoring, capnography for moderate and deep sedation since 1 July 2011 (found)',
        'Klein AA et al. 2021, Anaesthesia, UK and Ireland recommendations for standards of monitoring (from memory)',
      ],
    },
    {
      kind: 'proportion',
      id: 'documentation_complete',
      title: 'Documentation complete (moderate and deep sedation)',
      definition: `Moderate and deep sedation cases with ASA class, weight and all STOP-Bang questions recorded, and a manual BP or HR reading at least every 5 minutes of the sedation time (no gap longer than ${VITALS_GAP_LIMIT_S} s = 5 min + 30 s tolerance, counted from sedation start to sedation end), as a % of moderate and deep sedation cases.`,
      unit: 'percent',
      population: [moderateOrDeep],
      numerator: {
        text: `ASA class, weight and STOP-Bang recorded, and longest gap between manual BP/HR readings during sedation ≤ ${VITALS_GAP_LIMIT_S} s (no recorded sedation time counts as incomplete)`,
        test: (r) =>
          r.documentation.asaClass &&
          r.documentation.weight &&
          r.documentation.stopBang &&
          r.documentation.longestVitalsGapS !== null &&
          r.documentation.longestVitalsGapS <= VITALS_GAP_LIMIT_S,
      },
      higherIsBetter: true,
      sources: [
        'ASA 2018 practice guideline for moderate procedural sedation, Anesthesiology 128:437-79 (5-minute wording from memory)',
        'STOP-Bang: Chung F et al. 2008, Anesthesiology 108:812-21 (found)',
      ],
    },
    {
      kind: 'quantile',
      id: 'apnea_response_median',
      title: 'Time from apnoea onset to first intervention — median',
      definition: `Median, over sedation cases with an apnoea episode (rule apnea of ${rs}) and an intervention recorded for it, of the seconds from the onset of the case’s first apnoea episode to the first intervention recorded between that onset and 60 s after the episode’s end.`,
      unit: 'seconds',
      p: 0.5,
      population: [sedation, summary, capno, hadApnea, responded],
      value: { text: 'seconds from the first apnoea episode’s onset to the first intervention (responseS, rules.md §5)', of: (r) => r.summary?.firstApneaResponseS ?? null },
      higherIsBetter: false,
      sources: ['Episode response time: rules.md §5', 'Quantile: Hyndman & Fan 1996 type 7 (lib/stats)'],
    },
    {
      kind: 'quantile',
      id: 'apnea_response_p90',
      title: 'Time from apnoea onset to first intervention — 90th percentile',
      definition: `90th percentile, over sedation cases with an apnoea episode (rule apnea of ${rs}) and an intervention recorded for it, of the seconds from the onset of the case’s first apnoea episode to the first intervention recorded between that onset and 60 s after the episode’s end.`,
      unit: 'seconds',
      p: 0.9,
      population: [sedation, summary, capno, hadApnea, responded],
      value: { text: 'seconds from the first apnoea episode’s onset to the first intervention (responseS, rules.md §5)', of: (r) => r.summary?.firstApneaResponseS ?? null },
      higherIsBetter: false,
      sources: ['Episode response time: rules.md §5', 'Quantile: Hyndman & Fan 1996 type 7 (lib/stats)'],
    },
  ];
  return {
    version: 1,
    ruleSet,
    base: 'Signed (completed) cases whose scheduled date (in the unit’s time zone) lies in the period, in the units of the scope.',
    indicators,
  };
}

const CATALOGUES: ReadonlyMap<number, Catalogue> = new Map([[1, deepFreeze(catalogueV1())]]);

/** The catalogue version new reports use. */
export const CURRENT_CATALOGUE_VERSION = 1;

/**
 * A catalogue by version; throws RangeError for an unknown version.
 * @example getCatalogue(1).indicators.length //=> 13
 */
export function getCatalogue(version: number = CURRENT_CATALOGUE_VERSION): Catalogue {
  const c = CATALOGUES.get(version);
  if (!c) throw new RangeError(`catalogue version ${version} does not exist (known: ${[...CATALOGUES.keys()].join(', ')})`);
  return c;
}

/** Every catalogue version, oldest first. */
export function catalogueVersions(): number[] {
  return [...CATALOGUES.keys()].sort((a, b) => a - b);
}

/** An indicator's definition as plain data (what reports store and print). */
export interface IndicatorDefinition {
  id: string;
  title: string;
  kind: Indicator['kind'];
  /** The quantile of a quantile indicator (0.5, 0.9); null for proportions. */
  p: number | null;
  unit: IndicatorUnit;
  definition: string;
  numerator: string;
  denominator: string;
  inclusion: string[];
  higherIsBetter: boolean;
  sources: string[];
}

/** The words of an indicator, without its functions. */
export function describeIndicator(ind: Indicator, catalogue: Catalogue): IndicatorDefinition {
  const inclusion = [catalogue.base.replace(/\.$/, ''), ...ind.population.map((c) => c.text)];
  return {
    id: ind.id,
    title: ind.title,
    kind: ind.kind,
    p: ind.kind === 'quantile' ? ind.p : null,
    unit: ind.unit,
    definition: ind.definition,
    numerator: ind.kind === 'proportion' ? ind.numerator.text : `${ind.p === 0.5 ? 'median' : `${Math.round(ind.p * 100)}th percentile`} of: ${ind.value.text}`,
    denominator: ind.kind === 'proportion' ? `cases meeting every inclusion criterion (${ind.population.map((c) => c.id).join(', ')})` : `cases meeting every inclusion criterion (n, the number of values)`,
    inclusion,
    higherIsBetter: ind.higherIsBetter,
    sources: [...ind.sources],
  };
}
