import type { StatsRow } from '@/lib/domain/statsRow';
import type { RuleSetRef } from '@/lib/domain/ruleSet';
import type { CaseLevel } from '@/lib/domain/intervention';
import { LEVEL_LABEL, ruleLabel } from '@/lib/domain/ruleLabel';
import { proportion, type Proportion } from './proportion';
import { figureCatalogue, hasSummary, ruleIdsOf, type FigureId, type SummarisedRow } from './figures';
import { queueReasons } from './reviewQueue';

export interface ComparedFigure {
  id: FigureId;
  label: string;
  /** Over the cases both rule sets have a summary for; null when the figure does not exist in that set. */
  a: Proportion | null;
  b: Proportion | null;
  /** Cases counted under B but not A, and under A but not B (the figure's discordant cases). */
  onlyB: number;
  onlyA: number;
}

export interface CaseChange {
  caseId: string;
  key: string | null;
  date: string;
  a: { caseLevel: CaseLevel; majorPhysiology: boolean; episodes: number; inQueue: boolean };
  b: { caseLevel: CaseLevel; majorPhysiology: boolean; episodes: number; inQueue: boolean };
  /** What changed, one readable line each. */
  changes: string[];
}

export interface ReviewComparison {
  a: RuleSetRef;
  b: RuleSetRef;
  /** Cases of the period with a summary under both rule sets: the comparison's denominator. */
  cases: number;
  /** Cases of the period without a summary under B yet (compute them to compare all). */
  missingB: number;
  missingA: number;
  figures: ComparedFigure[];
  changedCases: CaseChange[];
}

export interface CompareOptions {
  a: RuleSetRef;
  b: RuleSetRef;
  responseLimitS: number;
  ruleIdsA?: readonly string[];
  ruleIdsB?: readonly string[];
}

/**
 * How the review of a period changes under rule set B instead of A, over the same cases: every
 * figure of either set side by side, with the cases it gains and loses, and each case whose
 * level, major-physiology flag, episode count, per-rule episodes (rules both sets have) or
 * queue membership differs. Cases lacking either summary are left out and counted.
 *
 * @example
 * compareReview(rowsDefault, rowsMason, { a, b, responseLimitS: 60 }).changedCases.length //=> 12
 */
export function compareReview(rowsA: readonly StatsRow[], rowsB: readonly StatsRow[], options: CompareOptions): ReviewComparison {
  const byB = new Map<string, StatsRow>(rowsB.map((r) => [r.caseId, r]));
  const pairs: [SummarisedRow, SummarisedRow][] = [];
  let missingA = 0;
  let missingB = 0;
  for (const ra of rowsA) {
    const rb = byB.get(ra.caseId);
    if (!hasSummary(ra)) missingA++;
    if (!rb || !hasSummary(rb)) missingB++;
    if (hasSummary(ra) && rb && hasSummary(rb)) pairs.push([ra, rb]);
  }
  const idsA = [...(options.ruleIdsA ?? ruleIdsOf(pairs.map((p) => p[0])))];
  const idsB = [...(options.ruleIdsB ?? ruleIdsOf(pairs.map((p) => p[1])))];
  const catA = figureCatalogue(idsA, options.responseLimitS);
  const catB = figureCatalogue(idsB, options.responseLimitS);
  const ids: FigureId[] = [...catA.map((f) => f.id), ...catB.map((f) => f.id).filter((id) => !catA.some((f) => f.id === id))];
  const n = pairs.length;
  const figures = ids.map((id) => {
    const fa = catA.find((f) => f.id === id);
    const fb = catB.find((f) => f.id === id);
    let xa = 0;
    let xb = 0;
    let onlyA = 0;
    let onlyB = 0;
    for (const [ra, rb] of pairs) {
      const ya = fa ? fa.test(ra) : false;
      const yb = fb ? fb.test(rb) : false;
      if (ya) xa++;
      if (yb) xb++;
      if (ya && !yb) onlyA++;
      if (yb && !ya) onlyB++;
    }
    return { id, label: (fa ?? fb)!.label, a: fa ? proportion(xa, n) : null, b: fb ? proportion(xb, n) : null, onlyA, onlyB };
  });
  const shared = idsA.filter((id) => idsB.includes(id));
  const changedCases: CaseChange[] = [];
  for (const [ra, rb] of pairs) {
    const sa = ra.summary;
    const sb = rb.summary;
    const qa = queueReasons(ra, options).length > 0;
    const qb = queueReasons(rb, options).length > 0;
    const changes: string[] = [];
    if (sa.caseLevel !== sb.caseLevel) changes.push(`case level: ${LEVEL_LABEL[sa.caseLevel]} → ${LEVEL_LABEL[sb.caseLevel]}`);
    if (sa.majorPhysiology !== sb.majorPhysiology) changes.push(`major physiology: ${sa.majorPhysiology ? 'yes' : 'no'} → ${sb.majorPhysiology ? 'yes' : 'no'}`);
    if (sa.episodeCount !== sb.episodeCount) changes.push(`episodes (all rules): ${sa.episodeCount} → ${sb.episodeCount}`);
    for (const id of shared) {
      const ea = sa.rules[id]?.episodes ?? 0;
      const eb = sb.rules[id]?.episodes ?? 0;
      if (ea !== eb) changes.push(`${ruleLabel(id)}: ${ea} → ${eb} episodes`);
    }
    if (qa !== qb) changes.push(qb ? 'enters the review queue' : 'leaves the review queue');
    if (changes.length) {
      changedCases.push({
        caseId: ra.caseId,
        key: ra.key,
        date: ra.date,
        a: { caseLevel: sa.caseLevel, majorPhysiology: sa.majorPhysiology, episodes: sa.episodeCount, inQueue: qa },
        b: { caseLevel: sb.caseLevel, majorPhysiology: sb.majorPhysiology, episodes: sb.episodeCount, inQueue: qb },
        changes,
      });
    }
  }
  return { a: options.a, b: options.b, cases: n, missingA, missingB, figures, changedCases };
}
