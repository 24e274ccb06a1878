import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import {
  decodeCsvBytes,
  guessTimeFormat,
  inspectCsv,
  mappingFromSuggestion,
  MAX_LISTED_ERRORS,
  parseMonitorCsv,
  previewPoints,
  previewSeries,
  problemSummary,
  readCsvUpload,
  UploadError,
  withMappingDefaults,
  type CsvInspection,
  type MonitorCsvMapping,
  type MonitorCsvResult,
  type ParsedMonitorCsv,
} from '@/lib/ingest/monitorCsv';
import { APNEA, apneaHourCsv, HOUR_ROWS, HOUR_VALUES, SPO2_GAP } from '../../fixtures/csv/generate';

const FIXTURES = path.resolve(__dirname, '..', '..', 'fixtures', 'csv');
const fixture = (name: string) => fs.readFileSync(path.join(FIXTURES, name), 'utf8');

const HOUR_CHANNELS: MonitorCsvMapping['channels'] = [
  { column: 'EtCO2 (mmHg)', channel: 'etco2', unit: 'mmHg' },
  { column: 'awRR', channel: 'rr', unit: '/min' },
  { column: 'SpO2 (%)', channel: 'spo2', unit: '%' },
  { column: 'HR', channel: 'hr', unit: '/min' },
];
const HOUR_MAPPING: MonitorCsvMapping = { timeColumn: 'Time (s)', timeFormat: 'seconds', channels: HOUR_CHANNELS };
const START = '2026-03-02T09:00:00Z';

function ok(r: MonitorCsvResult): ParsedMonitorCsv {
  if (!r.ok) throw new Error(`expected the file to be read, got ${JSON.stringify(r.errors.slice(0, 3))}`);
  return r;
}
function refused(r: MonitorCsvResult) {
  if (r.ok) throw new Error('expected the file to be refused');
  return r;
}
function inspected(text: string): CsvInspection {
  const r = inspectCsv(text);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r;
}
const series = (r: ParsedMonitorCsv, channel: string) => r.series.find((s) => s.channel === channel)!;

describe('a clean one-hour 1 Hz export', () => {
  const text = fixture('monitor-apnea.csv');

  it('is the file the generator makes (the fixture and generate.ts have not drifted apart)', () => {
    expect(text).toBe(apneaHourCsv());
  });

  it('reads 3,600 rows into four series in seconds from case start, keeping the 40 s apnoea', () => {
    const r = ok(parseMonitorCsv(text, HOUR_MAPPING, START));
    expect(r.rows).toBe(HOUR_ROWS);
    expect(r.samples).toBe(HOUR_VALUES);
    expect(r.firstAt).toBe(0);
    expect(r.lastAt).toBe(3599);
    expect(r.series.map((s) => [s.channel, s.unit, s.source, s.t.length])).toEqual([
      ['etco2', 'mmHg', 'monitor', 3600],
      ['rr', '/min', 'monitor', 3600],
      ['spo2', '%', 'monitor', 3600 - SPO2_GAP.seconds],
      ['hr', '/min', 'monitor', 3600],
    ]);
    const etco2 = series(r, 'etco2');
    const rr = series(r, 'rr');
    const apnea = etco2.t.filter((t, i) => etco2.v[i] < 5 && rr.v[rr.t.indexOf(t)] === 0);
    expect(apnea).toHaveLength(APNEA.seconds);
    expect(apnea[0]).toBe(APNEA.from);
    expect(r.warnings).toEqual([]);
  });

  it('parses in well under 100 ms (papaparse without a worker, then one plain loop)', () => {
    const times: number[] = [];
    for (let i = 0; i < 5; i++) {
      const t0 = performance.now();
      parseMonitorCsv(text, HOUR_MAPPING, START);
      times.push(performance.now() - t0);
    }
    const best = Math.min(...times);
    console.log(`monitorCsv: one-hour 1 Hz file (3,600 rows × 5 columns) parsed in ${best.toFixed(1)} ms (best of 5; all: ${times.map((t) => t.toFixed(1)).join(', ')})`);
    expect(best).toBeLessThan(100);
  });

  it('is suggested a complete mapping by the inspection: seconds from start, four channels', () => {
    const i = inspected(text);
    expect(i.delimiter).toBe(',');
    expect(i.rowCount).toBe(3600);
    expect(i.firstRows).toHaveLength(10);
    expect(i.suggestion).toMatchObject({ timeColumn: 'Time (s)', timeFormat: 'seconds', needs: { timeZone: false, date: false }, unmapped: [] });
    expect(mappingFromSuggestion(i.suggestion, {})).toEqual(HOUR_MAPPING);
  });

  it('aligns with clockOffsetS: every time moves by the offset', () => {
    const r = ok(parseMonitorCsv(text, { ...HOUR_MAPPING, clockOffsetS: 120 }, START));
    expect(r.firstAt).toBe(120);
    expect(series(r, 'etco2').t[APNEA.from]).toBe(APNEA.from + 120);
  });

  it('reads the same hour written as ISO 8601 UTC instants against a case that starts 30 s into it', () => {
    const csv = apneaHourCsv({ time: 'iso_utc', startIso: '2026-03-02T08:59:30Z' });
    const m = mappingFromSuggestion(inspected(csv).suggestion, {})!;
    expect(m.timeFormat).toBe('iso_offset');
    const r = ok(parseMonitorCsv(csv, m, START));
    expect(r.firstAt).toBe(-30);
    expect(r.lastAt).toBe(3569);
  });
});

