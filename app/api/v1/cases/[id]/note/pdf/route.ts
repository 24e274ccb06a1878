import { z } from 'zod';
import { authorizeApi } from '@/lib/server/access';
import { errorResponse, HttpError } from '@/lib/server/http';
import { noteForExport } from '@/lib/db/notes';
import { NotFoundError } from '@/lib/db/cases';
import { appendAudit } from '@/lib/db/audit';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { pdfFonts } from '@/lib/server/fonts';
import { requestOrigin } from '@/lib/server/session';
import { chartDataFromCase } from '@/lib/note';
import { renderNotePdf } from '@/lib/note/pdf';
import { writeTx } from '@/lib/db/tx';

const Query = z.object({
  version: z.coerce.number().int().min(1, { message: 'must be a version number' }).optional(),
  size: z.enum(['A4', 'LETTER'], { message: 'must be A4 or LETTER' }).default('A4'),
});

/** The note as a print-ready PDF (A4 or US Letter), a signed version or the current draft. */
export async function GET(req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('GET /api/v1/cases/[id]/note/pdf');
  if (user instanceof Response) return user;
  try {
    const { id } = await ctx.params;
    const q = Query.parse(Object.fromEntries(new URL(req.url).searchParams));
    const t = now();
    const n = await noteForExport(db(), id, q.version ?? null, t);
    const pdf = await renderNotePdf(n.note, chartDataFromCase(n.record, n.analysis, n.facts), { pageSize: q.size, ...pdfFonts() });
    const origin = await requestOrigin();
    await writeTx(db(), (tx) => appendAudit(tx, { at: t, actorId: user.id, role: user.role, action: 'export', entity: 'note_pdf', entityId: id, caseId: id, after: { version: n.draft ? 'draft' : n.note.version, size: q.size }, origin }));
    const name = `plateau-note-${id.slice(0, 8)}-${n.draft ? 'draft' : `v${n.note.version}`}.pdf`;
    return new Response(Buffer.from(pdf), { headers: { 'content-type': 'application/pdf', 'content-disposition': `inline; filename="${name}"`, 'cache-control': 'no-store' } });
  } catch (e) {
    if (e instanceof NotFoundError) return errorResponse(new HttpError(404, e.message));
    return errorResponse(e);
  }
}
