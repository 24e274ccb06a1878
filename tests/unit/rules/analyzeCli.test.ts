/** `npm run analyze` as its user runs it: a child process reading a file or stdin. */
import { execFile } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOT = path.resolve(__dirname, '../../..');
const TSX = path.join(ROOT, 'node_modules/.bin/tsx');
const FIXTURE = path.join(ROOT, 'tests/fixtures/cases/apnea-jaw-thrust.json');
const tmp = mkdtempSync(path.join(os.tmpdir(), 'plateau-analyze-'));

interface Run {
  code: number;
  stdout: string;
  stderr: string;
}

function analyze(args: string[], stdin?: string): Promise<Run> {
  return new Promise((resolve) => {
    const child = execFile(TSX, ['scripts/analyze.ts', ...args], { cwd: ROOT, maxBuffer: 1 << 24 }, (err, stdout, stderr) => {
      resolve({ code: err ? ((err as { code?: number }).code ?? 1) : 0, stdout, stderr });
    });
    if (stdin !== undefined) child.stdin?.end(stdin);
    else child.stdin?.end();
  });
}

/** Loose view of a case file, for breaking it on purpose. */
interface Doc {
  format: string;
  ruleSet?: unknown;
  series: { channel: string; unit: string; t: number[]; v: number[] }[];
  doses: { unit: string; amount: number }[];
  interventions: { kind: string }[];
}

/** The fixture as an object, changed by `mutate`, as JSON text. */
function mutated(mutate: (doc: Doc) => void): string {
  const doc = JSON.parse(readFileSync(FIXTURE, 'utf8'));
  mutate(doc);
  return JSON.stringify(doc);
}

const BAD: [story: string, input: string, field: RegExp][] = [
  ['malformed JSON', '{"format": "plateau-case/1", ', /\(json\): malformed JSON/],
  ['an unknown format', mutated((d) => (d.format = 'plateau-case/9')), /format: unknown format "plateau-case\/9"/],
  ['times out of order', mutated((d) => ([d.series[1].t[57], d.series[1].t[58]] = [58, 57])), /series\[1\]\.t\[58\]: times must increase \(57\.0 after 58\.0\)/],
  ['a duplicate time', mutated((d) => (d.series[2].t[10] = 9)), /series\[2\]\.t\[10\]: times must increase \(duplicate time 9\.0\)/],
  ['t and v of different lengths', mutated((d) => d.series[0].v.pop()), /series\[0\]\.v: length 899 does not match t \(length 900\)/],
  ['an SpO2 above 100 %', mutated((d) => (d.series[1].v[3] = 101)), /series\[1\]\.v\[3\]: 101 % is outside the SpO2 range/],
  ['an EtCO2 in kPa above 150 mmHg', mutated((d) => (d.series[0] = { ...d.series[0], unit: 'kPa', v: d.series[0].v.map(() => 21) })), /series\[0\]\.v\[0\]: 21 kPa \(157\.51 mmHg\) is outside/],
  ['an unknown channel', mutated((d) => (d.series[2].channel = 'resp')), /series\[2\]\.channel: unknown channel "resp"/],
  ['an unknown unit', mutated((d) => (d.series[2].unit = 'bpm')), /series\[2\]\.unit: unknown unit "bpm"/],
  ['a unit not allowed for the channel', mutated((d) => (d.series[1].unit = 'mmHg')), /series\[1\]\.unit: unit "mmHg" is not allowed for spo2/],
  ['an unknown dose unit', mutated((d) => (d.doses[0].unit = 'ug')), /doses\[0\]\.unit: unknown dose unit "ug"/],
  ['a negative amount', mutated((d) => (d.doses[1].amount = -40)), /doses\[1\]\.amount: must not be negative \(-40\)/],
  ['an unknown intervention kind', mutated((d) => (d.interventions[0].kind = 'jaw-thrust')), /interventions\[0\]\.kind: unknown intervention kind "jaw-thrust"/],
  ['an unknown rule-set id in the case', mutated((d) => (d.ruleSet = 'plateau-strict')), /ruleSet: unknown rule set "plateau-strict"/],
];

// each run starts tsx (about 1–2 s on two cores), so runs go side by side with a long timeout
describe.concurrent('npm run analyze', { timeout: 60_000 }, () => {
  it('prints the §7 JSON result of a good file on stdout and nothing on stderr', async () => {
    const r = await analyze([FIXTURE]);
    expect(r.code).toBe(0);
    expect(r.stderr).toBe('');
    const out = JSON.parse(r.stdout);
    expect(Object.keys(out)).toEqual(['ruleSet', 'baseline', 'episodes', 'spotFindings', 'skipped', 'caseLevel', 'summary']);
    expect(out.episodes.map((e: { rule: string }) => e.rule)).toEqual(['apnea', 'hypoxemia']);
  });

  it('reads the case from stdin given "-" and prints a table with --format text', async () => {
    const r = await analyze(['-', '--format', 'text'], readFileSync(FIXTURE, 'utf8'));
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/Rule set plateau-default v1/);
    expect(r.stdout).toMatch(/apnea\s+06:40\s+07:25\s+45 s/);
  });

  it('runs another built-in rule set, or one from a file, with --rules', async () => {
    const byId = await analyze([FIXTURE, '--rules', 'mason-2012']);
    expect(byId.code).toBe(0);
    expect(JSON.parse(byId.stdout).ruleSet).toEqual({ id: 'mason-2012', version: 1 });
    const file = path.join(tmp, 'rules.json');
    writeFileSync(file, JSON.stringify({ id: 'local-strict', version: 3, description: 'd', rules: [{ id: 'apnea', description: 'd', source: 's', terms: [{ channel: 'etco2', comparator: '<', threshold: 5 }], combine: 'any', minDurationS: 10 }] }));
    const byFile = await analyze([FIXTURE, '--rules', file]);
    expect(byFile.code).toBe(0);
    expect(JSON.parse(byFile.stdout).ruleSet).toEqual({ id: 'local-strict', version: 3 });
  });

  for (const [story, input, field] of BAD) {
    it(`exits 2 on ${story}, names the field on stderr and prints nothing on stdout`, async () => {
      const r = await analyze(['-'], input);
      expect(r.code).toBe(2);
      expect(r.stderr).toMatch(field);
      expect(r.stdout).toBe('');
    });
  }

  it('exits 2 on a rule-set file with a bad field, naming the flag and the field', async () => {
    const file = path.join(tmp, 'bad-rules.json');
    writeFileSync(file, JSON.stringify({ id: 'x', version: 0, description: 'd', rules: [] }));
    const r = await analyze([FIXTURE, '--rules', file]);
    expect([r.code, r.stdout]).toEqual([2, '']);
    expect(r.stderr).toMatch(/--rules .*bad-rules\.json: version: /);
  });

  it('exits 2 on an unknown --rules id and on a missing file', async () => {
    const a = await analyze([FIXTURE, '--rules', 'nope']);
    expect([a.code, a.stdout]).toEqual([2, '']);
    expect(a.stderr).toMatch(/--rules: unknown rule set "nope"/);
    const b = await analyze([path.join(tmp, 'missing.json')]);
    expect([b.code, b.stdout]).toEqual([2, '']);
    expect(b.stderr).toMatch(/missing\.json: cannot read \(ENOENT\)/);
  });
});