describe('refusals, by row and column', () => {
  it('refuses times going backwards, naming row 5 and the time column', () => {
    const r = refused(parseMonitorCsv(fixture('times-backwards.csv'), { timeColumn: 'Time', timeFormat: 'iso_offset', channels: HOUR_CHANNELS }, START));
    expect(r.errors).toEqual([{ row: 5, column: 'Time', message: expect.stringMatching(/time goes backwards: "2026-03-02T09:00:01Z" is before "2026-03-02T09:00:02Z" on row 4/) }]);
    expect(r.errorCount).toBe(1);
  });

  it('refuses a duplicated time, naming the row it repeats', () => {
    const r = refused(parseMonitorCsv('t,RR\n0,14\n1,14\n1,15\n2,14\n', { timeColumn: 't', timeFormat: 'seconds', channels: [{ column: 'RR', channel: 'rr', unit: '/min' }] }, START));
    expect(r.errors).toEqual([{ row: 4, column: 't', message: expect.stringMatching(/time "1" is the same as on row 3/) }]);
  });

  it('refuses a file without the mapped time column, naming row 1 and the column', () => {
    const text = fixture('missing-time-column.csv');
    const r = refused(parseMonitorCsv(text, HOUR_MAPPING, START));
    expect(r.errors).toEqual([{ row: 1, column: 'Time (s)', message: expect.stringMatching(/the time column "Time \(s\)" is not in the header \(columns: "EtCO2 \(mmHg\)", "awRR", "SpO2 \(%\)", "HR"\)/) }]);
    const i = inspected(text);
    expect(i.suggestion.timeColumn).toBeNull();
    expect(i.warnings.join(' ')).toMatch(/no time column found/);
    expect(mappingFromSuggestion(i.suggestion, {})).toBeNull();
  });

  it('refuses text in a number column, naming each row and column', () => {
    const r = refused(parseMonitorCsv(fixture('text-in-number.csv'), HOUR_MAPPING, START));
    expect(r.errors).toEqual([
      { row: 4, column: 'awRR', message: '"fourteen" is not a number' },
      { row: 6, column: 'HR', message: '"7O" is not a number' },
    ]);
  });

  it('refuses mmHg-sized values labelled kPa: 38 kPa is 285 mmHg, beyond 150 mmHg', () => {
    const r = refused(parseMonitorCsv(fixture('kpa-label-mmhg-values.csv'), { timeColumn: 'Time (s)', timeFormat: 'seconds', channels: [{ column: 'EtCO2 (kPa)', channel: 'etco2', unit: 'kPa' }, { column: 'awRR', channel: 'rr', unit: '/min' }] }, START));
    expect(r.errors.map((e) => [e.row, e.column])).toEqual([
      [2, 'EtCO2 (kPa)'],
      [3, 'EtCO2 (kPa)'],
      [5, 'EtCO2 (kPa)'],
    ]);
    expect(r.errors[0].message).toBe('EtCO2 38 kPa (285.02 mmHg) is outside 0–150 mmHg; are these mmHg values labelled kPa?');
  });

  it('warns at inspection that a kPa header has mmHg-sized values', () => {
    const i = inspected(fixture('kpa-label-mmhg-values.csv'));
    expect(i.suggestion.channels[0]).toEqual({ column: 'EtCO2 (kPa)', channel: 'etco2', unit: 'kPa', unitFrom: 'header' });
    expect(i.warnings.join(' ')).toMatch(/"EtCO2 \(kPa\)" says kPa but its values look like mmHg \(median 37.5\)/);
  });

  it('accepts kPa values labelled mmHg (they are in range) but warns that they look like kPa', () => {
    const r = ok(parseMonitorCsv('t,EtCO2 (mmHg)\n0,4.9\n1,5.1\n2,5.0\n', { timeColumn: 't', timeFormat: 'seconds', channels: [{ column: 'EtCO2 (mmHg)', channel: 'etco2', unit: 'mmHg' }] }, START));
    expect(series(r, 'etco2').v).toEqual([4.9, 5.1, 5.0]);
    expect(r.warnings.join(' ')).toMatch(/read as mmHg but its values look like kPa \(median 5\)/);
  });

  it('refuses values outside the rules.md §1 ranges (SpO2 0–100 %, RR 0–80 /min)', () => {
    const r = refused(parseMonitorCsv('t,SpO2,RR\n0,101,14\n1,98,-1\n2,98,81\n', { timeColumn: 't', timeFormat: 'seconds', channels: [{ column: 'SpO2', channel: 'spo2', unit: '%' }, { column: 'RR', channel: 'rr', unit: '/min' }] }, START));
    expect(r.errors).toEqual([
      { row: 2, column: 'SpO2', message: 'SpO2 101 % is outside 0–100 %' },
      { row: 3, column: 'RR', message: 'RR -1 /min is outside 0–80 /min' },
      { row: 4, column: 'RR', message: 'RR 81 /min is outside 0–80 /min' },
    ]);
  });

  it('refuses a unit that is not a unit of the channel', () => {
    const r = refused(parseMonitorCsv('t,EtCO2\n0,38\n', { timeColumn: 't', timeFormat: 'seconds', channels: [{ column: 'EtCO2', channel: 'etco2', unit: 'torr' }] }, START));
    expect(r.errors).toEqual([{ row: 1, column: 'EtCO2', message: 'unit "torr" is not a unit of EtCO2 (use mmHg or kPa)' }]);
    const rr = refused(parseMonitorCsv('t,RR\n0,14\n', { timeColumn: 't', timeFormat: 'seconds', channels: [{ column: 'RR', channel: 'rr', unit: 'mmHg' }] }, START));
    expect(rr.errors[0].message).toBe('unit "mmHg" is not a unit of RR (use /min)');
  });

  it('refuses an empty file and a header without rows', () => {
    expect(refused(parseMonitorCsv('', HOUR_MAPPING, START)).errors).toEqual([{ row: 1, column: null, message: 'the file is empty' }]);
    expect(refused(parseMonitorCsv(' \n\n', HOUR_MAPPING, START)).errors[0].message).toBe('the file is empty');
    expect(refused(parseMonitorCsv('Time (s),EtCO2 (mmHg),awRR,SpO2 (%),HR\n', HOUR_MAPPING, START)).errors).toEqual([{ row: 2, column: null, message: 'the file has a header but no data rows' }]);
    const i = inspectCsv('');
    expect(i.ok).toBe(false);
  });

  it('refuses an empty time cell on a row with values', () => {
    const r = refused(parseMonitorCsv('t,RR\n0,14\n,14\n', { timeColumn: 't', timeFormat: 'seconds', channels: [{ column: 'RR', channel: 'rr', unit: '/min' }] }, START));
    expect(r.errors).toEqual([{ row: 3, column: 't', message: 'the time is empty' }]);
  });

  it('lists the first 50 problems and counts all of them', () => {
    const rows = Array.from({ length: 120 }, (_, i) => `${i},x`).join('\n');
    const r = refused(parseMonitorCsv(`t,RR\n${rows}\n`, { timeColumn: 't', timeFormat: 'seconds', channels: [{ column: 'RR', channel: 'rr', unit: '/min' }] }, START));
    expect(r.errors).toHaveLength(MAX_LISTED_ERRORS);
    expect(r.errorCount).toBe(120);
    expect(r.errors[49].row).toBe(51);
    expect(problemSummary(r.errors, r.errorCount)).toBe('file: 120 problems; row 2, "RR": "x" is not a number');
  });

  it('refuses a row with more fields than the header (a decimal comma in a comma-separated file)', () => {
    const r = refused(parseMonitorCsv('t,EtCO2 (kPa)\n0,4,9\n', { timeColumn: 't', timeFormat: 'seconds', channels: [{ column: 'EtCO2 (kPa)', channel: 'etco2', unit: 'kPa' }] }, START));
    expect(r.errors[0]).toEqual({ row: 2, column: null, message: 'the row has 3 fields but the header has 2 (a decimal comma in a comma-separated file?)' });
  });

  it('refuses ISO times without an offset when the mapping says they have one', () => {
    const r = refused(parseMonitorCsv('Time,RR\n2026-03-02T09:00:00,14\n', { timeColumn: 'Time', timeFormat: 'iso_offset', channels: [{ column: 'RR', channel: 'rr', unit: '/min' }] }, START));
    expect(r.errors[0].message).toMatch(/has no UTC offset/);
  });

  it('refuses local times without a zone, and an unknown zone', () => {
    const m: MonitorCsvMapping = { timeColumn: 'Time', timeFormat: 'iso_local', channels: [{ column: 'RR', channel: 'rr', unit: '/min' }] };
    expect(refused(parseMonitorCsv('Time,RR\n2026-03-02 09:00:00,14\n', m, START)).errors[0]).toEqual({ row: 1, column: 'Time', message: expect.stringMatching(/local times need a time zone/) });
    expect(refused(parseMonitorCsv('Time,RR\n2026-03-02 09:00:00,14\n', { ...m, timeZone: 'Mars/Olympus' }, START)).errors[0].message).toMatch(/"Mars\/Olympus" is not a known IANA zone/);
  });

  it('refuses a file whose times lie days away from the case (wrong format, zone or date)', () => {
    const r = refused(parseMonitorCsv(fixture('epoch-ms.csv'), { timeColumn: 'timestamp', timeFormat: 'epoch_ms', channels: [{ column: 'RR', channel: 'rr', unit: '/min' }] }, '2026-04-02T09:00:00Z'));
    expect(r.errors[0]).toEqual({ row: 2, column: 'timestamp', message: expect.stringMatching(/lie 31 days before the case start/) });
  });
});

