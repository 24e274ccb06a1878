import type { Analysis } from '@/lib/domain/episode';

/**
 * A case note needs a second signature when the patient needed support or rescue (case level
 * `supported` or `rescued`, rules.md §6) or when the case had major physiology (a prolonged apnea,
 * prolonged or critical hypoxemia), whatever was done.
 *
 * @example
 * coSignatureNeeded({ caseLevel: 'corrected', summary: { majorPhysiology: false } }) //=> false
 * coSignatureNeeded({ caseLevel: 'supported', summary: { majorPhysiology: false } }) //=> true
 */
export function coSignatureNeeded(analysis: Pick<Analysis, 'caseLevel'> & { summary: Pick<Analysis['summary'], 'majorPhysiology'> }): boolean {
  return analysis.caseLevel === 'supported' || analysis.caseLevel === 'rescued' || analysis.summary.majorPhysiology;
}
