import { authorizeApi } from '@/lib/server/access';
import { HttpError } from '@/lib/server/http';
import { db } from '@/lib/db/client';
import { loadComparison } from '@/lib/db/review';
import { flatParams, reviewContext, reviewErrorResponse, ruleSetParam } from '@/app/(review)/_shared/review-context';

/** The period's headline figures and changed cases under the unit's rule set and `rs` (id@version). */
export async function GET(req: Request) {
  const user = await authorizeApi('GET /api/v1/review/compare');
  if (user instanceof Response) return user;
  try {
    const params = flatParams(new URL(req.url).searchParams);
    const ctx = await reviewContext(user, params, true);
    const other = await ruleSetParam(params.rs);
    if (!other) throw new HttpError(422, 'rs: choose the rule set to compare with (id@version)');
    return Response.json({ period: ctx.period, ...(await loadComparison(db(), ctx.unit, { period: ctx.period, other })) });
  } catch (e) {
    return reviewErrorResponse(e);
  }
}