describe('empty cells and gaps', () => {
  it('reads empty cells as gaps (no sample), not errors', () => {
    const r = ok(parseMonitorCsv(fixture('gaps.csv'), HOUR_MAPPING, START));
    expect(r.rows).toBe(4);
    expect(r.samples).toBe(12);
    expect(series(r, 'etco2').t).toEqual([0, 2, 3]);
    expect(series(r, 'rr').t).toEqual([0, 1, 3]);
    expect(series(r, 'spo2').t).toEqual([0, 2, 3]);
    expect(series(r, 'hr').t).toEqual([0, 1, 3]);
  });

  it('reads listed gap markers ("---") as gaps and missing trailing cells as gaps with a warning', () => {
    const m: MonitorCsvMapping = { timeColumn: 't', timeFormat: 'seconds', gapMarkers: ['---'], channels: [{ column: 'RR', channel: 'rr', unit: '/min' }, { column: 'HR', channel: 'hr', unit: '/min' }] };
    const r = ok(parseMonitorCsv('t,RR,HR\n0,---,70\n1,14\n', m, START));
    expect(series(r, 'rr').t).toEqual([1]);
    expect(series(r, 'hr').t).toEqual([0]);
    expect(r.warnings).toContain('1 row had fewer fields than the header; the missing cells are gaps');
    expect(refused(parseMonitorCsv('t,RR\n0,---\n', { ...m, gapMarkers: undefined, channels: [m.channels[0]] }, START)).errors[0].message).toBe('"---" is not a number');
  });

  it('skips blank lines without changing the row numbers', () => {
    const r = refused(parseMonitorCsv('\nt,RR\n0,14\n\n1,x\n', { timeColumn: 't', timeFormat: 'seconds', channels: [{ column: 'RR', channel: 'rr', unit: '/min' }] }, START));
    expect(r.errors).toEqual([{ row: 5, column: 'RR', message: '"x" is not a number' }]);
  });

  it('leaves out a mapped column with no values, saying so', () => {
    const r = ok(parseMonitorCsv('t,RR,HR\n0,14,\n1,14,\n', { timeColumn: 't', timeFormat: 'seconds', channels: [{ column: 'RR', channel: 'rr', unit: '/min' }, { column: 'HR', channel: 'hr', unit: '/min' }] }, START));
    expect(r.series.map((s) => s.channel)).toEqual(['rr']);
    expect(r.warnings).toContain('"HR" has no values');
  });
});

