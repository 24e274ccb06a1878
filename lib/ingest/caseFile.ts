import { z } from 'zod';
import { CHANNELS, CHANNEL_SPECS, MMHG_PER_KPA, SAMPLE_SOURCES, SAMPLE_UNITS, type Channel, type SampleSource, type SampleUnit } from '@/lib/domain/channel';
import { CASE_EVENT_KINDS, type CaseEventEntry, type CaseRecord, type DoseEntry, type InterventionEntry, type SampleSeries } from '@/lib/domain/caseRecord';
import { DOSE_UNITS, DRUG_CLASSES, type DoseUnit, type DrugClass } from '@/lib/domain/drug';
import { INTERVENTION_KINDS, type InterventionKind } from '@/lib/domain/intervention';
import { ruleSetSchema, type RuleSet } from '@/lib/domain/ruleSet';

/**
 * Parser of the `plateau-case/1` JSON case file (rules.md §7) into a CaseRecord.
 *
 * zod checks the shape (objects, field names, scalar types); big arrays (`t`, `v`, `probeOff`)
 * are checked element by element in plain loops, which is many times faster than zod per element
 * on 100 000-sample series. The first problem found is thrown as a `CaseFileError` whose message
 * names the field path: `series[1].t[57]: times must increase (57.0 after 58.0)`.
 *
 * Probe-off is marked by an optional boolean array `probeOff` beside `v`, SpO2 series only, of the
 * same length (true where the probe was off; the value there is ignored but must still be in range).
 * Each channel has at most one `monitor` and one `manual` series. Times may be fractional and
 * negative (before case start); they must strictly increase within a series.
 */
export const CASE_FILE_FORMAT = 'plateau-case/1';

/**
 * A case file that cannot be read; `path` names the field, `problem` says what is wrong.
 *
 * @example
 * new CaseFileError('series[1].t[57]', 'times must increase (57.0 after 58.0)').message
 * //=> 'series[1].t[57]: times must increase (57.0 after 58.0)'
 */
export class CaseFileError extends Error {
  readonly path: string;
  readonly problem: string;

  constructor(path: string, problem: string) {
    super(`${path}: ${problem}`);
    this.name = 'CaseFileError';
    this.path = path;
    this.problem = problem;
  }
}

type PathSegment = string | number | symbol;

/**
 * A field path as messages show it; the empty path is `(root)`.
 *
 * @example
 * formatFieldPath(['series', 1, 't', 57])
 * //=> 'series[1].t[57]'
 */
export function formatFieldPath(segments: readonly PathSegment[], prefix = ''): string {
  let out = prefix;
  for (const s of segments) {
    if (typeof s === 'number') out += `[${s}]`;
    else out += out === '' ? String(s) : `.${String(s)}`;
  }
  return out === '' ? '(root)' : out;
}

/** Times and values in messages: whole numbers with one decimal (57.0), others as they are. */
function fmt(x: number): string {
  return Number.isInteger(x) ? x.toFixed(1) : String(x);
}

function describe(value: unknown): string {
  if (value === null) return 'null';
  if (Array.isArray(value)) return 'an array';
  if (typeof value === 'object') return 'an object';
  if (typeof value === 'string') return `string ${JSON.stringify(value.length > 40 ? `${value.slice(0, 40)}…` : value)}`;
  return `${typeof value} ${String(value)}`;
}

function valueAt(root: unknown, segments: readonly PathSegment[]): unknown {
  let x: unknown = root;
  for (const s of segments) {
    if (x === null || typeof x !== 'object') return undefined;
    x = (x as Record<PropertyKey, unknown>)[s as PropertyKey];
  }
  return x;
}

