import { z } from 'zod';
import { CHANNELS } from './channel';

/**
 * A rule set (rules.md §2–§4): data, not code. A saved rule set is immutable — editing makes a
 * new `version` — and every computed result names the `id` and `version` that produced it.
 *
 * Thresholds are in the channel's engine unit (the first unit of `CHANNEL_SPECS[channel].units`:
 * mmHg for EtCO2 and inspired CO2, % for SpO2, /min for RR and HR), whatever unit the case arrived in.
 */
export const COMPARATORS = ['<', '<=', '=', '>=', '>'] as const;
export type Comparator = (typeof COMPARATORS)[number];

/** Channels that have a baseline (rules.md §3); only these may carry baseline-relative terms. */
export const BASELINE_CHANNELS = ['etco2', 'spo2', 'rr'] as const;
export type BaselineChannel = (typeof BASELINE_CHANNELS)[number];

/**
 * How a baseline-relative threshold is formed:
 * - `absolute-delta`: threshold = baseline + `threshold` (e.g. `>=` +10 mmHg, `<=` −10 mmHg);
 * - `percent`: threshold = baseline × (1 + `threshold` / 100) (e.g. `>=` +10 % , `<=` −10 %).
 */
export const RELATIVE_KINDS = ['absolute-delta', 'percent'] as const;
export type RelativeKind = (typeof RELATIVE_KINDS)[number];

export const COMBINES = ['any', 'all'] as const;
export type Combine = (typeof COMBINES)[number];

export const RULE_ID_PATTERN = /^[a-z][a-z0-9_]*$/;
export const RULE_SET_ID_PATTERN = /^[a-z0-9][a-z0-9.-]*$/;

export const ruleTermSchema = z
  .strictObject({
    channel: z.enum(CHANNELS),
    comparator: z.enum(COMPARATORS),
    /** Absolute threshold, or the delta / percent added to the baseline when `relativeTo` is set. */
    threshold: z.number().finite(),
    relativeTo: z.literal('baseline').optional(),
    /** Only with `relativeTo`; defaults to `absolute-delta`. */
    relativeKind: z.enum(RELATIVE_KINDS).optional(),
  })
  .superRefine((term, ctx) => {
    if (term.relativeKind !== undefined && term.relativeTo === undefined) {
      ctx.addIssue({ code: 'custom', path: ['relativeKind'], message: 'relativeKind needs relativeTo: "baseline"' });
    }
    if (term.relativeTo !== undefined && !(BASELINE_CHANNELS as readonly string[]).includes(term.channel)) {
      ctx.addIssue({
        code: 'custom',
        path: ['relativeTo'],
        message: `${term.channel} has no baseline (only ${BASELINE_CHANNELS.join(', ')} do)`,
      });
    }
  });

export const ruleSchema = z.strictObject({
  /** snake_case, unique within the rule set, e.g. `apnea`. */
  id: z.string().regex(RULE_ID_PATTERN, 'rule ids are snake_case (a-z, 0-9, _)'),
  description: z.string().min(1),
  /** Where the numbers come from; says "from memory" where the reference list does. */
  source: z.string().min(1),
  terms: z.array(ruleTermSchema).min(1),
  /** `any`: union of the terms' true sets (OR); `all`: intersection (AND). */
  combine: z.enum(COMBINES),
  /** An episode lasts at least this long (compared with ≥); 0 = any covered time. */
  minDurationS: z.number().finite().min(0),
  /** Merge episodes of this rule separated by less than this (default 0, off). */
  mergeGapS: z.number().finite().min(0).optional(),
  /** An episode of this rule sets `majorPhysiology` on the case (rules.md §6). */
  major: z.boolean().optional(),
});

export const ruleSetSchema = z
  .strictObject({
    /** kebab-case, e.g. `plateau-default`. */
    id: z.string().regex(RULE_SET_ID_PATTERN, 'rule-set ids are kebab-case (a-z, 0-9, -, .)'),
    version: z.number().int().min(1),
    description: z.string().min(1),
    rules: z.array(ruleSchema).min(1),
  })
  .superRefine((set, ctx) => {
    const seen = new Set<string>();
    set.rules.forEach((rule, i) => {
      if (seen.has(rule.id)) {
        ctx.addIssue({ code: 'custom', path: ['rules', i, 'id'], message: `duplicate rule id "${rule.id}"` });
      }
      seen.add(rule.id);
    });
  });

export type RuleTerm = z.infer<typeof ruleTermSchema>;
export type Rule = z.infer<typeof ruleSchema>;
export type RuleSet = z.infer<typeof ruleSetSchema>;

/** What every result carries to name the rule set that produced it. */
export interface RuleSetRef {
  id: string;
  version: number;
}