describe('time formats and zones', () => {
  it('reads local times with a zone across the spring-forward change (Europe/London, 29 Mar 2026 01:00 UTC) as one-second steps', () => {
    // Europe/London moves from GMT (UTC+0) to BST (UTC+1) at 01:00 UTC on the last Sunday of March:
    // local 00:59:59 is followed by local 02:00:00 (tz database).
    const m: MonitorCsvMapping = { timeColumn: 'Time', timeFormat: 'iso_local', timeZone: 'Europe/London', channels: [{ column: 'etCO2 (mmHg)', channel: 'etco2', unit: 'mmHg' }] };
    const r = ok(parseMonitorCsv(fixture('local-dst.csv'), m, '2026-03-29T00:59:58Z'));
    expect(series(r, 'etco2').t).toEqual([0, 1, 2, 3]);
  });

  it('reads local times across the fall-back change (America/New_York, 1 Nov 2026) in file order through the repeated hour', () => {
    // New York leaves EDT (UTC−4) for EST (UTC−5) at 06:00 UTC on the first Sunday of November:
    // local 01:59:59 EDT is followed by local 01:00:00 EST (tz database).
    const text = 'Time,RR\n2026-11-01T01:59:58,14\n2026-11-01T01:59:59,14\n2026-11-01T01:00:00,14\n2026-11-01T01:00:01,14\n';
    const r = ok(parseMonitorCsv(text, { timeColumn: 'Time', timeFormat: 'iso_local', timeZone: 'America/New_York', channels: [{ column: 'RR', channel: 'rr', unit: '/min' }] }, '2026-11-01T05:59:58Z'));
    expect(series(r, 'rr').t).toEqual([0, 1, 2, 3]);
    expect(r.warnings.join(' ')).toMatch(/repeated hour/);
  });

  it('refuses a local time that does not exist (inside the skipped hour)', () => {
    const r = refused(parseMonitorCsv('Time,RR\n2026-03-29 01:30:00,14\n', { timeColumn: 'Time', timeFormat: 'iso_local', timeZone: 'Europe/London', channels: [{ column: 'RR', channel: 'rr', unit: '/min' }] }, '2026-03-29T00:00:00Z'));
    expect(r.errors[0]).toEqual({ row: 2, column: 'Time', message: '"2026-03-29 01:30:00" does not exist in Europe/London (clocks went forward)' });
  });

  it('reads local times at a fixed UTC offset when no zone is given', () => {
    const r = ok(parseMonitorCsv('Time,RR\n2026-03-02 10:00:00,14\n', { timeColumn: 'Time', timeFormat: 'iso_local', utcOffsetMinutes: 60, channels: [{ column: 'RR', channel: 'rr', unit: '/min' }] }, START));
    expect(r.firstAt).toBe(0);
  });

  it('reads ISO 8601 instants with offsets and fractions of a second', () => {
    const text = 'Time,RR\n2026-03-02T10:00:00+01:00,14\n2026-03-02T09:00:00.5Z,14\n2026-03-02T04:00:01-0500,14\n';
    const r = ok(parseMonitorCsv(text, { timeColumn: 'Time', timeFormat: 'iso_offset', channels: [{ column: 'RR', channel: 'rr', unit: '/min' }] }, START));
    expect(series(r, 'rr').t).toEqual([0, 0.5, 1]);
  });

  it('reads clock-only times with a date and a zone (Dublin in March is UTC+0; Sydney is UTC+11)', () => {
    const m: MonitorCsvMapping = { timeColumn: 'Time', timeFormat: 'clock', date: '2026-03-02', timeZone: 'Europe/Dublin', channels: [{ column: 'CO2ET', channel: 'etco2', unit: 'mmHg' }, { column: 'Pulse', channel: 'hr', unit: '/min' }] };
    expect(series(ok(parseMonitorCsv(fixture('clock-only.csv'), m, START)), 'etco2').t).toEqual([-2, -1, 0, 1]);
    // Sydney keeps daylight time (AEDT, UTC+11) until the first Sunday of April.
    const sydney = ok(parseMonitorCsv(fixture('clock-only.csv'), { ...m, timeZone: 'Australia/Sydney' }, '2026-03-01T22:00:00Z'));
    expect(series(sydney, 'hr').t).toEqual([-2, -1, 0, 1]);
  });

  it('refuses clock-only times without a date', () => {
    const r = refused(parseMonitorCsv(fixture('clock-only.csv'), { timeColumn: 'Time', timeFormat: 'clock', timeZone: 'Europe/Dublin', channels: [{ column: 'CO2ET', channel: 'etco2', unit: 'mmHg' }] }, START));
    expect(r.errors[0].message).toMatch(/clock-only times need the date/);
  });

  it('rolls clock-only times past midnight onto the next day', () => {
    const r = ok(parseMonitorCsv('Time,RR\n23:59:59,14\n00:00:00,14\n00:00:01,14\n', { timeColumn: 'Time', timeFormat: 'clock', date: '2026-03-02', utcOffsetMinutes: 0, channels: [{ column: 'RR', channel: 'rr', unit: '/min' }] }, '2026-03-02T23:59:59Z'));
    expect(series(r, 'rr').t).toEqual([0, 1, 2]);
    expect(r.warnings).toContain('the clock passed midnight; later times were read on the next day');
  });

  it('reads a semicolon file with decimal commas, a date column and clock times, converting kPa to mmHg (1 kPa = 7.50062 mmHg)', () => {
    const text = fixture('kpa-semicolon.csv');
    const i = inspected(text);
    expect(i.delimiter).toBe(';');
    expect(i.suggestion).toMatchObject({ timeColumn: 'Time', timeFormat: 'clock', dateColumn: 'Date', needs: { timeZone: true, date: false } });
    expect(i.suggestion.channels.map((c) => [c.column, c.channel, c.unit])).toEqual([
      ['CO2et [kPa]', 'etco2', 'kPa'],
      ['Resp', 'rr', '/min'],
      ['SpO2', 'spo2', '%'],
      ['Pulse', 'hr', '/min'],
    ]);
    const m = mappingFromSuggestion(i.suggestion, { timeZone: 'Europe/Dublin', date: '2000-01-01' })!;
    expect(m.timeZone).toBe('Europe/Dublin');
    expect(m.date).toBeUndefined();
    const r = ok(parseMonitorCsv(text, m, START));
    const etco2 = series(r, 'etco2');
    expect(etco2.unit).toBe('mmHg');
    expect(etco2.t).toEqual([0, 5, 10, 15]);
    // references.md, Units: 1 kPa = 7.50062 mmHg (760 mmHg = 101.325 kPa).
    expect(etco2.v[0]).toBeCloseTo(4.9 * 7.50062, 4);
    expect(etco2.v[2]).toBeCloseTo(37.5031, 4);
    expect(r.channels[0]).toEqual({ column: 'CO2et [kPa]', channel: 'etco2', fileUnit: 'kPa', samples: 4 });
  });

  it('reads epoch milliseconds and epoch seconds', () => {
    const r = ok(parseMonitorCsv(fixture('epoch-ms.csv'), { timeColumn: 'timestamp', timeFormat: 'epoch_ms', channels: [{ column: 'RR', channel: 'rr', unit: '/min' }] }, START));
    expect(series(r, 'rr').t).toEqual([0, 1, 2.5]);
    expect(inspected(fixture('epoch-ms.csv')).suggestion.timeFormat).toBe('epoch_ms');
    const s = ok(parseMonitorCsv('unix,RR\n1772442000,14\n1772442001.25,14\n', { timeColumn: 'unix', timeFormat: 'epoch_s', channels: [{ column: 'RR', channel: 'rr', unit: '/min' }] }, START));
    expect(series(s, 'rr').t).toEqual([0, 1.25]);
  });

  it('reads elapsed H:MM:SS as seconds from start', () => {
    const r = ok(parseMonitorCsv('Elapsed,RR\n0:00:00,14\n0:00:05,14\n1:00:00,14\n', { timeColumn: 'Elapsed', timeFormat: 'seconds', channels: [{ column: 'RR', channel: 'rr', unit: '/min' }] }, START));
    expect(series(r, 'rr').t).toEqual([0, 5, 3600]);
  });

  it('guesses the time format from the values and the header', () => {
    expect(guessTimeFormat(['2026-03-02T09:00:00Z', '2026-03-02T09:00:01+01:00'])).toBe('iso_offset');
    expect(guessTimeFormat(['2026-03-02 09:00:00', '2026-03-02 09:00:01'])).toBe('iso_local');
    expect(guessTimeFormat(['09:00:00', '09:00:01'], 'Time')).toBe('clock');
    expect(guessTimeFormat(['00:00:00', '00:00:01'], 'Elapsed')).toBe('seconds');
    expect(guessTimeFormat(['1772442000000'])).toBe('epoch_ms');
    expect(guessTimeFormat(['1772442000'])).toBe('epoch_s');
    expect(guessTimeFormat(['0', '1', '2.5'])).toBe('seconds');
    expect(guessTimeFormat(['02.03.2026 09:00'])).toBeNull();
    expect(guessTimeFormat(['', ''])).toBeNull();
  });
});

