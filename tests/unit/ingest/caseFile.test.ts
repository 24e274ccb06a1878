import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { CaseFileError, parseCaseFile, parseCaseObject, parseRuleSetFile } from '@/lib/ingest/caseFile';
import { PLATEAU_DEFAULT_V1 } from '@/lib/rules';

const good = () => ({
  format: 'plateau-case/1',
  case: { start: '2026-03-02T09:00:00Z', weightKg: 82, etco2Unit: 'mmHg' },
  series: [
    { channel: 'etco2', unit: 'mmHg', source: 'monitor', t: [0, 1, 2], v: [37, 38, 38] },
    { channel: 'spo2', unit: '%', source: 'monitor', t: [0, 1, 2], v: [98, 98, 97] },
    { channel: 'rr', unit: '/min', source: 'monitor', t: [0, 1, 2], v: [14, 14, 13] },
  ],
  doses: [{ t: 150, drug: 'propofol', amount: 40, unit: 'mg', route: 'IV' }],
  interventions: [{ t: 615, kind: 'jaw_thrust' }],
  events: [{ t: 140, kind: 'sedation_start' }],
  ruleSet: 'plateau-default',
});

type Doc = ReturnType<typeof good> & Record<string, unknown>;

/** The CaseFileError message a mutated copy of the good file raises. */
function problem(mutate: (doc: Doc) => void): string {
  const doc = good() as Doc;
  mutate(doc);
  try {
    parseCaseFile(JSON.stringify(doc));
  } catch (e) {
    expect(e).toBeInstanceOf(CaseFileError);
    return (e as Error).message;
  }
  throw new Error('expected a CaseFileError');
}

