import { z } from 'zod';
import { ruleSetSchema } from './ruleSet';

/**
 * The lead's review of a case (issue 5, the review workflow): statuses, Plateau's own list of
 * contributing-factor categories, why a case enters the review queue, and the zod schemas of
 * what the review pages send.
 */

export const REVIEW_STATUSES = ['to_review', 'reviewed'] as const;
export type ReviewStatus = (typeof REVIEW_STATUSES)[number];
export const REVIEW_STATUS_LABEL: Record<ReviewStatus, string> = {
  to_review: 'To review',
  reviewed: 'Reviewed',
};

/**
 * Contributing-factor categories, in Plateau's own words. One category per review: the factor
 * the lead judges contributed most. The list is Plateau's; it follows no published taxonomy.
 */
export const REVIEW_CATEGORIES = [
  'depth_beyond_plan',
  'dosing',
  'patient_factors',
  'procedure_factors',
  'airway_management',
  'monitoring',
  'equipment',
  'staffing',
  'communication',
  'artefact',
  'none_found',
  'other',
] as const;
export type ReviewCategory = (typeof REVIEW_CATEGORIES)[number];

export const REVIEW_CATEGORY_LABEL: Record<ReviewCategory, string> = {
  depth_beyond_plan: 'Sedation deeper than planned',
  dosing: 'Dosing: amount, timing or combination of drugs',
  patient_factors: 'Patient factors',
  procedure_factors: 'Procedure factors',
  airway_management: 'Airway support late or not enough',
  monitoring: 'Monitoring',
  equipment: 'Equipment',
  staffing: 'Staffing and workload',
  communication: 'Communication in the team',
  artefact: 'Artefact: no real event',
  none_found: 'No contributing factor found',
  other: 'Other',
};

/** What each category covers, shown beside the choice. */
export const REVIEW_CATEGORY_MEANING: Record<ReviewCategory, string> = {
  depth_beyond_plan: 'The patient went deeper than the planned depth (e.g. planned moderate, reached deep).',
  dosing: 'A bolus too large or too quick, stacked doses, or a sedative combined with an opioid without adjusting.',
  patient_factors: 'Airway, obesity, sleep apnoea, frailty, lung or heart disease, or other conditions of the patient.',
  procedure_factors: 'A long or stimulating procedure, a shared airway (bronchoscopy, ERCP), or the position on the table.',
  airway_management: 'Chin lift, jaw thrust, an adjunct or oxygen came later than it should, or did not suffice.',
  monitoring: 'Capnography not used or unreliable, alarms off or unheard, or the event recognised late.',
  equipment: 'A blocked or disconnected sampling line, a faulty probe, oxygen supply, suction or airway kit.',
  staffing: 'One nurse for two tasks, skill mix, handover during the case, or the list running late.',
  communication: 'Concerns not voiced or not heard between nurse, proceduralist and anaesthetist.',
  artefact: 'The recorded event did not happen to the patient (line off, probe off, data error).',
  none_found: 'Reviewed; the event was within what can be expected and nothing contributed that could change.',
  other: 'Something else; say what in the comment.',
};

/**
 * Why a case enters the review queue: a level of `supported` or above, `majorPhysiology`, or a
 * first response to apnea slower than the unit's `reviewResponseLimitS`.
 */
export const QUEUE_REASONS = ['supported_or_above', 'major_physiology', 'slow_apnea_response'] as const;
export type QueueReason = (typeof QUEUE_REASONS)[number];
export const QUEUE_REASON_LABEL: Record<QueueReason, string> = {
  supported_or_above: 'Breathing supported or rescue',
  major_physiology: 'Major physiology',
  slow_apnea_response: 'Slow response to apnea',
};

const longText = (max: number) => z.string().trim().max(max, { message: `must be at most ${max} characters` });

/**
 * A review as the lead records it. `version` is the CaseReview version the lead saw (0 when the
 * case had no review yet): a stale version is refused with 409, never overwritten.
 */
export const ReviewInput = z
  .object({
    status: z.enum(REVIEW_STATUSES, { message: 'must be to_review or reviewed' }),
    category: z.enum(REVIEW_CATEGORIES, { message: 'choose a category from the list' }).nullable().optional(),
    comment: longText(4000).nullable().optional(),
    followUp: longText(4000).nullable().optional(),
    version: z.number({ message: 'must be a number' }).int().min(0),
  })
  .refine((v) => v.status !== 'reviewed' || !!v.category, { message: 'choose a contributing-factor category before marking the case reviewed', path: ['category'] });
export type ReviewInput = z.infer<typeof ReviewInput>;

const isoDate = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, { message: 'must be a date (YYYY-MM-DD)' });

/** A review period from query parameters: a month (YYYY-MM) or an inclusive date range. */
export const ReviewPeriodQuery = z
  .object({
    month: z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, { message: 'must be a month (YYYY-MM)' }).optional(),
    from: isoDate.optional(),
    to: isoDate.optional(),
  })
  .refine((v) => !v.from || !v.to || v.from <= v.to, { message: 'must not be before from', path: ['to'] })
  .refine((v) => !!v.from === !!v.to, { message: 'give both from and to, or a month', path: ['to'] });
export type ReviewPeriodQuery = z.infer<typeof ReviewPeriodQuery>;

/** A rule set named in a query parameter as `id@version`. */
export const RULE_SET_REF_PATTERN = /^([a-z0-9][a-z0-9.-]*)@([1-9][0-9]*)$/;

/** A lead's own rule set to save: validated whole; the server assigns the next version of its id. */
export const SaveRuleSetInput = z.object({ ruleSet: ruleSetSchema });
export type SaveRuleSetInput = z.infer<typeof SaveRuleSetInput>;

/** Computing a rule set's summaries for a period, a batch at a time (the comparison page shows progress). */
export const ComputeSummariesInput = z.object({
  ruleSet: z.string().regex(RULE_SET_REF_PATTERN, { message: 'must be a rule set as id@version' }),
  from: isoDate,
  to: isoDate,
  limit: z.number().int().min(1).max(200).optional(),
});
export type ComputeSummariesInput = z.infer<typeof ComputeSummariesInput>;