describe('header guessing', () => {
  const table: [string, string | null][] = [
    ['EtCO2', 'etco2'],
    ['etCO2 (mmHg)', 'etco2'],
    ['CO2ET', 'etco2'],
    ['EtCO2 mmHg', 'etco2'],
    ['RR', 'rr'],
    ['awRR', 'rr'],
    ['Resp', 'rr'],
    ['RR (br/min)', 'rr'],
    ['SpO2', 'spo2'],
    ['SpO2 (%)', 'spo2'],
    ['HR', 'hr'],
    ['Pulse', 'hr'],
    ['HR (bpm)', 'hr'],
    ['FiCO2', 'inspco2'],
    ['CO2 insp', 'inspco2'],
    ['NIBP sys', null],
    ['Temp', null],
  ];
  for (const [header, channel] of table) {
    it(`maps "${header}" to ${channel ?? 'no channel'}`, () => {
      const i = inspected(`Time,${header}\n2026-03-02T09:00:00Z,38\n`);
      expect(i.suggestion.channels.find((c) => c.column === header)?.channel ?? null).toBe(channel);
    });
  }

  it('finds the time column by name: "time", "timestamp", "Date/Time", "Zeit"', () => {
    for (const name of ['time', 'Timestamp', 'Date/Time', 'Zeit', 'TIME (UTC)']) {
      expect(inspected(`HR,${name}\n70,2026-03-02T09:00:00Z\n`).suggestion.timeColumn).toBe(name);
    }
  });

  it('guesses EtCO2 units from the header, else from the size of the values', () => {
    const byValues = inspected('Time,EtCO2,CO2insp\n2026-03-02T09:00:00Z,5.1,0.1\n2026-03-02T09:00:01Z,5.0,0\n');
    expect(byValues.suggestion.channels).toEqual([
      { column: 'EtCO2', channel: 'etco2', unit: 'kPa', unitFrom: 'values' },
      { column: 'CO2insp', channel: 'inspco2', unit: 'mmHg', unitFrom: 'channel' },
    ]);
    expect(inspected('Time,EtCO2\n2026-03-02T09:00:00Z,38\n').suggestion.channels[0]).toMatchObject({ unit: 'mmHg', unitFrom: 'values' });
    expect(inspected('Time,EtCO2 [kPa]\n2026-03-02T09:00:00Z,5.1\n').suggestion.channels[0]).toMatchObject({ unit: 'kPa', unitFrom: 'header' });
  });

  it('maps only the first of two heart-rate columns and says so', () => {
    const i = inspected('Time,HR,Pulse\n2026-03-02T09:00:00Z,70,71\n');
    expect(i.suggestion.channels.map((c) => c.column)).toEqual(['HR']);
    expect(i.suggestion.unmapped).toEqual(['Pulse']);
    expect(i.warnings[0]).toMatch(/"Pulse" also looks like HR/);
  });

  it('says when local times need a zone, and fills it from the defaults', () => {
    const i = inspected(fixture('local-dst.csv'));
    expect(i.suggestion).toMatchObject({ timeColumn: 'Time', timeFormat: 'iso_local', needs: { timeZone: true, date: false } });
    expect(mappingFromSuggestion(i.suggestion, { timeZone: 'Europe/London' })?.timeZone).toBe('Europe/London');
    const clock = inspected(fixture('clock-only.csv'));
    expect(clock.suggestion.needs).toEqual({ timeZone: true, date: true });
    expect(mappingFromSuggestion(clock.suggestion, { timeZone: 'Europe/Dublin', date: '2026-03-02' })).toMatchObject({ timeZone: 'Europe/Dublin', date: '2026-03-02' });
  });

  it('keeps a zone, an offset or a date the mapping already names', () => {
    const m: MonitorCsvMapping = { timeColumn: 'Time', timeFormat: 'clock', utcOffsetMinutes: 60, date: '2026-03-01', channels: [] };
    expect(withMappingDefaults(m, { timeZone: 'Europe/Dublin', date: '2026-03-02' })).toEqual(m);
    expect(withMappingDefaults({ ...m, timeFormat: 'seconds', utcOffsetMinutes: undefined }, { timeZone: 'Europe/Dublin' }).timeZone).toBeUndefined();
  });
});

