import { z } from 'zod';
import { authorizeApi } from '@/lib/server/access';
import { errorResponse } from '@/lib/server/http';
import { loadCaseSheet } from '@/lib/db/caseSheet';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';

const Query = z.object({ after: z.coerce.number({ message: 'must be a sample id' }).int().min(0).default(0) });

/** The live case sheet: entries, analysis, and monitor samples after sample id `after`. */
export async function GET(req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('GET /api/v1/cases/[id]/sheet');
  if (user instanceof Response) return user;
  try {
    const { id } = await ctx.params;
    const q = Query.parse(Object.fromEntries(new URL(req.url).searchParams));
    const sheet = await loadCaseSheet(db(), id, q.after, now());
    if (!sheet) return Response.json({ error: `case ${id} not found` }, { status: 404 });
    return Response.json(sheet, { headers: { 'cache-control': 'no-store' } });
  } catch (e) {
    return errorResponse(e);
  }
}
