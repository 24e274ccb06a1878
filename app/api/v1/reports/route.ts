import { authorizeApi } from '@/lib/server/access';
import { checkOrigin, parseJson } from '@/lib/server/http';
import { configuredMinCell, issueReport, listIssuedReports } from '@/lib/db/indicatorReports';
import { IssueReportInput } from '@/lib/indicators/requests';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { reportActor, reportErrorResponse } from './shared';

/** The issued report versions (newest period first). */
export async function GET() {
  const user = await authorizeApi('GET /api/v1/reports');
  if (user instanceof Response) return user;
  try {
    return Response.json({ reports: await listIssuedReports(db()) });
  } catch (e) {
    return reportErrorResponse(e);
  }
}

/** Issues the report of a period and scope as a new frozen version: `{ period: '2026-Q3', scope: 'all' }`. */
export async function POST(req: Request) {
  const user = await authorizeApi('POST /api/v1/reports');
  if (user instanceof Response) return user;
  try {
    checkOrigin(req);
    const input = await parseJson(req, IssueReportInput);
    const r = await issueReport(db(), input, await reportActor(user), now(), configuredMinCell());
    return Response.json(r, { status: 201 });
  } catch (e) {
    return reportErrorResponse(e);
  }
}
