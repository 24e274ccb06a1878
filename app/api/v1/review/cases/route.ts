import { authorizeApi } from '@/lib/server/access';
import { db } from '@/lib/db/client';
import { loadReviewCases } from '@/lib/db/review';
import { parseCaseFilter } from '@/lib/review';
import { flatParams, reviewContext, reviewErrorResponse } from '@/app/(review)/_shared/review-context';

/** The cases behind a number (drill-down): the period plus `figure`, `dim` + `value`, `month`, `queue=1`. */
export async function GET(req: Request) {
  const user = await authorizeApi('GET /api/v1/review/cases');
  if (user instanceof Response) return user;
  try {
    const params = flatParams(new URL(req.url).searchParams);
    const ctx = await reviewContext(user, params, true);
    const r = await loadReviewCases(db(), ctx.unit, { period: ctx.period, filter: parseCaseFilter(params) });
    return Response.json({
      period: ctx.period,
      description: r.description,
      cases: r.rows.map((row) => ({ ...row, queueReasons: r.reasons.get(row.caseId) ?? [], review: r.reviews.get(row.caseId) ?? null })),
    });
  } catch (e) {
    return reviewErrorResponse(e);
  }
}
