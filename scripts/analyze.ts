/**
 * npm run --silent analyze -- <case-file|-> [--rules <id|file>] [--format json|text]
 *
 * Reads a plateau-case/1 file (or stdin for `-` or no argument), runs the rules engine and prints
 * the analysis (rules.md §7) as JSON, or as a readable table with `--format text`. The rule set
 * is `--rules` (a built-in id or a rule-set JSON file), else the case's own `ruleSet`, else
 * plateau-default. Bad input: exit status 2, the field and the problem on stderr, nothing on stdout.
 */
import { existsSync, readFileSync } from 'node:fs';
import { CaseFileError, parseCaseFile, parseRuleSetFile } from '../lib/ingest/caseFile';
import { ruleSetSchema, type RuleSet } from '../lib/domain/ruleSet';
import type { Analysis } from '../lib/domain/episode';
import { analyzeCase, DEFAULT_RULE_SET_ID, getBuiltInRuleSet, listBuiltInRuleSets } from '../lib/rules';

const USAGE = 'usage: npm run --silent analyze -- <case-file|-> [--rules <id|file>] [--format json|text]';

/** Bad input or usage: exit 2 with a message on stderr. */
class InputError extends Error {}

interface Args {
  input: string;
  rules?: string;
  format: 'json' | 'text';
}

function parseArgs(argv: string[]): Args {
  let input: string | undefined;
  let rules: string | undefined;
  let format: 'json' | 'text' = 'json';
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const value = (name: string) => {
      const v = argv[++i];
      if (v === undefined) throw new InputError(`${name} needs a value\n${USAGE}`);
      return v;
    };
    if (a === '--rules') rules = value('--rules');
    else if (a.startsWith('--rules=')) rules = a.slice('--rules='.length);
    else if (a === '--format' || a.startsWith('--format=')) {
      const f = a === '--format' ? value('--format') : a.slice('--format='.length);
      if (f !== 'json' && f !== 'text') throw new InputError(`--format: expected json or text, got "${f}"`);
      format = f;
    } else if (a === '--help' || a === '-h') {
      process.stdout.write(`${USAGE}\n`);
      process.exit(0);
    } else if (a.startsWith('--')) throw new InputError(`unknown option ${a}\n${USAGE}`);
    else if (input === undefined) input = a;
    else throw new InputError(`one case file at a time (got "${input}" and "${a}")\n${USAGE}`);
  }
  return { input: input ?? '-', rules, format };
}

function readInput(input: string): string {
  try {
    return readFileSync(input === '-' ? 0 : input, 'utf8');
  } catch (e) {
    throw new InputError(`${input}: cannot read (${(e as NodeJS.ErrnoException).code ?? (e as Error).message})`);
  }
}

function builtInOrThrow(id: string, field: string): RuleSet {
  const set = getBuiltInRuleSet(id);
  if (set === undefined) {
    const known = listBuiltInRuleSets().map((s) => s.id);
    throw new InputError(`${field}: unknown rule set "${id}" (built-in: ${[...new Set(known)].join(', ')})`);
  }
  return set;
}

function chooseRuleSet(flag: string | undefined, fromCase: unknown): RuleSet {
  if (flag !== undefined) {
    if (getBuiltInRuleSet(flag) !== undefined) return builtInOrThrow(flag, '--rules');
    if (!existsSync(flag)) return builtInOrThrow(flag, '--rules');
    try {
      return parseRuleSetFile(readInput(flag));
    } catch (e) {
      if (e instanceof CaseFileError) throw new InputError(`--rules ${flag}: ${e.message}`);
      throw e;
    }
  }
  if (typeof fromCase === 'string') return builtInOrThrow(fromCase, 'ruleSet');
  if (fromCase !== undefined) return ruleSetSchema.parse(fromCase); // already validated by the parser
  return builtInOrThrow(DEFAULT_RULE_SET_ID, 'ruleSet');
}

function clock(s: number): string {
  const sign = s < 0 ? '-' : '';
  const a = Math.abs(s);
  const h = Math.floor(a / 3600);
  const m = Math.floor((a % 3600) / 60);
  const sec = a % 60;
  const ss = (Number.isInteger(sec) ? String(sec) : sec.toFixed(1)).padStart(2, '0');
  return h > 0 ? `${sign}${h}:${String(m).padStart(2, '0')}:${ss}` : `${sign}${String(m).padStart(2, '0')}:${ss}`;
}

