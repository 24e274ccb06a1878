import { authorizeApi } from '@/lib/server/access';
import { resolveReportRef } from '@/lib/db/indicatorReports';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { reportActor, reportErrorResponse } from '../../../shared';

/** Resolves an opaque case reference of an issued report to the case (a lead only; audited). */
export async function GET(_req: Request, ctx: { params: Promise<{ id: string; ref: string }> }) {
  const user = await authorizeApi('GET /api/v1/reports/[id]/refs/[ref]');
  if (user instanceof Response) return user;
  try {
    const { id, ref } = await ctx.params;
    const { caseId } = await resolveReportRef(db(), id, ref, await reportActor(user), now());
    return Response.json({ ref, caseId, href: `/cases/${encodeURIComponent(caseId)}` }, { headers: { 'cache-control': 'no-store' } });
  } catch (e) {
    return reportErrorResponse(e);
  }
}
