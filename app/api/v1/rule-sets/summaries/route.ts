import { authorizeApi } from '@/lib/server/access';
import { checkOrigin, HttpError, parseJson } from '@/lib/server/http';
import { now } from '@/lib/server/clock';
import { db } from '@/lib/db/client';
import { computeMissingSummaries } from '@/lib/db/review';
import { ComputeSummariesInput } from '@/lib/domain/review';
import { resolvePeriod } from '@/lib/review';
import { reviewContext, reviewErrorResponse, ruleSetParam } from '@/app/(review)/_shared/review-context';

/** Computes the next batch of a period's missing summaries under a rule set; returns what remains. */
export async function POST(req: Request) {
  const user = await authorizeApi('POST /api/v1/rule-sets/summaries');
  if (user instanceof Response) return user;
  try {
    checkOrigin(req);
    const input = await parseJson(req, ComputeSummariesInput);
    if (input.from > input.to) throw new HttpError(422, 'to: must not be before from');
    const ctx = await reviewContext(user, {}, false);
    const ruleSet = (await ruleSetParam(input.ruleSet))!;
    const r = await computeMissingSummaries(db(), ctx.unit, { period: resolvePeriod({ from: input.from, to: input.to }, ctx.today), ruleSet, limit: input.limit ?? 20, now: now() });
    return Response.json(r);
  } catch (e) {
    return reviewErrorResponse(e);
  }
}