describe('preview for a chart', () => {
  it('thins a series to at most the asked points, keeping the apnoea minimum and the peaks', () => {
    const r = ok(parseMonitorCsv(fixture('monitor-apnea.csv'), HOUR_MAPPING, START));
    const etco2 = series(r, 'etco2');
    const p = previewPoints(etco2, 500);
    expect(p.t.length).toBeLessThanOrEqual(500);
    expect(Math.min(...p.v)).toBe(0);
    expect(Math.max(...p.v)).toBe(Math.max(...etco2.v));
    expect([...p.t].sort((a, b) => a - b)).toEqual(p.t);
    const summary = previewSeries(r, 500);
    expect(summary.map((s) => [s.channel, s.column, s.samples, s.firstAt, s.lastAt, s.min])).toEqual([
      ['etco2', 'EtCO2 (mmHg)', 3600, 0, 3599, 0],
      ['rr', 'awRR', 3600, 0, 3599, 0],
      ['spo2', 'SpO2 (%)', 3590, 0, 3599, 88],
      ['hr', 'HR', 3600, 0, 3599, expect.any(Number)],
    ]);
  });
});

describe('reading an upload', () => {
  const csv = 'Time (s),awRR\n0,14\n1,15\n';

  it('reads a multipart form with the file and a JSON mapping', async () => {
    const form = new FormData();
    form.set('file', new File([csv], 'C:\\exports\\trend.csv', { type: 'text/csv' }));
    form.set('mapping', JSON.stringify({ timeColumn: 'Time (s)', timeFormat: 'seconds', channels: [{ column: 'awRR', channel: 'rr', unit: '/min' }] }));
    const u = await readCsvUpload(new Request('http://x/', { method: 'POST', body: form }));
    expect(u.text).toBe(csv);
    expect(u.fileName).toBe('trend.csv');
    expect(u.bytes.byteLength).toBe(csv.length);
    expect(u.mapping?.channels[0].channel).toBe('rr');
    form.set('mapping', JSON.stringify({ timeColumn: 'Time (s)', timeFormat: 'sometimes', channels: [{ column: 'awRR', channel: 'rr', unit: '/min' }] }));
    const bad = await readCsvUpload(new Request('http://x/', { method: 'POST', body: form })).catch((e: unknown) => e);
    expect(bad).toMatchObject({ issues: [{ path: ['mapping', 'timeFormat'], message: expect.stringMatching(/must be one of iso_offset/) }] });
  });

  it('reads JSON {text, mapping}', async () => {
    const u = await readCsvUpload(new Request('http://x/', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ text: csv, fileName: 'a.csv' }) }));
    expect(u).toMatchObject({ text: csv, fileName: 'a.csv', mapping: undefined });
  });

  it('refuses a body above the limit with 413 and a clear message', async () => {
    const big = 'x'.repeat(200_000);
    const req = new Request('http://x/', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ text: big }) });
    const err = await readCsvUpload(req, 100_000).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(UploadError);
    expect(err).toMatchObject({ status: 413, message: expect.stringMatching(/file: larger than 0 MB/) });
  });

  it('refuses a form without a file and a body of another type', async () => {
    const form = new FormData();
    form.set('mapping', '{}');
    await expect(readCsvUpload(new Request('http://x/', { method: 'POST', body: form }))).rejects.toMatchObject({ status: 422 });
    await expect(readCsvUpload(new Request('http://x/', { method: 'POST', headers: { 'content-type': 'text/plain' }, body: csv }))).rejects.toMatchObject({ status: 415 });
  });

  it('decodes UTF-8, UTF-16 with a BOM, and Windows-1252 exports', () => {
    expect(decodeCsvBytes(new TextEncoder().encode('\uFEFFTime,SpO2\n'))).toEqual({ text: 'Time,SpO2\n', encoding: 'utf-8' });
    const utf16 = new Uint8Array([0xff, 0xfe, ...Array.from('T,°').flatMap((c) => [c.charCodeAt(0), 0])]);
    expect(decodeCsvBytes(utf16)).toEqual({ text: 'T,°', encoding: 'utf-16le' });
    expect(decodeCsvBytes(new Uint8Array([0x54, 0x65, 0x6d, 0x70, 0x20, 0xb0, 0x43]))).toEqual({ text: 'Temp °C', encoding: 'windows-1252' });
  });
});