/** The first zod issue as a CaseFileError, in Plateau's wording. */
function fromZod(error: z.ZodError, root: unknown, prefix = ''): CaseFileError {
  const issue = error.issues[0];
  if (issue.code === 'unrecognized_keys') {
    return new CaseFileError(formatFieldPath([...issue.path, issue.keys[0]], prefix), 'unknown field');
  }
  const path = formatFieldPath(issue.path, prefix);
  if (issue.code === 'invalid_type') {
    const actual = valueAt(root, issue.path);
    if (actual === undefined) return new CaseFileError(path, `missing (expected ${issue.expected})`);
    return new CaseFileError(path, `expected ${issue.expected}, got ${describe(actual)}`);
  }
  if (issue.code === 'invalid_value') {
    const allowed = issue.values.map((x) => String(x)).join(', ');
    return new CaseFileError(path, `unknown value ${JSON.stringify(valueAt(root, issue.path))} (expected one of ${allowed})`);
  }
  if (issue.code === 'invalid_union') {
    return new CaseFileError(path, `expected a rule-set id or a rule-set object, got ${describe(valueAt(root, issue.path))}`);
  }
  return new CaseFileError(path, issue.message);
}

const anArray = z.custom<unknown[]>((x) => Array.isArray(x), { message: 'expected an array' });
const optionalNullableNumber = z.number().nullable().optional();

const caseFactsShape = z.strictObject({
  start: z.string(),
  weightKg: optionalNullableNumber,
  heightCm: optionalNullableNumber,
  etco2Unit: z.enum(['mmHg', 'kPa']).optional(),
  ageYears: optionalNullableNumber,
  sex: z.enum(['female', 'male', 'other', 'unknown']).nullable().optional(),
  asaClass: z.string().nullable().optional(),
  plannedDepth: z.enum(['minimal', 'moderate', 'deep', 'general']).nullable().optional(),
  procedure: z.string().nullable().optional(),
});

const seriesShape = z.strictObject({
  channel: z.string(),
  unit: z.string(),
  source: z.string(),
  t: anArray,
  v: anArray,
  probeOff: anArray.optional(),
});

const doseShape = z.strictObject({
  t: z.number(),
  drug: z.string().min(1, 'drug must not be empty'),
  amount: z.number(),
  unit: z.string(),
  route: z.string().min(1, 'route must not be empty'),
  drugClass: z.string().optional(),
});

const interventionShape = z.strictObject({ t: z.number(), kind: z.string(), note: z.string().optional() });
const eventShape = z.strictObject({ t: z.number(), kind: z.string(), note: z.string().optional() });

const caseFileShape = z.strictObject({
  format: z.string(),
  case: caseFactsShape,
  series: z.array(seriesShape),
  doses: z.array(doseShape).optional(),
  interventions: z.array(interventionShape).optional(),
  events: z.array(eventShape).optional(),
  ruleSet: z.union([z.string().min(1), z.record(z.string(), z.unknown())]).optional(),
});

const ISO_INSTANT = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:\d{2})$/;

function oneOf<T extends string>(allowed: readonly T[], value: string, path: string, what: string): T {
  if (!(allowed as readonly string[]).includes(value)) {
    throw new CaseFileError(path, `unknown ${what} ${JSON.stringify(value)} (expected one of ${allowed.join(', ')})`);
  }
  return value as T;
}

function checkTimes(t: unknown[], path: string): number[] {
  let prev = -Infinity;
  for (let j = 0; j < t.length; j++) {
    const x = t[j];
    if (typeof x !== 'number' || !Number.isFinite(x)) throw new CaseFileError(`${path}[${j}]`, `expected a number, got ${describe(x)}`);
    if (x <= prev) {
      throw new CaseFileError(`${path}[${j}]`, x === prev ? `times must increase (duplicate time ${fmt(x)})` : `times must increase (${fmt(x)} after ${fmt(prev)})`);
    }
    prev = x;
  }
  return t as number[];
}

function checkValues(v: unknown[], channel: Channel, unit: SampleUnit, path: string): number[] {
  const spec = CHANNEL_SPECS[channel];
  const factor = unit === 'kPa' ? MMHG_PER_KPA : 1;
  const engine = spec.units[0];
  const lo = spec.min;
  const hi = spec.max;
  for (let j = 0; j < v.length; j++) {
    const x = v[j];
    if (typeof x !== 'number' || !Number.isFinite(x)) throw new CaseFileError(`${path}[${j}]`, `expected a number, got ${describe(x)}`);
    const y = x * factor;
    if (!(y >= lo && y <= hi)) {
      const shown = factor === 1 ? `${x} ${unit}` : `${x} ${unit} (${Math.round(y * 100) / 100} ${engine})`;
      throw new CaseFileError(`${path}[${j}]`, `${shown} is outside the ${spec.label} range ${lo}–${hi} ${engine}`);
    }
  }
  return v as number[];
}

