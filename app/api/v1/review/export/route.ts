import { authorizeApi } from '@/lib/server/access';
import { HttpError } from '@/lib/server/http';
import { db } from '@/lib/db/client';
import { loadComparison, loadReview, loadReviewCases, loadReviewQueue } from '@/lib/db/review';
import { caseListTable, changedCasesTable, comparisonTable, parseCaseFilter, reviewTable, toCsv, REVIEW_TABLES, type CsvTable } from '@/lib/review';
import { flatParams, reviewContext, reviewErrorResponse, ruleSetParam } from '@/app/(review)/_shared/review-context';

const OTHER_TABLES = ['cases', 'queue', 'compare', 'compare-cases'] as const;

/**
 * One table of the review pages as CSV: `table` = headline, monthly, breakdown-<dimension>,
 * funnel-proceduralist, funnel-nurse, oe-room, cases (with the drill-down filters), queue, compare or
 * compare-cases (with `rs`); the period as on the pages (`month`, or `from` and `to`).
 */
export async function GET(req: Request) {
  const user = await authorizeApi('GET /api/v1/review/export');
  if (user instanceof Response) return user;
  try {
    const params = flatParams(new URL(req.url).searchParams);
    const table = params.table ?? '';
    if (!(REVIEW_TABLES as readonly string[]).includes(table) && !(OTHER_TABLES as readonly string[]).includes(table)) {
      throw new HttpError(422, `table: must be one of ${[...REVIEW_TABLES, ...OTHER_TABLES].join(', ')}`);
    }
    const ctx = await reviewContext(user, params, true);
    let csv: CsvTable | undefined;
    if (table === 'cases') {
      const r = await loadReviewCases(db(), ctx.unit, { period: ctx.period, filter: parseCaseFilter(params) });
      csv = caseListTable(r.rows, (row) => ({ reasons: r.reasons.get(row.caseId), status: r.reviews.get(row.caseId)?.status ?? 'to_review', category: r.reviews.get(row.caseId)?.category ?? null }));
    } else if (table === 'queue') {
      const items = await loadReviewQueue(db(), ctx.unit, { period: ctx.period });
      const by = new Map(items.map((i) => [i.row.caseId, i]));
      csv = caseListTable(items.map((i) => i.row), (row) => ({ reasons: by.get(row.caseId)?.reasons, status: by.get(row.caseId)?.review?.status ?? 'to_review', category: by.get(row.caseId)?.review?.category ?? null }));
      csv.name = 'queue';
    } else if (table === 'compare' || table === 'compare-cases') {
      const other = await ruleSetParam(params.rs);
      if (!other) throw new HttpError(422, 'rs: choose the rule set to compare with (id@version)');
      const { comparison } = await loadComparison(db(), ctx.unit, { period: ctx.period, other });
      csv = table === 'compare' ? comparisonTable(comparison) : changedCasesTable(comparison);
    } else {
      const { review } = await loadReview(db(), ctx.unit, { period: ctx.period, focus: params.focus });
      csv = reviewTable(review, table);
    }
    if (!csv) throw new HttpError(404, `table: ${table} not found`);
    return new Response(toCsv(csv), {
      headers: {
        'content-type': 'text/csv; charset=utf-8',
        'content-disposition': `attachment; filename="plateau-review-${csv.name}-${ctx.period.from}-to-${ctx.period.to}.csv"`,
        'cache-control': 'no-store',
      },
    });
  } catch (e) {
    return reviewErrorResponse(e);
  }
}
