import { authorizeApi } from '@/lib/server/access';
import { getIssuedReport } from '@/lib/db/indicatorReports';
import { db } from '@/lib/db/client';
import { reportErrorResponse } from '../shared';

/** One issued version as stored: summary, the frozen report, its diff and the other versions; the case references only for a lead. */
export async function GET(_req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('GET /api/v1/reports/[id]');
  if (user instanceof Response) return user;
  try {
    const { id } = await ctx.params;
    return Response.json(await getIssuedReport(db(), id, { withRefs: user.role === 'lead' }), { headers: { 'cache-control': 'no-store' } });
  } catch (e) {
    return reportErrorResponse(e);
  }
}
