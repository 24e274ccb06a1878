import { authorizeApi } from '@/lib/server/access';
import { HttpError } from '@/lib/server/http';
import { db } from '@/lib/db/client';
import { loadReviewQueue } from '@/lib/db/review';
import { REVIEW_STATUSES, type ReviewStatus } from '@/lib/domain/review';
import { flatParams, reviewContext, reviewErrorResponse } from '@/app/(review)/_shared/review-context';

/** The review queue of a period (`status` = to_review | reviewed to narrow it). */
export async function GET(req: Request) {
  const user = await authorizeApi('GET /api/v1/review/queue');
  if (user instanceof Response) return user;
  try {
    const params = flatParams(new URL(req.url).searchParams);
    if (params.status && !(REVIEW_STATUSES as readonly string[]).includes(params.status)) throw new HttpError(422, 'status: must be to_review or reviewed');
    const ctx = await reviewContext(user, params, true);
    const items = await loadReviewQueue(db(), ctx.unit, { period: ctx.period, status: params.status as ReviewStatus | undefined });
    return Response.json({ period: ctx.period, responseLimitS: ctx.unit.reviewResponseLimitS, queue: items.map((i) => ({ caseId: i.row.caseId, key: i.row.key, date: i.row.date, reasons: i.reasons, caseLevel: i.row.summary?.caseLevel ?? null, review: i.review })) });
  } catch (e) {
    return reviewErrorResponse(e);
  }
}
