import { authorizeApi } from '@/lib/server/access';
import { checkOrigin, HttpError, parseJson } from '@/lib/server/http';
import { requestOrigin } from '@/lib/server/session';
import { now } from '@/lib/server/clock';
import { db } from '@/lib/db/client';
import { loadReviewCase, recordReview } from '@/lib/db/review';
import { ReviewInput } from '@/lib/domain/review';
import { flatParams, reviewContext, reviewErrorResponse, ruleSetParam } from '@/app/(review)/_shared/review-context';

/** One case for review: facts, analysis, timeline, episode segments, queue reasons and the lead's review. `rs=id@version` for another rule set. */
export async function GET(req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('GET /api/v1/review/cases/[id]');
  if (user instanceof Response) return user;
  try {
    const { id } = await ctx.params;
    const params = flatParams(new URL(req.url).searchParams);
    const rc = await reviewContext(user, {}, false);
    const data = await loadReviewCase(db(), rc.unit, id, now(), await ruleSetParam(params.rs));
    if (!data) throw new HttpError(404, `case ${id} not found in your unit`);
    return Response.json(data);
  } catch (e) {
    return reviewErrorResponse(e);
  }
}

/** Records the lead's review (status, category, comment, follow-up) against the version seen; stale → 409. */
export async function PUT(req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('PUT /api/v1/review/cases/[id]');
  if (user instanceof Response) return user;
  try {
    checkOrigin(req);
    const { id } = await ctx.params;
    const input = await parseJson(req, ReviewInput);
    const r = await recordReview(db(), id, input, { id: user.id, role: user.role, origin: await requestOrigin() }, now());
    return Response.json(r);
  } catch (e) {
    return reviewErrorResponse(e);
  }
}
