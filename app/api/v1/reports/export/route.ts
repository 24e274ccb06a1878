import { authorizeApi } from '@/lib/server/access';
import { configuredMinCell, exportDraftReport } from '@/lib/db/indicatorReports';
import { DraftExportQuery, queryObject } from '@/lib/indicators/requests';
import { pdfFonts } from '@/lib/server/fonts';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { fileResponse, reportActor, reportErrorResponse } from '../shared';

/** The live (not issued) report as PDF, CSV or JSON: `?period=2026-Q3&scope=all&format=pdf`. */
export async function GET(req: Request) {
  const user = await authorizeApi('GET /api/v1/reports/export');
  if (user instanceof Response) return user;
  try {
    const q = DraftExportQuery.parse(queryObject(new URL(req.url).searchParams));
    return fileResponse(await exportDraftReport(db(), { period: q.period, scope: q.scope, minCell: q.minCell }, q.format, pdfFonts, await reportActor(user), now(), configuredMinCell()));
  } catch (e) {
    return reportErrorResponse(e);
  }
}
