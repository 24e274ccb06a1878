import { authorizeApi } from '@/lib/server/access';
import { db } from '@/lib/db/client';
import { loadReview } from '@/lib/db/review';
import { flatParams, reviewContext, reviewErrorResponse } from '@/app/(review)/_shared/review-context';

/** The monthly review of a period as JSON: headline, trend, breakdowns, funnels, O/E by room. */
export async function GET(req: Request) {
  const user = await authorizeApi('GET /api/v1/review');
  if (user instanceof Response) return user;
  try {
    const params = flatParams(new URL(req.url).searchParams);
    const ctx = await reviewContext(user, params, true);
    const r = await loadReview(db(), ctx.unit, { period: ctx.period, focus: params.focus });
    return Response.json({ unit: { id: ctx.unit.id, name: ctx.unit.name, reviewResponseLimitS: ctx.unit.reviewResponseLimitS }, ...r });
  } catch (e) {
    return reviewErrorResponse(e);
  }
}
