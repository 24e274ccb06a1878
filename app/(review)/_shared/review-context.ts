import { db } from '@/lib/db/client';
import { reviewUnit, type ReviewUnit } from '@/lib/db/review';
import { findRuleSet, parseRuleSetRef } from '@/lib/db/ruleSetStore';
import { errorResponse, HttpError } from '@/lib/server/http';
import { ConflictError, NotFoundError } from '@/lib/db/cases';
import { unitForUser } from '@/lib/server/unit';
import { now } from '@/lib/server/clock';
import type { SessionUser } from '@/lib/server/session';
import { localDate } from '@/lib/_shared/time';
import { zodMessage } from '@/lib/_shared/zodMessage';
import { ReviewPeriodQuery } from '@/lib/domain/review';
import type { RuleSet } from '@/lib/domain/ruleSet';
import { lastFullMonth, monthPeriod, resolvePeriod, type ReviewPeriod } from '@/lib/review';

/** Search params as pages and handlers get them, flattened to single strings. */
export type Params = Record<string, string | undefined>;

export function flatParams(sp: Record<string, string | string[] | undefined> | URLSearchParams): Params {
  if (sp instanceof URLSearchParams) return Object.fromEntries(sp.entries());
  return Object.fromEntries(Object.entries(sp).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]));
}

export interface ReviewContext {
  unit: ReviewUnit;
  today: string;
  period: ReviewPeriod;
  /** Set when the period in the query was not valid and the default was used instead (pages only). */
  periodProblem: string | null;
}

/**
 * The lead's unit and the period a request asks for (a month, from–to, or by default the last
 * full month in the unit's zone). `strict`: a bad period is a 422 (API); else the page falls
 * back to the default and says why.
 */
export async function reviewContext(user: SessionUser, params: Params, strict: boolean): Promise<ReviewContext> {
  const u = await unitForUser(user);
  const unit = u ? await reviewUnit(db(), u.id) : null;
  if (!unit) throw new HttpError(409, 'unit: no unit is set up yet');
  const today = localDate(now(), unit.timeZone);
  const parsed = ReviewPeriodQuery.safeParse({ month: params.month || undefined, from: params.from || undefined, to: params.to || undefined });
  if (!parsed.success) {
    if (strict) throw parsed.error;
    return { unit, today, period: monthPeriod(lastFullMonth(today)), periodProblem: zodMessage(parsed.error) };
  }
  return { unit, today, period: resolvePeriod(parsed.data, today), periodProblem: null };
}

/** The rule set named by `id@version` in a query parameter; a 404 names it when unknown. */
export async function ruleSetParam(text: string | undefined): Promise<RuleSet | undefined> {
  if (!text) return undefined;
  const ref = parseRuleSetRef(text);
  if (!ref) throw new HttpError(422, `rs: must be a rule set as id@version (got "${text}")`);
  const rs = await findRuleSet(db(), ref);
  if (!rs) throw new HttpError(404, `rs: rule set ${text} not found`);
  return rs;
}

/** errorResponse, with the repositories' typed errors mapped: not found → 404, conflict (stale edit) → 409. */
export function reviewErrorResponse(e: unknown): Response {
  if (e instanceof NotFoundError) return errorResponse(new HttpError(404, e.message));
  if (e instanceof ConflictError) return errorResponse(new HttpError(409, e.message));
  return errorResponse(e);
}
