import Papa from 'papaparse';
import { z } from 'zod';
import { CHANNELS, CHANNEL_SPECS, MMHG_PER_KPA, type Channel, type SampleUnit } from '@/lib/domain/channel';
import type { SampleSeries } from '@/lib/domain/caseRecord';

/**
 * Monitor trend CSV exports → monitor series of a case (rules.md §1).
 *
 * Two steps, both pure:
 * - `inspectCsv(text)` looks at a file and suggests how to read it: delimiter, header, the first
 *   rows, which column is the time and in which format, which columns are EtCO2 / RR / SpO2 / HR /
 *   inspired CO2 and in which unit.
 * - `parseMonitorCsv(text, mapping, caseStartIso)` reads the whole file with a mapping the nurse
 *   confirmed, and either returns series (seconds from case start, EtCO2 in mmHg) or refuses the
 *   file with problems listed by row and column.
 *
 * Rows are numbered as in the file, counting the header as row 1 (the first data row is row 2).
 * A row number is the record number: it equals the line number unless a quoted cell holds a
 * line break. Empty cells are gaps (no sample), not errors; entirely empty lines are skipped.
 *
 * Time formats:
 * - `iso_offset` — ISO 8601 with `Z` or an offset (`2026-03-02T09:00:00+01:00`); a row without an
 *   offset is refused.
 * - `iso_local` — ISO 8601 wall time without offset (`2026-03-02 09:00:00`), read in `timeZone`
 *   (IANA) or at a fixed `utcOffsetMinutes`. A row that carries an offset uses it.
 * - `clock` — `HH:MM[:SS[.fff]]` wall clock, on `date` (YYYY-MM-DD) or the date in `dateColumn`, in
 *   `timeZone`/`utcOffsetMinutes`. Without a date column, a clock that falls back by more than 12 h
 *   (23:59:59 → 00:00:00) is taken to have passed midnight.
 * - `epoch_s`, `epoch_ms` — Unix time in seconds or milliseconds.
 * - `seconds` — seconds from the case start (a number, or an elapsed `[H:]MM:SS`); such a file
 *   aligns to any case.
 * `clockOffsetS` (alignment) is added to every time after conversion.
 *
 * Daylight-saving changes: zone offsets come from `Intl.DateTimeFormat` (the platform's time-zone
 * data), cached per minute. A wall time in the repeated hour after clocks go back is read as its
 * first occurrence unless that would make time go backwards, then as the second; a wall time in
 * the skipped hour when clocks go forward does not exist and is refused.
 */

export const TIME_FORMATS = ['iso_offset', 'iso_local', 'clock', 'epoch_s', 'epoch_ms', 'seconds'] as const;
export type TimeFormat = (typeof TIME_FORMATS)[number];

export const TIME_FORMAT_LABEL: Record<TimeFormat, string> = {
  iso_offset: 'ISO 8601 with UTC offset',
  iso_local: 'ISO 8601 local time (needs a time zone)',
  clock: 'Clock time HH:MM:SS (needs a date and a time zone)',
  epoch_s: 'Unix time, seconds',
  epoch_ms: 'Unix time, milliseconds',
  seconds: 'Seconds from case start',
};

/** Formats whose times are wall-clock times that need a zone (or a fixed offset). */
const NEEDS_ZONE: readonly TimeFormat[] = ['iso_local', 'clock'];

/** Upload limit of the import routes. */
export const MAX_CSV_BYTES = 20 * 1024 * 1024;
/** Problems listed in a refusal; the rest are counted in `errorCount`. */
export const MAX_LISTED_ERRORS = 50;

const columnName = z.string().min(1, { message: 'is required' }).max(200);

/** How to read a file: which column is the time (and its format), which columns are channels. */
export const MonitorCsvMapping = z
  .object({
    timeColumn: columnName,
    timeFormat: z.enum(TIME_FORMATS, { message: `must be one of ${TIME_FORMATS.join(', ')}` }),
    /** IANA zone of wall-clock times (`iso_local`, `clock`). */
    timeZone: z.string().min(1).max(64).optional(),
    /** Fixed offset of wall-clock times from UTC in minutes, east positive (instead of a zone). */
    utcOffsetMinutes: z.number().int().min(-840).max(840).optional(),
    /** Date of clock-only times (YYYY-MM-DD). */
    date: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, { message: 'must be YYYY-MM-DD' }).optional(),
    /** A column holding the date (YYYY-MM-DD) of clock-only times, instead of `date`. */
    dateColumn: columnName.optional(),
    channels: z
      .array(
        z.object({
          column: columnName,
          channel: z.enum(CHANNELS, { message: `must be one of ${CHANNELS.join(', ')}` }),
          /** Checked against the channel's units when the file is read (mmHg/kPa, %, /min). */
          unit: z.string().max(20),
        }),
      )
      .min(1, { message: 'map at least one column to a channel' })
      .max(CHANNELS.length),
    /** Alignment: seconds added to every time after conversion. */
    clockOffsetS: z.number().finite().min(-172_800).max(172_800).optional(),
    /** Cell texts that mean "no value" besides an empty cell (e.g. "---"); none by default. */
    gapMarkers: z.array(z.string().min(1).max(16)).max(10).optional(),
  })
  .strict();
export type MonitorCsvMapping = z.infer<typeof MonitorCsvMapping>;
export type ChannelMapping = MonitorCsvMapping['channels'][number];

/** One problem: the row as in the file (header = row 1), the header name of the column (null for the whole row or file). */
export interface CsvProblem {
  row: number;
  column: string | null;
  message: string;
}

export interface CsvRefusal {
  ok: false;
  /** The first MAX_LISTED_ERRORS problems, in row order. */
  errors: CsvProblem[];
  /** All problems found. */
  errorCount: number;
}

export interface ParsedChannel {
  column: string;
  channel: Channel;
  /** The unit the file gave; series values are in the channel's engine unit. */
  fileUnit: SampleUnit;
  samples: number;
}

