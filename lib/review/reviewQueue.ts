import type { StatsRow } from '@/lib/domain/statsRow';
import type { QueueReason } from '@/lib/domain/review';
import { levelRank } from '@/lib/domain/intervention';

export interface QueueOptions {
  /** The unit's `reviewResponseLimitS`: a first response to apnea slower than this enters the queue. */
  responseLimitS: number;
}

/**
 * Why a case enters the lead's review queue (issue 5): its case level is `supported` or
 * `rescued`; or it has `majorPhysiology`; or the first response to its first apnea came more
 * than `responseLimitS` seconds after the apnea began (strictly more). Empty: not in the queue.
 * A case without a summary for the rule set is not judged.
 *
 * @example queueReasons(row, { responseLimitS: 60 }) //=> ['major_physiology', 'slow_apnea_response']
 */
export function queueReasons(row: StatsRow, options: QueueOptions): QueueReason[] {
  const s = row.summary;
  if (!s) return [];
  const out: QueueReason[] = [];
  if (levelRank(s.caseLevel) >= levelRank('supported')) out.push('supported_or_above');
  if (s.majorPhysiology) out.push('major_physiology');
  if (s.firstApneaResponseS !== null && s.firstApneaResponseS > options.responseLimitS) out.push('slow_apnea_response');
  return out;
}

/** Whether a case enters the review queue (the same rule as `queueReasons`, without listing why). */
export function inReviewQueue(row: StatsRow, options: QueueOptions): boolean {
  const s = row.summary;
  if (!s) return false;
  return s.caseLevel === 'supported' || s.caseLevel === 'rescued' || s.majorPhysiology || (s.firstApneaResponseS !== null && s.firstApneaResponseS > options.responseLimitS);
}

export interface QueueEntry {
  row: StatsRow;
  reasons: QueueReason[];
}

/** The cases of `rows` that enter the review queue, in the rows' order (date, then start). */
export function reviewQueue(rows: readonly StatsRow[], options: QueueOptions): QueueEntry[] {
  const out: QueueEntry[] = [];
  for (const row of rows) {
    const reasons = queueReasons(row, options);
    if (reasons.length) out.push({ row, reasons });
  }
  return out;
}
