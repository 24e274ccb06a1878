import { authorizeApi } from '@/lib/server/access';
import { configuredMinCell, indicatorSeriesExport } from '@/lib/db/indicatorReports';
import { queryObject, SeriesQuery } from '@/lib/indicators/requests';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { reportActor, reportErrorResponse } from '../reports/shared';

/**
 * Every indicator in every whole month, quarter or year between `from` and `to` (YYYY-MM-DD),
 * for other systems: `?from=2026-01-01&to=2026-06-30&period=month&scope=all`. De-identified
 * and small-cell suppressed like the reports; audited as an export. Auth: the session cookie.
 */
export async function GET(req: Request) {
  const user = await authorizeApi('GET /api/v1/indicators');
  if (user instanceof Response) return user;
  try {
    const q = SeriesQuery.parse(queryObject(new URL(req.url).searchParams));
    const out = await indicatorSeriesExport(db(), { from: q.from, to: q.to, periodKind: q.period, scope: q.scope, minCell: q.minCell }, await reportActor(user), now(), configuredMinCell());
    return Response.json(out, { headers: { 'cache-control': 'no-store' } });
  } catch (e) {
    return reportErrorResponse(e);
  }
}