export interface ParsedMonitorCsv {
  ok: true;
  /** One monitor series per mapped column with at least one value; times in seconds from case start. */
  series: SampleSeries[];
  channels: ParsedChannel[];
  /** Data rows read (non-empty lines after the header). */
  rows: number;
  /** Values read (non-empty cells of mapped channel columns). */
  samples: number;
  /** First and last row time, seconds from case start (null when the file has no data rows). */
  firstAt: number | null;
  lastAt: number | null;
  warnings: string[];
}

export type MonitorCsvResult = ParsedMonitorCsv | CsvRefusal;

// ─── reading the table ──────────────────────────────────────────────────────────────────────

const DELIMITERS = [',', ';', '\t', '|'] as const;

interface Table {
  delimiter: string;
  header: string[];
  /** All records, header first; index i is file row i + 1. */
  records: string[][];
  quoteProblems: CsvProblem[];
}

/** The delimiter that occurs most often (outside quotes) in the header line; comma when none does. */
function detectDelimiter(text: string): string {
  let end = text.indexOf('\n');
  if (end < 0) end = text.length;
  const line = text.slice(0, end);
  const counts = new Map<string, number>();
  let quoted = false;
  for (const ch of line) {
    if (ch === '"') quoted = !quoted;
    else if (!quoted && (DELIMITERS as readonly string[]).includes(ch)) counts.set(ch, (counts.get(ch) ?? 0) + 1);
  }
  let best = ',';
  let n = 0;
  for (const d of DELIMITERS) {
    const c = counts.get(d) ?? 0;
    if (c > n) {
      best = d;
      n = c;
    }
  }
  return best;
}

/** The cell without surrounding white space; allocates only when there is some. */
function clean(s: string): string {
  const n = s.length;
  if (n === 0) return s;
  return s.charCodeAt(0) <= 32 || s.charCodeAt(n - 1) <= 32 ? s.trim() : s;
}

function isBlankRecord(r: string[]): boolean {
  for (const c of r) if (clean(c) !== '') return false;
  return true;
}

function readTable(text: string): Table | CsvRefusal {
  const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
  // Skip blank lines before the header without losing the row numbering.
  let lead = 0;
  const firstContent = body.search(/\S/);
  if (firstContent < 0) return refusal([{ row: 1, column: null, message: 'the file is empty' }]);
  for (let i = 0; i < firstContent; i++) if (body[i] === '\n') lead++;
  const start = body.lastIndexOf('\n', firstContent) + 1;
  const delimiter = detectDelimiter(body.slice(start));
  const parsed = Papa.parse<string[]>(body.slice(start), { delimiter, header: false, skipEmptyLines: false, dynamicTyping: false });
  const records: string[][] = [];
  for (let i = 0; i < lead; i++) records.push(['']);
  for (const r of parsed.data) records.push(r);
  const quoteProblems: CsvProblem[] = parsed.errors
    .filter((e) => e.type === 'Quotes')
    .map((e) => ({ row: (e.row ?? 0) + lead + 1, column: null, message: `quotes do not match (${e.message})` }));
  const header = records[lead].map((h, i) => h.trim() || `(column ${i + 1})`);
  // Keep records aligned so index i is file row i + 1; the header sits at index `lead`.
  return { delimiter, header, records, quoteProblems };
}

/**
 * One line for a refusal: the count and the first problem.
 * @example problemSummary([{ row: 5, column: 'Time', message: 'time goes backwards' }], 1) //=> 'file: 1 problem; row 5, "Time": time goes backwards'
 */
export function problemSummary(errors: readonly CsvProblem[], errorCount = errors.length): string {
  const first = errors[0];
  const where = first ? `; row ${first.row}${first.column ? `, "${first.column}"` : ''}: ${first.message}` : '';
  return `file: ${errorCount} problem${errorCount === 1 ? '' : 's'}${where}`;
}

function refusal(problems: CsvProblem[], total = problems.length): CsvRefusal {
  return { ok: false, errors: problems.slice(0, MAX_LISTED_ERRORS), errorCount: total };
}

// ─── numbers ────────────────────────────────────────────────────────────────────────────────

const NUMBER = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;
const DECIMAL_COMMA = /^[+-]?\d+,\d+$/;

/** A number from a cell, or NaN. A decimal comma is read when the delimiter is not a comma. */
function toNumber(s: string, decimalComma: boolean): number {
  if (NUMBER.test(s)) return Number(s);
  if (decimalComma && DECIMAL_COMMA.test(s)) return Number(s.replace(',', '.'));
  return NaN;
}

// ─── time ───────────────────────────────────────────────────────────────────────────────────