function checkProbeOff(p: unknown[], path: string): boolean[] {
  for (let j = 0; j < p.length; j++) {
    if (typeof p[j] !== 'boolean') throw new CaseFileError(`${path}[${j}]`, `expected a boolean, got ${describe(p[j])}`);
  }
  return p as boolean[];
}

function checkTime(x: number, path: string): number {
  if (!Number.isFinite(x)) throw new CaseFileError(path, `expected a finite number, got ${x}`);
  return x;
}

function parseSeries(raw: z.infer<typeof seriesShape>, i: number, seen: Map<string, number>): SampleSeries {
  const at = `series[${i}]`;
  const channel = oneOf(CHANNELS, raw.channel, `${at}.channel`, 'channel');
  const unit = oneOf(SAMPLE_UNITS, raw.unit, `${at}.unit`, 'unit');
  const allowed = CHANNEL_SPECS[channel].units;
  if (!allowed.includes(unit)) {
    throw new CaseFileError(`${at}.unit`, `unit ${JSON.stringify(unit)} is not allowed for ${channel} (allowed: ${allowed.join(', ')})`);
  }
  const source: SampleSource = oneOf(SAMPLE_SOURCES, raw.source, `${at}.source`, 'source');
  const key = `${channel}/${source}`;
  const earlier = seen.get(key);
  if (earlier !== undefined) {
    throw new CaseFileError(`${at}`, `a second ${source} series for ${channel} (series[${earlier}] is one already)`);
  }
  seen.set(key, i);
  const t = checkTimes(raw.t, `${at}.t`);
  if (raw.v.length !== t.length) {
    throw new CaseFileError(`${at}.v`, `length ${raw.v.length} does not match t (length ${t.length})`);
  }
  const v = checkValues(raw.v, channel, unit, `${at}.v`);
  const series: SampleSeries = { channel, unit, source, t, v };
  if (raw.probeOff !== undefined) {
    if (channel !== 'spo2') throw new CaseFileError(`${at}.probeOff`, `probeOff is only allowed on spo2 series, not ${channel}`);
    if (raw.probeOff.length !== t.length) {
      throw new CaseFileError(`${at}.probeOff`, `length ${raw.probeOff.length} does not match t (length ${t.length})`);
    }
    series.probeOff = checkProbeOff(raw.probeOff, `${at}.probeOff`);
  }
  return series;
}

/**
 * Validate a rule-set object (`ruleSetSchema`), naming the field under `prefix` on failure.
 *
 * @example
 * parseRuleSetValue({ id: 'x', version: 0, description: 'd', rules: [] })
 * //=> throws CaseFileError 'version: Too small: expected number to be >=1'
 */
export function parseRuleSetValue(value: unknown, prefix = ''): RuleSet {
  const r = ruleSetSchema.safeParse(value);
  if (!r.success) throw fromZod(r.error, value, prefix);
  return r.data;
}

function parseJson(text: string): unknown {
  try {
    return JSON.parse(text) as unknown;
  } catch (e) {
    throw new CaseFileError('(json)', `malformed JSON (${(e as Error).message})`);
  }
}

/**
 * Parse a rule-set JSON file (the `--rules <file>` of `npm run analyze`).
 *
 * @example
 * parseRuleSetFile('{"id":"local","version":1,"description":"d","rules":[…]}').id
 * //=> 'local'
 */
export function parseRuleSetFile(text: string): RuleSet {
  return parseRuleSetValue(parseJson(text));
}

/**
 * Validate an already-decoded `plateau-case/1` object into a CaseRecord (for JSON request bodies).
 * Throws `CaseFileError` naming the first bad field.
 *
 * @example
 * parseCaseObject({ format: 'plateau-case/2' })
 * //=> throws CaseFileError 'format: unknown format "plateau-case/2" (expected "plateau-case/1")'
 */
