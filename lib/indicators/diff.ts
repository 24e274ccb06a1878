/**
 * Differences between two versions of an issued report (pure). Only published values are
 * compared — the display strings of each cell, comparison and chart point — so a diff never
 * tells more than the two reports do (a change inside a suppressed cell stays invisible).
 */
import type { Cell, IndicatorReport } from './report';

export interface ReportChange {
  indicatorId: string;
  title: string;
  /** What changed: "Q3 2026 numerator", "chart 2026-07", "catalogue version", … */
  what: string;
  before: string;
  after: string;
}

export interface ReportDiff {
  fromVersion: number;
  toVersion: number;
  changes: ReportChange[];
}

function cellFields(c: Cell): [string, string][] {
  return [
    ['numerator', c.display.numerator],
    ['denominator', c.display.denominator],
    ['value', c.display.value],
    ['95 % interval', c.display.interval],
  ];
}

/**
 * What changed from `before` to `after` (same period and scope).
 *
 * @example
 * diffReports(v1, v2, 1, 2).changes[0]
 * //=> { indicatorId: 'positive_pressure_ventilation', title: '…', what: '2026-Q3 numerator', before: '0', after: '6' }
 */
export function diffReports(before: IndicatorReport, after: IndicatorReport, fromVersion: number, toVersion: number): ReportDiff {
  const changes: ReportChange[] = [];
  const top = (what: string, b: string, a: string) => {
    if (b !== a) changes.push({ indicatorId: '', title: 'Report', what, before: b, after: a });
  };
  top('catalogue version', String(before.catalogueVersion), String(after.catalogueVersion));
  top('rule set', `${before.ruleSet.id} v${before.ruleSet.version}`, `${after.ruleSet.id} v${after.ruleSet.version}`);
  top('smallest published count', String(before.minCell), String(after.minCell));
  top('signed cases in the period', String(before.cases), String(after.cases));

  const old = new Map(before.indicators.map((i) => [i.id, i]));
  for (const ind of after.indicators) {
    const prev = old.get(ind.id);
    const title = ind.definition.title;
    const push = (what: string, b: string, a: string) => {
      if (b !== a) changes.push({ indicatorId: ind.id, title, what, before: b === '' ? '(none)' : b, after: a === '' ? '(none)' : a });
    };
    if (!prev) {
      push('indicator', 'not in this version', 'added');
      continue;
    }
    old.delete(ind.id);
    push('definition', prev.definition.definition, ind.definition.definition);
    const pairs: [string, Cell, Cell][] = [
      [after.period.label, prev.current, ind.current],
      [`previous period ${after.previousPeriod.label}`, prev.previous.cell, ind.previous.cell],
      [`year earlier ${after.yearEarlierPeriod.label}`, prev.yearEarlier.cell, ind.yearEarlier.cell],
    ];
    for (const [label, b, a] of pairs) {
      const bf = cellFields(b);
      cellFields(a).forEach(([field, value], i) => push(`${label} ${field}`, bf[i][1], value));
    }
    push('difference from the previous period', prev.previous.display, ind.previous.display);
    push('difference from a year earlier', prev.yearEarlier.display, ind.yearEarlier.display);
    push('chart centre line', prev.chart.centre === null ? '' : String(prev.chart.centre), ind.chart.centre === null ? '' : String(ind.chart.centre));
    const oldPoints = new Map(prev.series.map((c) => [c.period.label, c]));
    const shown = new Set([after.period.label, after.previousPeriod.label, after.yearEarlierPeriod.label]);
    for (const c of ind.series) {
      if (shown.has(c.period.label)) continue;
      const o = oldPoints.get(c.period.label);
      if (!o) continue;
      const b = `${o.display.numerator} / ${o.display.denominator} → ${o.display.value}`;
      const a = `${c.display.numerator} / ${c.display.denominator} → ${c.display.value}`;
      push(`chart ${c.period.label}`, b, a);
    }
  }
  for (const gone of old.values()) changes.push({ indicatorId: gone.id, title: gone.definition.title, what: 'indicator', before: 'present', after: 'not in this version' });
  return { fromVersion, toVersion, changes };
}

/**
 * The published content of a report, without when it was generated or issued: two reports with
 * the same fingerprint publish the same numbers.
 */
export function publishedFingerprint(r: IndicatorReport): string {
  const { generatedOn: _g, issue: _i, ...rest } = r;
  return JSON.stringify(rest);
}