function table(rows: string[][]): string {
  const widths = rows[0].map((_, c) => Math.max(...rows.map((r) => r[c].length)));
  return rows.map((r) => `  ${r.map((cell, c) => cell.padEnd(widths[c])).join('  ')}`.trimEnd()).join('\n');
}

function asText(a: Analysis): string {
  const out: string[] = [];
  const b = a.baseline;
  const show = (x: number | null, unit: string) => (x === null ? 'none' : `${x} ${unit}`);
  out.push(`Rule set ${a.ruleSet.id} v${a.ruleSet.version}`);
  out.push(`Baseline: EtCO2 ${show(b.etco2, b.etco2Unit)}, SpO2 ${show(b.spo2, '%')}, RR ${show(b.rr, '/min')}`);
  out.push('', `Episodes (${a.episodes.length})`);
  if (a.episodes.length > 0) {
    const rows = [['rule', 'start', 'end', 'duration', 'censored', 'extreme', 'abrupt', 'level', 'response']];
    for (const e of a.episodes) {
      rows.push([
        e.rule,
        clock(e.start),
        clock(e.end),
        `${e.durationS} s`,
        e.censoredAt ?? 'no',
        e.extremes.map((x) => `${x.kind === 'lowest' ? 'min' : 'max'} ${x.channel} ${x.value} ${x.unit}`).join('; ') || '-',
        e.onsetAbrupt === null ? '-' : e.onsetAbrupt ? 'yes' : 'no',
        e.level,
        e.responseS === null ? '-' : `${e.responseS} s (${e.interventions.map((i) => i.kind).join(', ')})`,
      ]);
    }
    out.push(table(rows));
  }
  if (a.spotFindings.length > 0) {
    out.push('', `Spot findings (${a.spotFindings.length})`);
    out.push(table([['time', 'rule', 'reading'], ...a.spotFindings.map((f) => [clock(f.t), f.rule, `${f.channel} ${f.value} ${f.unit}`])]));
  }
  if (a.skipped.length > 0) {
    out.push('', 'Skipped');
    for (const s of a.skipped) out.push(`  ${s.rule}${s.dropped === 'term' ? ` term ${s.term}` : ''}: ${s.reason}`);
  }
  const s = a.summary;
  const ex = (x: { value: number; t: number } | null, unit: string) => (x === null ? 'none' : `${x.value} ${unit} at ${clock(x.t)}`);
  out.push('', `Case level: ${a.caseLevel}; major physiology: ${s.majorPhysiology ? 'yes' : 'no'}`);
  out.push(`Lowest SpO2 ${ex(s.lowestSpo2, '%')}; EtCO2 highest ${ex(s.highestEtco2, s.etco2Unit)}, lowest ${ex(s.lowestEtco2, s.etco2Unit)}; lowest RR ${ex(s.lowestRr, '/min')}`);
  out.push(
    s.sedationTime === null
      ? 'Capnography coverage: no sedation time (no sedation_start event or sedative dose)'
      : `Capnography coverage: ${s.capnographyCoveragePct} % of sedation ${clock(s.sedationTime.start)}–${clock(s.sedationTime.end)} (${s.sedationTime.startFrom} to ${s.sedationTime.endFrom})`,
  );
  return `${out.join('\n')}\n`;
}

function main(argv: string[]): number {
  try {
    const args = parseArgs(argv);
    const record = parseCaseFile(readInput(args.input));
    const ruleSet = chooseRuleSet(args.rules, record.ruleSet);
    const analysis = analyzeCase(record, ruleSet);
    process.stdout.write(args.format === 'text' ? asText(analysis) : `${JSON.stringify(analysis, null, 2)}\n`);
    return 0;
  } catch (e) {
    if (e instanceof CaseFileError || e instanceof InputError) {
      process.stderr.write(`analyze: ${e.message}\n`);
      return 2;
    }
    process.stderr.write(`analyze: internal error: ${(e as Error).stack ?? String(e)}\n`);
    return 1;
  }
}

process.exitCode = main(process.argv.slice(2));