const ISO = /^(\d{4})-(\d{2})-(\d{2})[T ](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?\s*(Z|z|[+-]\d{2}(?::?\d{2})?)?$/;
const CLOCK = /^(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)?$/;
const ELAPSED = /^(-)?(?:(\d+):)?(\d{1,3}):(\d{2})(?:[.,](\d{1,9}))?$/;
const DATE = /^(\d{4})[-/](\d{2})[-/](\d{2})$/;

function fractionMs(f: string | undefined): number {
  return f ? Math.round(Number(`0.${f}`) * 1000) : 0;
}

function daysInMonth(y: number, m: number): number {
  return new Date(Date.UTC(y, m, 0)).getUTCDate();
}

/** A wall time as if it were UTC (ms), or NaN when a field is out of range. */
function naiveMs(y: number, mo: number, d: number, h: number, mi: number, s: number, ms: number): number {
  if (mo < 1 || mo > 12 || d < 1 || d > daysInMonth(y, mo) || h > 23 || mi > 59 || s > 59) return NaN;
  return Date.UTC(y, mo - 1, d, h, mi, s, ms);
}

function offsetMinutes(text: string): number {
  if (text === 'Z' || text === 'z') return 0;
  const sign = text[0] === '-' ? -1 : 1;
  const digits = text.slice(1).replace(':', '');
  return sign * (Number(digits.slice(0, 2)) * 60 + Number(digits.slice(2, 4) || '0'));
}

/** Converts wall times in an IANA zone to UTC using the platform's zone data, cached per minute. */
class ZoneClock {
  private readonly fmt: Intl.DateTimeFormat;
  private readonly offsets = new Map<number, number>();
  private readonly valid = new Map<number, number[]>();

  constructor(timeZone: string) {
    this.fmt = new Intl.DateTimeFormat('en-US', { timeZone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit' });
  }

  /** The zone's offset from UTC (minutes, east positive) at a UTC instant. */
  offsetAt(utcMs: number): number {
    const minute = Math.floor(utcMs / 60_000);
    let o = this.offsets.get(minute);
    if (o === undefined) {
      const at = minute * 60_000;
      const p = this.fmt.formatToParts(new Date(at));
      const get = (t: Intl.DateTimeFormatPartTypes) => Number(p.find((x) => x.type === t)?.value);
      const wall = Date.UTC(get('year'), get('month') - 1, get('day'), get('hour') % 24, get('minute'), get('second'));
      o = Math.round((wall - at) / 60_000);
      this.offsets.set(minute, o);
    }
    return o;
  }

  /** UTC instants (ascending) a wall time maps to: none in a skipped hour, two in a repeated hour. */
  instants(wallMs: number): number[] {
    const minute = Math.floor(wallMs / 60_000);
    let offs = this.valid.get(minute);
    if (!offs) {
      const w = minute * 60_000;
      // The instant lies within [w − 14 h, w + 12 h] (offsets span −12 h … +14 h); the offsets at the
      // window's ends and middle include both sides of any daylight-saving change inside it.
      const tries = new Set([this.offsetAt(w - 15 * 3600_000), this.offsetAt(w), this.offsetAt(w + 13 * 3600_000)]);
      offs = [...tries].filter((o) => this.offsetAt(w - o * 60_000) === o).sort((a, b) => b - a);
      this.valid.set(minute, offs);
    }
    return offs.map((o) => wallMs - o * 60_000);
  }
}

/** A time-zone name the platform knows, or null. */
function zoneClock(timeZone: string): ZoneClock | null {
  try {
    return new ZoneClock(timeZone);
  } catch {
    return null;
  }
}

// ─── inspect ────────────────────────────────────────────────────────────────────────────────

export interface SuggestedChannel {
  column: string;
  channel: Channel;
  unit: SampleUnit;
  /** Where the unit came from: the header text, the size of the values, or the channel's only unit. */
  unitFrom: 'header' | 'values' | 'channel';
}

export interface CsvSuggestion {
  timeColumn: string | null;
  timeFormat: TimeFormat | null;
  dateColumn: string | null;
  /** What the mapping still needs before the file can be read. */
  needs: { timeZone: boolean; date: boolean };
  channels: SuggestedChannel[];
  /** Header columns neither the time nor a channel. */
  unmapped: string[];
}

export interface CsvInspection {
  ok: true;
  delimiter: string;
  columns: string[];
  /** The first data rows as text (at most 10). */
  firstRows: string[][];
  /** Data rows in the file (non-empty lines after the header). */
  rowCount: number;
  suggestion: CsvSuggestion;
  warnings: string[];
}

/** Lower-case letters and digits only, with units and bracketed parts removed: "etCO2 (mmHg)" → "etco2". */
function normalizeHeader(h: string): string {
  return h
    .toLowerCase()
    .replace(/\(.*?\)|\[.*?\]|\{.*?\}/g, ' ')
    .replace(/mm\s*hg|kpa|torr|bpm|1\/min|\/\s*min|per\s*min|breaths?\s*\/?\s*min|%/g, ' ')
    .replace(/[^a-z0-9]/g, '');
}

const CHANNEL_NAMES: [Channel, readonly string[]][] = [
  // Inspired CO2 first: "co2" alone is end-tidal, "co2insp" is not.
  ['inspco2', ['inspco2', 'co2insp', 'fico2', 'co2fi', 'ico2', 'co2i', 'inco2', 'co2in', 'minco2', 'co2min', 'insco2', 'inspiredco2', 'co2inspired', 'imco2', 'co2imin']],
  ['etco2', ['etco2', 'co2et', 'petco2', 'etco', 'endtidalco2', 'co2endtidal', 'co2', 'co2exp', 'expco2', 'eco2', 'etco2mmhg', 'co2e', 'co2etco2']],
  ['rr', ['rr', 'awrr', 'resp', 'resprate', 'respiratoryrate', 'respirationrate', 'respiration', 'rrco2', 'co2rr', 'rrc', 'br', 'rf', 'af', 'awrf', 'rrimp', 'imprr', 'rraw', 'rrawrr', 'respco2', 'rpm']],
  ['spo2', ['spo2', 'sao2', 'sat', 'spo2r', 'o2sat', 'sato2', 'spo2pct', 'sp02', 'spo2l', 'saturation', 'oxygensaturation']],
  ['hr', ['hr', 'pulse', 'heartrate', 'pr', 'pulserate', 'hrecg', 'ecghr', 'hrpulse', 'prspo2', 'spo2pr', 'pulsespo2', 'pls', 'puls', 'hf', 'pulsrate']],
];

const TIME_NAMES = new Set(['time', 'timestamp', 'datetime', 'date', 'zeit', 'uhrzeit', 'datumzeit', 'heure', 'hora', 'tiempo', 'clock', 'elapsed', 'elapsedtime', 't', 'ts', 'sec', 'secs', 'seconds', 'relativetime', 'reltime', 'utc', 'localtime', 'systemtime', 'recordtime', 'datumuhrzeit', 'dateheure', 'epoch', 'unixtime']);
const ELAPSED_NAMES = /elapsed|rel|sec|^t$|duration|offset|since/;

function looksLikeTimeName(n: string): boolean {
  return TIME_NAMES.has(n) || n.startsWith('time') || n.endsWith('time') || n.includes('timestamp');
}

/** The format of a time column from a sample of its cells, or null. */
export function guessTimeFormat(cells: readonly string[], header = ''): TimeFormat | null {
  const xs = cells.map((c) => c.trim()).filter((c) => c !== '');
  if (xs.length === 0) return null;
  if (xs.every((c) => ISO.test(c))) return xs.every((c) => ISO.exec(c)?.[8]) ? 'iso_offset' : 'iso_local';
  const elapsedName = ELAPSED_NAMES.test(normalizeHeader(header)) || /\(s\)|\[s\]|\(sec/i.test(header);
  if (xs.every((c) => CLOCK.test(c))) return elapsedName ? 'seconds' : 'clock';
  if (xs.every((c) => ELAPSED.test(c))) return 'seconds';
  const nums = xs.map((c) => toNumber(c, true));
  if (nums.every((x) => Number.isFinite(x))) {
    const max = Math.max(...nums.map(Math.abs));
    if (max >= 1e11) return 'epoch_ms';
    if (max >= 1e8) return 'epoch_s';
    return 'seconds';
  }
  return null;
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** kPa or mmHg from the size of CO2 values: normal EtCO2 is 35–45 mmHg = 4.7–6.0 kPa. */
function co2UnitFromValues(values: number[]): SampleUnit | null {
  const positive = values.filter((v) => v > 0.5);
  if (positive.length === 0) return null;
  return median(positive) <= 15 ? 'kPa' : 'mmHg';
}

function unitFromHeader(h: string): SampleUnit | null {
  const l = h.toLowerCase();
  if (l.includes('kpa')) return 'kPa';
  if (/mm\s*hg|torr/.test(l)) return 'mmHg';
  return null;
}

/**
 * Looks at a monitor CSV and suggests a mapping: time column and format, channel columns and units.
 * @example inspectCsv('Time,EtCO2 (mmHg),RR\n2026-03-02T09:00:00Z,38,14\n').suggestion.channels //=> [{ column: 'EtCO2 (mmHg)', channel: 'etco2', unit: 'mmHg', unitFrom: 'header' }, { column: 'RR', channel: 'rr', unit: '/min', unitFrom: 'channel' }]
 */
export function inspectCsv(text: string): CsvInspection | CsvRefusal {
  const table = readTable(text);
  if ('ok' in table) return table;
  const { header, records, delimiter } = table;
  const headerIndex = records.findIndex((r) => !isBlankRecord(r));
  const data: string[][] = [];
  for (let i = headerIndex + 1; i < records.length; i++) if (!isBlankRecord(records[i])) data.push(records[i]);
  const sample = data.slice(0, 300);
  const cellsOf = (col: number) => sample.map((r) => r[col] ?? '');
  const decimalComma = delimiter !== ',';
  const warnings: string[] = [];
  if (data.length === 0) warnings.push('the file has a header but no data rows');

  // Time column: a time-like name whose values parse; else the first column whose values parse as a date-time.
  const norms = header.map(normalizeHeader);
  let timeCol = -1;
  let timeFormat: TimeFormat | null = null;
  let dateCol = -1;
  const byName = norms.map((n, i) => (looksLikeTimeName(n) ? i : -1)).filter((i) => i >= 0);
  // Prefer a column holding full date-times, then clock/elapsed/epoch, and skip date-only columns.
  const ranked = [...byName].sort((a, b) => rankTime(guessTimeFormat(cellsOf(a), header[a])) - rankTime(guessTimeFormat(cellsOf(b), header[b])));
  for (const i of ranked) {
    const f = guessTimeFormat(cellsOf(i), header[i]);
    if (f) {
      timeCol = i;
      timeFormat = f;
      break;
    }
  }
  if (timeCol < 0) {
    for (let i = 0; i < header.length && timeCol < 0; i++) {
      const f = guessTimeFormat(cellsOf(i), header[i]);
      if (f === 'iso_offset' || f === 'iso_local' || f === 'clock' || f === 'epoch_ms') {
        timeCol = i;
        timeFormat = f;
      }
    }
  }
  if (timeCol < 0) warnings.push(`no time column found: none of ${header.map((h) => `"${h}"`).join(', ')} holds times; choose the time column and its format`);
  if (timeFormat === 'clock') {
    dateCol = norms.findIndex((n, i) => i !== timeCol && /^(date|datum|fecha|jour)$/.test(n) && cellsOf(i).filter((c) => c.trim()).every((c) => DATE.test(c.trim())));
  }

  const channels: SuggestedChannel[] = [];
  const taken = new Set<Channel>();
  const unmapped: string[] = [];
  for (let i = 0; i < header.length; i++) {
    if (i === timeCol || i === dateCol) continue;
    const n = norms[i];
    const match = CHANNEL_NAMES.find(([, names]) => names.includes(n))?.[0];
    if (!match) {
      unmapped.push(header[i]);
      continue;
    }
    if (taken.has(match)) {
      warnings.push(`"${header[i]}" also looks like ${CHANNEL_SPECS[match].label}; only the first such column is mapped`);
      unmapped.push(header[i]);
      continue;
    }
    taken.add(match);
    const spec = CHANNEL_SPECS[match];
    let unit: SampleUnit = spec.units[0];
    let unitFrom: SuggestedChannel['unitFrom'] = 'channel';
    if (spec.units.length > 1) {
      const values = cellsOf(i).map((c) => toNumber(c.trim(), decimalComma)).filter((x) => Number.isFinite(x));
      const byHeader = unitFromHeader(header[i]);
      const byValues = co2UnitFromValues(values);
      if (byHeader) {
        unit = byHeader;
        unitFrom = 'header';
        if (byValues && byValues !== byHeader) warnings.push(`"${header[i]}" says ${byHeader} but its values look like ${byValues} (median ${round1(median(values.filter((v) => v > 0.5)))}); check the unit`);
      } else if (byValues) {
        unit = byValues;
        unitFrom = 'values';
      }
    }
    channels.push({ column: header[i], channel: match, unit, unitFrom });
  }
  if (channels.length === 0) warnings.push('no column looks like EtCO2, RR, SpO2, HR or inspired CO2; map the channels by hand');

  const needs = {
    timeZone: timeFormat !== null && NEEDS_ZONE.includes(timeFormat),
    date: timeFormat === 'clock' && dateCol < 0,
  };
  return {
    ok: true,
    delimiter,
    columns: header,
    firstRows: data.slice(0, 10),
    rowCount: data.length,
    suggestion: { timeColumn: timeCol >= 0 ? header[timeCol] : null, timeFormat, dateColumn: dateCol >= 0 ? header[dateCol] : null, needs, channels, unmapped },
    warnings,
  };
}

function rankTime(f: TimeFormat | null): number {
  return f === 'iso_offset' || f === 'iso_local' || f === 'epoch_ms' || f === 'epoch_s' ? 0 : f === 'clock' || f === 'seconds' ? 1 : 2;
}

function round1(x: number): number {
  return Math.round(x * 10) / 10;
}

/**
 * A full mapping from a suggestion, filling what it needs from defaults (the unit's zone, the
 * case's date); null when the suggestion has no time column or no channel.
 */
export function mappingFromSuggestion(s: CsvSuggestion, defaults: MappingDefaults): MonitorCsvMapping | null {
  if (!s.timeColumn || !s.timeFormat || s.channels.length === 0) return null;
  return withMappingDefaults(
    {
      timeColumn: s.timeColumn,
      timeFormat: s.timeFormat,
      ...(s.dateColumn ? { dateColumn: s.dateColumn } : {}),
      channels: s.channels.map((c) => ({ column: c.column, channel: c.channel, unit: c.unit })),
    },
    defaults,
  );
}

export interface MappingDefaults {
  /** Zone of wall-clock times when the mapping names neither a zone nor an offset (the unit's zone). */
  timeZone?: string;
  /** Date of clock-only times when the mapping names neither a date nor a date column (the case's date). */
  date?: string;
}

/** The mapping with a zone and a date filled in where its time format needs them and it has none. */
export function withMappingDefaults(m: MonitorCsvMapping, d: MappingDefaults): MonitorCsvMapping {
  const out: MonitorCsvMapping = { ...m };
  if (NEEDS_ZONE.includes(m.timeFormat) && m.timeZone === undefined && m.utcOffsetMinutes === undefined && d.timeZone) out.timeZone = d.timeZone;
  if (m.timeFormat === 'clock' && m.date === undefined && m.dateColumn === undefined && d.date) out.date = d.date;
  return out;
}

// ─── parse ──────────────────────────────────────────────────────────────────────────────────

function fmtNum(x: number): string {
  return String(Math.round(x * 100) / 100);
}

/**
 * Reads a monitor CSV with a confirmed mapping into monitor series of a case.
 * Times become seconds from `caseStartIso` (plus `clockOffsetS`); EtCO2 and inspired CO2 are
 * converted to mmHg (1 kPa = 7.50062 mmHg); values are checked against rules.md §1 ranges after
 * conversion. Any problem refuses the whole file, listed by row and column.
 * @example parseMonitorCsv('t,RR\n0,14\n1,15\n', { timeColumn: 't', timeFormat: 'seconds', channels: [{ column: 'RR', channel: 'rr', unit: '/min' }] }, '2026-03-02T09:00:00Z') //=> { ok: true, series: [{ channel: 'rr', unit: '/min', source: 'monitor', t: [0, 1], v: [14, 15] }], … }
 */
export function parseMonitorCsv(text: string, mapping: MonitorCsvMapping, caseStartIso: string): MonitorCsvResult {
  const table = readTable(text);
  if ('ok' in table) return table;
  const { header, records, delimiter } = table;
  const problems: CsvProblem[] = [...table.quoteProblems];
  let count = problems.length;
  const add = (row: number, column: string | null, message: string) => {
    count++;
    if (problems.length < MAX_LISTED_ERRORS) problems.push({ row, column, message });
  };
  const warnings: string[] = [];
  const headerIndex = records.findIndex((r) => !isBlankRecord(r));
  const headerRow = headerIndex + 1;

  const startMs = Date.parse(caseStartIso);
  if (!Number.isFinite(startMs)) throw new RangeError(`caseStartIso: not an ISO 8601 instant (${caseStartIso})`);

  // Mapping against the header.
  const columnIndex = (name: string, what: string): number => {
    const hits = header.flatMap((h, i) => (h === name.trim() ? [i] : []));
    if (hits.length === 0) add(headerRow, name, `${what} "${name}" is not in the header (columns: ${header.map((h) => `"${h}"`).join(', ')})`);
    else if (hits.length > 1) add(headerRow, name, `${what} "${name}" appears ${hits.length} times in the header; rename the columns`);
    return hits.length === 1 ? hits[0] : -1;
  };
  const timeCol = columnIndex(mapping.timeColumn, 'the time column');
  const dateCol = mapping.dateColumn ? columnIndex(mapping.dateColumn, 'the date column') : -1;
  const fmt = mapping.timeFormat;
  let zone: ZoneClock | null = null;
  const fixedOffset = mapping.utcOffsetMinutes;
  if (NEEDS_ZONE.includes(fmt)) {
    if (mapping.timeZone !== undefined) {
      zone = zoneClock(mapping.timeZone);
      if (!zone) add(headerRow, mapping.timeColumn, `time zone "${mapping.timeZone}" is not a known IANA zone (e.g. Europe/Dublin)`);
    } else if (fixedOffset === undefined) {
      add(headerRow, mapping.timeColumn, `${TIME_FORMAT_LABEL[fmt]}: local times need a time zone (timeZone) or a fixed utcOffsetMinutes`);
    }
  }
  let fixedDate: { y: number; m: number; d: number } | null = null;
  if (fmt === 'clock' && !mapping.dateColumn) {
    const m = mapping.date ? DATE.exec(mapping.date) : null;
    if (!m) add(headerRow, mapping.timeColumn, 'clock-only times need the date they were recorded on (date, YYYY-MM-DD) or a date column');
    else fixedDate = { y: Number(m[1]), m: Number(m[2]), d: Number(m[3]) };
  }
  const seen = new Set<Channel>();
  const chans = mapping.channels.map((c) => {
    const index = columnIndex(c.column, 'the column');
    const spec = CHANNEL_SPECS[c.channel];
    const unit = spec.units.find((u) => u === c.unit);
    if (!unit) add(headerRow, c.column, `unit "${c.unit}" is not a unit of ${spec.label} (use ${spec.units.join(' or ')})`);
    if (seen.has(c.channel)) add(headerRow, c.column, `${spec.label} is mapped to more than one column`);
    seen.add(c.channel);
    if (index >= 0 && index === timeCol) add(headerRow, c.column, `"${c.column}" is the time column; it cannot also be ${spec.label}`);
    return { ...c, index, spec, factor: unit === 'kPa' ? MMHG_PER_KPA : 1, fileUnit: (unit ?? spec.units[0]) as SampleUnit, t: [] as number[], v: [] as number[] };
  });
  // A mapping that does not fit the header stops here; the rows would only repeat it.
  if (count > table.quoteProblems.length) return refusal(problems, count);

  const decimalComma = delimiter !== ',';
  const gapMarkers = new Set(mapping.gapMarkers ?? []);
  const offsetS = mapping.clockOffsetS ?? 0;
  const absolute = fmt !== 'seconds';
  let rows = 0;
  let samples = 0;
  let lastMs = -Infinity;
  let lastText = '';
  let lastRow = 0;
  let firstMs: number | null = null;
  let prevClockMs = -1;
  let clockDays = 0;
  let shortRows = 0;
  let rolledMidnight = false;
  let usedSecondOccurrence = false;
  const width = header.length;

  for (let i = headerIndex + 1; i < records.length; i++) {
    const r = records[i];
    if (isBlankRecord(r)) continue;
    const row = i + 1;
    rows++;
    if (r.length > width) {
      let extra = false;
      for (let k = width; k < r.length; k++) if (r[k].trim() !== '') extra = true;
      if (extra) add(row, null, `the row has ${r.length} fields but the header has ${width}${delimiter === ',' ? ' (a decimal comma in a comma-separated file?)' : ''}`);
    } else if (r.length < width) shortRows++;

    // Time → ms (UTC epoch for absolute formats, from case start for `seconds`).
    const cell = clean(r[timeCol] ?? '');
    let ms = NaN;
    let why = '';
    if (cell === '') why = 'the time is empty';
    else if (fmt === 'iso_offset' || fmt === 'iso_local') {
      const m = ISO.exec(cell);
      if (!m) why = `"${cell}" is not an ISO 8601 date-time (e.g. 2026-03-02T09:00:00${fmt === 'iso_offset' ? 'Z' : ''})`;
      else {
        const wall = naiveMs(+m[1], +m[2], +m[3], +m[4], +m[5], m[6] ? +m[6] : 0, fractionMs(m[7]));
        if (Number.isNaN(wall)) why = `"${cell}" is not a valid date-time`;
        else if (m[8]) ms = wall - offsetMinutes(m[8]) * 60_000;
        else if (fmt === 'iso_offset') why = `"${cell}" has no UTC offset (Z or ±hh:mm); choose ISO local time with a time zone`;
        else {
          const r2 = wallToUtc(wall, zone, fixedOffset, lastMs);
          ms = r2.ms;
          if (r2.second) usedSecondOccurrence = true;
          if (Number.isNaN(ms)) why = `"${cell}" does not exist in ${mapping.timeZone} (clocks went forward)`;
        }
      }
    } else if (fmt === 'clock') {
      const m = CLOCK.exec(cell);
      let date = fixedDate;
      if (dateCol >= 0) {
        const dm = DATE.exec((r[dateCol] ?? '').trim());
        if (!dm) add(row, mapping.dateColumn ?? null, `"${(r[dateCol] ?? '').trim()}" is not a date (YYYY-MM-DD)`);
        date = dm ? { y: Number(dm[1]), m: Number(dm[2]), d: Number(dm[3]) } : null;
      }
      if (!m) why = `"${cell}" is not a clock time (HH:MM:SS)`;
      else if (date) {
        const h = +m[1];
        const clockMs = ((h * 60 + +m[2]) * 60 + (m[3] ? +m[3] : 0)) * 1000 + fractionMs(m[4]);
        if (h > 23 || +m[2] > 59 || (m[3] ? +m[3] : 0) > 59) why = `"${cell}" is not a valid clock time`;
        else {
          if (dateCol < 0 && prevClockMs >= 0 && clockMs < prevClockMs - 12 * 3600_000) {
            clockDays++;
            rolledMidnight = true;
          }
          prevClockMs = clockMs;
          const wall = naiveMs(date.y, date.m, date.d, 0, 0, 0, 0);
          if (Number.isNaN(wall)) why = 'the date is not valid';
          else {
            const r2 = wallToUtc(wall + clockDays * 86_400_000 + clockMs, zone, fixedOffset, lastMs);
            ms = r2.ms;
            if (r2.second) usedSecondOccurrence = true;
            if (Number.isNaN(ms)) why = `"${cell}" does not exist in ${mapping.timeZone} on that date (clocks went forward)`;
          }
        }
      } else ms = NaN;
    } else if (fmt === 'seconds') {
      const x = toNumber(cell, decimalComma);
      if (Number.isFinite(x)) ms = Math.round(x * 1000);
      else {
        const m = ELAPSED.exec(cell);
        if (m) ms = (m[1] ? -1 : 1) * ((((m[2] ? +m[2] : 0) * 60 + +m[3]) * 60 + +m[4]) * 1000 + fractionMs(m[5]));
        else why = `"${cell}" is not a number of seconds`;
      }
    } else {
      const x = toNumber(cell, decimalComma);
      if (!Number.isFinite(x)) why = `"${cell}" is not a Unix time in ${fmt === 'epoch_s' ? 'seconds' : 'milliseconds'}`;
      else ms = Math.round(fmt === 'epoch_s' ? x * 1000 : x);
    }
    if (why) add(row, mapping.timeColumn, why);
    else if (Number.isFinite(ms)) {
      if (ms < lastMs) add(row, mapping.timeColumn, `time goes backwards: "${cell}" is before "${lastText}" on row ${lastRow}; times must increase`);
      else if (ms === lastMs) add(row, mapping.timeColumn, `time "${cell}" is the same as on row ${lastRow}; times must increase (duplicated row?)`);
      else {
        lastMs = ms;
        lastText = cell;
        lastRow = row;
      }
      if (firstMs === null) firstMs = ms;
    }
    const t = Math.round(((absolute ? ms - startMs : ms) / 1000 + offsetS) * 1000) / 1000;

    for (const c of chans) {
      const raw = r[c.index];
      if (raw === undefined) continue;
      const s = clean(raw);
      if (s === '' || gapMarkers.has(s)) continue;
      const x = toNumber(s, decimalComma);
      if (!Number.isFinite(x)) {
        add(row, c.column, `"${s.length > 30 ? `${s.slice(0, 30)}…` : s}" is not a number`);
        continue;
      }
      const v = x * c.factor;
      if (v < c.spec.min || v > c.spec.max) {
        const engineUnit = c.spec.units[0];
        const shown = c.factor !== 1 ? `${fmtNum(x)} kPa (${fmtNum(v)} ${engineUnit})` : `${fmtNum(x)} ${engineUnit}`;
        const hint = c.factor !== 1 && v > c.spec.max ? '; are these mmHg values labelled kPa?' : '';
        add(row, c.column, `${c.spec.label} ${shown} is outside ${c.spec.min}–${c.spec.max} ${engineUnit}${hint}`);
        continue;
      }
      if (Number.isFinite(ms)) {
        c.t.push(t);
        c.v.push(v);
        samples++;
      }
    }
  }
  if (rows === 0) add(headerRow + 1, null, 'the file has a header but no data rows');
  if (count > 0) return refusal(problems, count);

  if (shortRows > 0) warnings.push(`${shortRows} row${shortRows === 1 ? '' : 's'} had fewer fields than the header; the missing cells are gaps`);
  if (rolledMidnight) warnings.push('the clock passed midnight; later times were read on the next day');
  if (usedSecondOccurrence) warnings.push('some wall times fell in the repeated hour when clocks went back; they were read in file order (first occurrence, then second)');
  const series: SampleSeries[] = [];
  const channels: ParsedChannel[] = [];
  for (const c of chans) {
    channels.push({ column: c.column, channel: c.channel, fileUnit: c.fileUnit, samples: c.t.length });
    if (c.t.length === 0) {
      warnings.push(`"${c.column}" has no values`);
      continue;
    }
    series.push({ channel: c.channel, unit: c.spec.units[0], source: 'monitor', t: c.t, v: c.v });
    if (c.factor === 1 && c.spec.units.length > 1) {
      const positive = c.v.filter((v) => v > 0.5);
      if (positive.length > 0 && median(positive) <= 15) warnings.push(`"${c.column}" is read as mmHg but its values look like kPa (median ${round1(median(positive))}); check the unit`);
    }
  }
  const toT = (x: number) => Math.round(((absolute ? x - startMs : x) / 1000 + offsetS) * 1000) / 1000;
  const firstAt = firstMs === null ? null : toT(firstMs);
  const lastAt = Number.isFinite(lastMs) ? toT(lastMs) : null;
  if (firstAt !== null && lastAt !== null) {
    if (firstAt > 86_400 || lastAt < -86_400) {
      return refusal([{ row: headerRow + 1, column: mapping.timeColumn, message: `the file's times lie ${describeOffset(firstAt > 0 ? firstAt : lastAt)} the case start; check the time format, zone and date` }]);
    }
    if (firstAt > 3600 || firstAt < -3600) warnings.push(`the file starts ${describeOffset(firstAt)} the case start; check the time zone, the date or the alignment`);
  }
  return { ok: true, series, channels, rows, samples, firstAt, lastAt, warnings };
}

function describeOffset(t: number): string {
  const a = Math.abs(t);
  const h = Math.floor(a / 3600);
  const m = Math.floor((a % 3600) / 60);
  const text = h >= 48 ? `${Math.round(a / 86400)} days` : `${h} h ${m} min`;
  return `${text} ${t >= 0 ? 'after' : 'before'}`;
}

/** The UTC instant of a wall time; in a repeated hour the first occurrence after `afterMs`. NaN in a skipped hour. */
function wallToUtc(wall: number, zone: ZoneClock | null, fixedOffset: number | undefined, afterMs: number): { ms: number; second: boolean } {
  if (!zone) return { ms: wall - (fixedOffset ?? 0) * 60_000, second: false };
  const xs = zone.instants(wall);
  if (xs.length === 0) return { ms: NaN, second: false };
  if (xs.length === 1 || xs[0] > afterMs) return { ms: xs[0], second: false };
  const later = xs.find((x) => x > afterMs);
  return later === undefined ? { ms: xs[0], second: false } : { ms: later, second: true };
}

// ─── preview ────────────────────────────────────────────────────────────────────────────────

/**
 * At most `maxPoints` points of a series for a chart: per bucket its lowest and highest value,
 * in time order, so a short apnoea or desaturation still shows.
 */
export function previewPoints(s: { t: readonly number[]; v: readonly number[] }, maxPoints = 1000): { t: number[]; v: number[] } {
  const n = s.t.length;
  if (n <= maxPoints) return { t: [...s.t], v: [...s.v] };
  const buckets = Math.max(1, Math.floor(maxPoints / 2));
  const t: number[] = [];
  const v: number[] = [];
  for (let b = 0; b < buckets; b++) {
    const from = Math.floor((b * n) / buckets);
    const to = Math.floor(((b + 1) * n) / buckets);
    if (to <= from) continue;
    let lo = from;
    let hi = from;
    for (let i = from + 1; i < to; i++) {
      if (s.v[i] < s.v[lo]) lo = i;
      if (s.v[i] > s.v[hi]) hi = i;
    }
    const [a, c] = lo <= hi ? [lo, hi] : [hi, lo];
    t.push(s.t[a]);
    v.push(s.v[a]);
    if (c !== a) {
      t.push(s.t[c]);
      v.push(s.v[c]);
    }
  }
  return { t, v };
}

export interface SeriesPreview {
  channel: Channel;
  unit: SampleUnit;
  column: string;
  fileUnit: SampleUnit;
  samples: number;
  firstAt: number;
  lastAt: number;
  min: number;
  max: number;
  points: { t: number[]; v: number[] };
}

/** A summary of a parsed file for the preview chart. */
export function previewSeries(parsed: ParsedMonitorCsv, maxPoints = 1000): SeriesPreview[] {
  return parsed.series.map((s) => {
    const c = parsed.channels.find((x) => x.channel === s.channel);
    let min = Infinity;
    let max = -Infinity;
    for (const v of s.v) {
      if (v < min) min = v;
      if (v > max) max = v;
    }
    return { channel: s.channel, unit: s.unit, column: c?.column ?? s.channel, fileUnit: c?.fileUnit ?? s.unit, samples: s.t.length, firstAt: s.t[0], lastAt: s.t[s.t.length - 1], min, max, points: previewPoints(s, maxPoints) };
  });
}

// ─── upload ─────────────────────────────────────────────────────────────────────────────────

/** An upload the routes cannot read; `status` is the HTTP status to answer with. */
export class UploadError extends Error {
  constructor(
    public readonly status: number,
    message: string,
  ) {
    super(message);
    this.name = 'UploadError';
  }
}

/** The JSON form of an upload: the file's text, its name, and optionally the mapping. */
export const CsvUploadJson = z
  .object({
    text: z.string({ message: 'must be the text of the CSV file' }),
    fileName: z.string().min(1).max(255).optional(),
    mapping: MonitorCsvMapping.optional(),
  })
  .strict();

export interface CsvUpload {
  text: string;
  /** The bytes as received (the import's hash is taken over these). */
  bytes: Uint8Array;
  fileName: string;
  mapping: MonitorCsvMapping | undefined;
  /** The text encoding the bytes were read in. */
  encoding: 'utf-8' | 'utf-16le' | 'utf-16be' | 'windows-1252';
}

/**
 * Text of a CSV file's bytes: UTF-8 (BOM or not), UTF-16 with a BOM, else Windows-1252
 * (older monitor software writes it).
 */
export function decodeCsvBytes(bytes: Uint8Array): { text: string; encoding: CsvUpload['encoding'] } {
  if (bytes[0] === 0xff && bytes[1] === 0xfe) return { text: new TextDecoder('utf-16le').decode(bytes), encoding: 'utf-16le' };
  if (bytes[0] === 0xfe && bytes[1] === 0xff) return { text: new TextDecoder('utf-16be').decode(bytes), encoding: 'utf-16be' };
  try {
    return { text: new TextDecoder('utf-8', { fatal: true }).decode(bytes), encoding: 'utf-8' };
  } catch {
    return { text: new TextDecoder('windows-1252').decode(bytes), encoding: 'windows-1252' };
  }
}

const tooLarge = (maxBytes: number) => new UploadError(413, `file: larger than ${Math.round(maxBytes / 1024 / 1024)} MB; export a shorter time range or split the file`);

async function readCapped(req: Request, maxBytes: number): Promise<Uint8Array> {
  const declared = Number(req.headers.get('content-length') ?? '');
  if (Number.isFinite(declared) && declared > maxBytes + 64 * 1024) throw tooLarge(maxBytes);
  if (!req.body) return new Uint8Array(0);
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > maxBytes + 64 * 1024) {
      await reader.cancel();
      throw tooLarge(maxBytes);
    }
    chunks.push(value);
  }
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}

/**
 * Reads an import request: multipart/form-data with a `file` and an optional `mapping` (JSON
 * text), or JSON `{ text, fileName?, mapping? }`. The body is cut off at `maxBytes` (413); a bad
 * mapping throws the ZodError naming the field (422).
 */
export async function readCsvUpload(req: Request, maxBytes = MAX_CSV_BYTES): Promise<CsvUpload> {
  const type = req.headers.get('content-type') ?? '';
  const body = await readCapped(req, maxBytes);
  if (type.includes('multipart/form-data')) {
    let form: FormData;
    try {
      form = await new Response(body as BodyInit, { headers: { 'content-type': type } }).formData();
    } catch {
      throw new UploadError(400, 'body: not a valid multipart form');
    }
    const file = form.get('file');
    if (!file || typeof file === 'string') throw new UploadError(422, 'file: attach the CSV file in the form field "file"');
    if (file.size > maxBytes) throw tooLarge(maxBytes);
    const bytes = new Uint8Array(await file.arrayBuffer());
    const m = form.get('mapping');
    let mapping: MonitorCsvMapping | undefined;
    if (typeof m === 'string' && m.trim() !== '') {
      let json: unknown;
      try {
        json = JSON.parse(m);
      } catch {
        throw new UploadError(400, 'mapping: not valid JSON');
      }
      // Parsed under a `mapping` key so a problem is named like the JSON form's: `mapping.channels[0].unit`.
      mapping = z.object({ mapping: MonitorCsvMapping }).parse({ mapping: json }).mapping;
    }
    const name = form.get('fileName');
    const { text, encoding } = decodeCsvBytes(bytes);
    return { text, bytes, fileName: cleanName(typeof name === 'string' && name ? name : file.name), mapping, encoding };
  }
  if (type.includes('application/json')) {
    let json: unknown;
    try {
      json = JSON.parse(new TextDecoder().decode(body));
    } catch {
      throw new UploadError(400, 'body: not valid JSON');
    }
    const parsed = CsvUploadJson.parse(json);
    const bytes = new TextEncoder().encode(parsed.text);
    if (bytes.byteLength > maxBytes) throw tooLarge(maxBytes);
    return { text: parsed.text, bytes, fileName: cleanName(parsed.fileName ?? 'monitor.csv'), mapping: parsed.mapping, encoding: 'utf-8' };
  }
  throw new UploadError(415, 'body: send multipart/form-data with the file, or JSON {text, mapping}');
}

function cleanName(name: string): string {
  const base = name.split(/[\\/]/).pop() ?? name;
  return base.replace(/[\u0000-\u001f]/g, '').slice(0, 255) || 'monitor.csv';
}
