import type { StatsRow } from '@/lib/domain/statsRow';
import { indirectStandardisation, type StratumCount } from '@/lib/stats';
import { hasSummary, type FigureDef, type FigureId, type SummarisedRow } from './figures';
import { dimensionValue, compareDimensionValues } from './dimensions';

export interface ObservedExpectedRow {
  key: string;
  label: string;
  cases: number;
  /** Cases with the figure, over the strata the reference can rate. */
  observed: number;
  expected: number;
  /** O / E with exact Poisson 95 % limits on O divided by E; null when E = 0. */
  ratio: number | null;
  lower: number | null;
  upper: number | null;
  /** Cases in strata the reference period has no case of (left out of O and E). */
  casesUnrated: number;
}

export interface ObservedExpected {
  figure: FigureId;
  label: string;
  /** Reviewed cases of the reference period and how many had the figure. */
  reference: { cases: number; events: number };
  rooms: ObservedExpectedRow[];
  /** The whole unit against its own reference period. */
  total: ObservedExpectedRow;
}

/** A stratum key for standardisation: ASA class × procedure × regimen. @example stratumKey('II', 'colonoscopy', 'propofol') //=> 'II|colonoscopy|propofol' */
export function stratumKey(asaClass: string | null, procedureType: string, regimen: string): string {
  return `${asaClass ?? 'unknown'}|${procedureType}|${regimen}`;
}

/** The stratum of a case. @example stratumOf(row) //=> 'II|colonoscopy|propofol' */
export function stratumOf(row: StatsRow): string {
  return stratumKey(row.asaClass, row.procedureType, row.regimen);
}

/** Cases and cases with the figure per stratum, over the reviewed rows (e.g. of a reference period). */
export function strataCounts(rows: readonly StatsRow[], figure: FigureDef): StratumCount[] {
  return strata(rows.filter(hasSummary), figure);
}

function strata(rows: readonly SummarisedRow[], figure: FigureDef): StratumCount[] {
  const m = new Map<string, StratumCount>();
  for (const r of rows) {
    const s = stratumOf(r);
    let c = m.get(s);
    if (!c) m.set(s, (c = { stratum: s, x: 0, n: 0 }));
    c.n++;
    if (figure.test(r)) c.x++;
  }
  return [...m.values()];
}

function ratioRow(key: string, label: string, reference: StratumCount[], members: SummarisedRow[], figure: FigureDef): ObservedExpectedRow {
  const s = indirectStandardisation(reference, strata(members, figure));
  const ok = s.expected > 0;
  return {
    key,
    label,
    cases: members.length,
    observed: s.observed,
    expected: s.expected,
    ratio: ok ? s.ratio : null,
    lower: ok ? s.lower : null,
    upper: ok ? s.upper : null,
    casesUnrated: s.strataMissing.reduce((a, m) => a + m.n, 0),
  };
}

/**
 * Standardised observed / expected ratios by room (indirect standardisation, lib/stats
 * `indirectStandardisation`): each room's cases with the figure against those expected if
 * every ASA × procedure × regimen stratum had the whole unit's rate in the reference period.
 * The reference comes as rows or as its stratum counts (`strataCounts`, or counted in SQL).
 * Strata the reference has no case of are left out of both O and E and counted in `casesUnrated`.
 *
 * @example
 * observedExpectedByRoom(novemberRows, mayToOctoberRows, apneaFigure).rooms[0]
 * //=> { key: 'room-1', label: 'Room 1', cases: 20, observed: 4, expected: 3.1, ratio: 1.29, lower: 0.35, upper: 3.3, casesUnrated: 1 }
 */
export function observedExpectedByRoom(target: readonly StatsRow[], reference: readonly StatsRow[] | { strata: readonly StratumCount[] }, figure: FigureDef): ObservedExpected {
  const refStrata = 'strata' in reference ? [...reference.strata] : strataCounts(reference, figure);
  const tgt = target.filter(hasSummary);
  const byRoom = new Map<string, { label: string; rows: SummarisedRow[] }>();
  for (const r of tgt) {
    const v = dimensionValue(r, 'room');
    let g = byRoom.get(v.key);
    if (!g) byRoom.set(v.key, (g = { label: v.label, rows: [] }));
    g.rows.push(r);
  }
  const rooms = [...byRoom.entries()]
    .map(([key, g]) => ratioRow(key, g.label, refStrata, g.rows, figure))
    .sort((a, b) => compareDimensionValues('room', a, b));
  return {
    figure: figure.id,
    label: figure.label,
    reference: { cases: refStrata.reduce((a, s) => a + s.n, 0), events: refStrata.reduce((a, s) => a + s.x, 0) },
    rooms,
    total: ratioRow('total', 'Whole unit', refStrata, tgt, figure),
  };
}
