import { z } from 'zod';
import { authorizeApi } from '@/lib/server/access';
import { exportIssuedReport } from '@/lib/db/indicatorReports';
import { ExportFormatParam } from '@/lib/indicators/requests';
import { pdfFonts } from '@/lib/server/fonts';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { fileResponse, reportActor, reportErrorResponse } from '../../shared';

const Query = z.object({ format: ExportFormatParam });

/** An issued version as PDF, CSV or JSON, rendered from its frozen numbers: `?format=csv`. */
export async function GET(req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('GET /api/v1/reports/[id]/export');
  if (user instanceof Response) return user;
  try {
    const { id } = await ctx.params;
    const q = Query.parse(Object.fromEntries(new URL(req.url).searchParams));
    return fileResponse(await exportIssuedReport(db(), id, q.format, pdfFonts, await reportActor(user), now()));
  } catch (e) {
    return reportErrorResponse(e);
  }
}