describe('parseCaseFile (rules.md §7)', () => {
  it('reads the example file of rules.md §7 into a CaseRecord', () => {
    const rec = parseCaseFile(JSON.stringify(good()));
    expect(rec.case).toEqual({ start: '2026-03-02T09:00:00Z', weightKg: 82, etco2Unit: 'mmHg' });
    expect(rec.series).toHaveLength(3);
    expect(rec.series[0]).toEqual({ channel: 'etco2', unit: 'mmHg', source: 'monitor', t: [0, 1, 2], v: [37, 38, 38] });
    expect(rec.doses[0]).toEqual({ t: 150, drug: 'propofol', amount: 40, unit: 'mg', route: 'IV' });
    expect(rec.interventions).toEqual([{ t: 615, kind: 'jaw_thrust' }]);
    expect(rec.events).toEqual([{ t: 140, kind: 'sedation_start' }]);
    expect(rec.ruleSet).toBe('plateau-default');
  });

  it('reads every fixture in tests/fixtures/cases', () => {
    const dir = path.join(__dirname, '../../fixtures/cases');
    for (const name of ['apnea-jaw-thrust.json', 'kpa-hypoventilation.json', 'spot-and-probe-off.json', 'no-baseline.json']) {
      const rec = parseCaseFile(readFileSync(path.join(dir, name), 'utf8'));
      expect(rec.series.length).toBeGreaterThan(0);
    }
  });

  it('defaults the display unit to mmHg and the lists to empty', () => {
    const rec = parseCaseObject({ format: 'plateau-case/1', case: { start: '2026-03-02T09:00:00Z' }, series: [] });
    expect(rec.case.etco2Unit).toBe('mmHg');
    expect([rec.doses, rec.interventions, rec.events]).toEqual([[], [], []]);
    expect(rec.ruleSet).toBeUndefined();
  });

  it('rejects malformed JSON', () => {
    expect(() => parseCaseFile('{"format": "plateau-case/1",')).toThrow(/^\(json\): malformed JSON/);
  });

  it('rejects an unknown or missing format', () => {
    expect(problem((d) => (d.format = 'plateau-case/2'))).toBe('format: unknown format "plateau-case/2" (expected "plateau-case/1")');
    expect(problem((d) => delete (d as Partial<Doc>).format)).toBe('format: missing (expected "plateau-case/1")');
    expect(() => parseCaseFile('[1, 2]')).toThrow('(root): expected an object, got an array');
  });

  it('names the sample whose time goes backwards, exactly as rules.md §7 shows', () => {
    const msg = problem((d) => {
      const t = Array.from({ length: 100 }, (_, i) => i);
      t[56] = 58;
      t[57] = 57;
      d.series[1] = { ...d.series[1], t, v: t.map(() => 97) };
    });
    expect(msg).toBe('series[1].t[57]: times must increase (57.0 after 58.0)');
  });

  it('rejects a duplicate time', () => {
    expect(problem((d) => (d.series[0].t = [0, 1, 1]))).toBe('series[0].t[2]: times must increase (duplicate time 1.0)');
    expect(problem((d) => (d.series[0].t = [0, 0.5, 0.25]))).toBe('series[0].t[2]: times must increase (0.25 after 0.5)');
  });

  it('rejects t and v of different lengths', () => {
    expect(problem((d) => (d.series[2].v = [14, 14]))).toBe('series[2].v: length 2 does not match t (length 3)');
  });

  it('rejects values outside the physiological ranges of rules.md §1', () => {
    expect(problem((d) => (d.series[0].v = [37, 151, 38]))).toBe('series[0].v[1]: 151 mmHg is outside the EtCO2 range 0–150 mmHg');
    expect(problem((d) => (d.series[1].v = [98, 101, 97]))).toBe('series[1].v[1]: 101 % is outside the SpO2 range 0–100 %');
    expect(problem((d) => (d.series[2].v = [14, -1, 13]))).toBe('series[2].v[1]: -1 /min is outside the RR range 0–80 /min');
    expect(problem((d) => (d.series[2].v = [14, 81, 13]))).toBe('series[2].v[1]: 81 /min is outside the RR range 0–80 /min');
  });

  it('checks the EtCO2 range after converting kPa: 20 kPa is 150.01 mmHg, 19.99 kPa passes', () => {
    expect(problem((d) => (d.series[0] = { ...d.series[0], unit: 'kPa', v: [5, 20, 5] }))).toBe('series[0].v[1]: 20 kPa (150.01 mmHg) is outside the EtCO2 range 0–150 mmHg');
    const doc = good();
    doc.series[0] = { ...doc.series[0], unit: 'kPa', v: [5, 19.99, 5] };
    expect(parseCaseFile(JSON.stringify(doc)).series[0].v).toEqual([5, 19.99, 5]);
  });

  it('rejects an unknown channel, unit, source, and a unit the channel does not take', () => {
    expect(problem((d) => (d.series[0].channel = 'co2'))).toBe('series[0].channel: unknown channel "co2" (expected one of etco2, rr, spo2, hr, inspco2)');
    expect(problem((d) => (d.series[0].unit = 'mmhg'))).toBe('series[0].unit: unknown unit "mmhg" (expected one of mmHg, kPa, %, /min)');
    expect(problem((d) => (d.series[1].unit = 'mmHg'))).toBe('series[1].unit: unit "mmHg" is not allowed for spo2 (allowed: %)');
    expect(problem((d) => (d.series[0].source = 'auto'))).toBe('series[0].source: unknown source "auto" (expected one of monitor, manual)');
  });

  it('rejects a second monitor series of one channel', () => {
    expect(problem((d) => d.series.push({ ...d.series[0] }))).toBe('series[3]: a second monitor series for etco2 (series[0] is one already)');
  });

  it('rejects an unknown dose unit, a negative amount and an unknown intervention or event kind', () => {
    expect(problem((d) => (d.doses[0].unit = 'mgs'))).toBe('doses[0].unit: unknown dose unit "mgs" (expected one of mg, mcg, g, mL, units)');
    expect(problem((d) => (d.doses[0].amount = -5))).toBe('doses[0].amount: must not be negative (-5)');
    expect(problem((d) => (d.interventions[0].kind = 'jaw-thrust'))).toMatch(/^interventions\[0\]\.kind: unknown intervention kind "jaw-thrust" \(expected one of stimulation, /);
    expect(problem((d) => (d.events[0].kind = 'start'))).toMatch(/^events\[0\]\.kind: unknown event kind "start"/);
  });

  it('rejects wrong types and unknown fields, naming the field', () => {
    expect(problem((d) => ((d.series[0].t as unknown[])[1] = '1'))).toBe('series[0].t[1]: expected a number, got string "1"');
    expect(problem((d) => ((d.series[0].v as unknown[])[2] = null))).toBe('series[0].v[2]: expected a number, got null');
    expect(problem((d) => ((d.doses[0] as Record<string, unknown>).t = 'soon'))).toBe('doses[0].t: expected number, got string "soon"');
    expect(problem((d) => ((d.series[0] as Record<string, unknown>).probeoff = []))).toBe('series[0].probeoff: unknown field');
    expect(problem((d) => delete (d as Partial<Doc>).case)).toBe('case: missing (expected object)');
    expect(problem((d) => (d.case.start = '2026-03-02 09:00'))).toMatch(/^case\.start: expected an ISO 8601 instant/);
  });

  it('marks probe-off with a boolean array beside v, SpO2 only, of the same length', () => {
    const doc = good() as Doc;
    (doc.series[1] as Record<string, unknown>).probeOff = [false, true, false];
    expect(parseCaseFile(JSON.stringify(doc)).series[1].probeOff).toEqual([false, true, false]);
    expect(problem((d) => ((d.series[0] as Record<string, unknown>).probeOff = [false, false, false]))).toBe('series[0].probeOff: probeOff is only allowed on spo2 series, not etco2');
    expect(problem((d) => ((d.series[1] as Record<string, unknown>).probeOff = [false]))).toBe('series[1].probeOff: length 1 does not match t (length 3)');
    expect(problem((d) => ((d.series[1] as Record<string, unknown>).probeOff = [false, 1, false]))).toBe('series[1].probeOff[1]: expected a boolean, got number 1');
  });

  it('accepts a whole rule-set object and names a bad field inside it', () => {
    const doc = good() as Doc;
    (doc as Record<string, unknown>).ruleSet = PLATEAU_DEFAULT_V1;
    expect(parseCaseFile(JSON.stringify(doc)).ruleSet).toEqual(PLATEAU_DEFAULT_V1);
    const bad = JSON.parse(JSON.stringify(PLATEAU_DEFAULT_V1));
    bad.rules[2].minDurationS = -1;
    expect(problem((d) => ((d as Record<string, unknown>).ruleSet = bad))).toMatch(/^ruleSet\.rules\[2\]\.minDurationS: /);
    expect(() => parseRuleSetFile('{"id":"x","version":1.5,"description":"d","rules":[]}')).toThrow(/^version: /);
  });

  it('checks a 100 000-sample series in well under a second', () => {
    const n = 100_000;
    const t = Array.from({ length: n }, (_, i) => i);
    const doc = good();
    doc.series = [{ channel: 'etco2', unit: 'mmHg', source: 'monitor', t, v: t.map(() => 38) }];
    const text = JSON.stringify(doc);
    const t0 = performance.now();
    parseCaseFile(text);
    expect(performance.now() - t0).toBeLessThan(1000);
  });
});