export function parseCaseObject(value: unknown): CaseRecord {
  if (value === null || typeof value !== 'object' || Array.isArray(value)) {
    throw new CaseFileError('(root)', `expected an object, got ${describe(value)}`);
  }
  const format = (value as Record<string, unknown>).format;
  if (format !== CASE_FILE_FORMAT) {
    throw new CaseFileError('format', format === undefined ? `missing (expected "${CASE_FILE_FORMAT}")` : `unknown format ${JSON.stringify(format)} (expected "${CASE_FILE_FORMAT}")`);
  }
  const shape = caseFileShape.safeParse(value);
  if (!shape.success) throw fromZod(shape.error, value);
  const raw = shape.data;

  if (!ISO_INSTANT.test(raw.case.start) || Number.isNaN(Date.parse(raw.case.start))) {
    throw new CaseFileError('case.start', `expected an ISO 8601 instant with a zone like "2026-03-02T09:00:00Z", got ${describe(raw.case.start)}`);
  }
  for (const key of ['weightKg', 'heightCm', 'ageYears'] as const) {
    const x = raw.case[key];
    if (x !== undefined && x !== null && !(x >= 0)) throw new CaseFileError(`case.${key}`, `must not be negative (${x})`);
  }
  const { etco2Unit, start, ...facts } = raw.case;

  const seen = new Map<string, number>();
  const series = raw.series.map((s, i) => parseSeries(s, i, seen));

  const doses: DoseEntry[] = (raw.doses ?? []).map((d, i) => {
    const at = `doses[${i}]`;
    const dose: DoseEntry = {
      t: checkTime(d.t, `${at}.t`),
      drug: d.drug,
      amount: d.amount,
      unit: oneOf<DoseUnit>(DOSE_UNITS, d.unit, `${at}.unit`, 'dose unit'),
      route: d.route,
    };
    if (!(d.amount >= 0)) throw new CaseFileError(`${at}.amount`, `must not be negative (${d.amount})`);
    if (d.drugClass !== undefined) dose.drugClass = oneOf<DrugClass>(DRUG_CLASSES, d.drugClass, `${at}.drugClass`, 'drug class');
    return dose;
  });

  const interventions: InterventionEntry[] = (raw.interventions ?? []).map((x, i) => {
    const entry: InterventionEntry = {
      t: checkTime(x.t, `interventions[${i}].t`),
      kind: oneOf<InterventionKind>(INTERVENTION_KINDS, x.kind, `interventions[${i}].kind`, 'intervention kind'),
    };
    if (x.note !== undefined) entry.note = x.note;
    return entry;
  });

  const events: CaseEventEntry[] = (raw.events ?? []).map((x, i) => ({
    t: checkTime(x.t, `events[${i}].t`),
    kind: oneOf(CASE_EVENT_KINDS, x.kind, `events[${i}].kind`, 'event kind'),
    ...(x.note !== undefined ? { note: x.note } : {}),
  }));

  const record: CaseRecord = {
    case: { ...facts, start: start.endsWith('Z') ? start : new Date(start).toISOString(), etco2Unit: etco2Unit ?? 'mmHg' },
    series,
    doses,
    interventions,
    events,
  };
  if (raw.ruleSet !== undefined) {
    record.ruleSet = typeof raw.ruleSet === 'string' ? raw.ruleSet : parseRuleSetValue(raw.ruleSet, 'ruleSet');
  }
  return record;
}

/**
 * Parse the text of a `plateau-case/1` file into a CaseRecord, or throw a `CaseFileError` naming
 * the first bad field.
 *
 * @example
 * parseCaseFile('{"format":"plateau-case/1","case":{"start":"2026-03-02T09:00:00Z"},"series":[{"channel":"rr","unit":"/min","source":"monitor","t":[0,2,1],"v":[14,14,14]}]}')
 * //=> throws CaseFileError 'series[0].t[2]: times must increase (1.0 after 2.0)'
 */
export function parseCaseFile(text: string): CaseRecord {
  return parseCaseObject(parseJson(text));
}
