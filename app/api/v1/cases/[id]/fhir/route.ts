import { z } from 'zod';
import { authorizeApi } from '@/lib/server/access';
import { errorResponse, HttpError } from '@/lib/server/http';
import { noteForExport } from '@/lib/db/notes';
import { NotFoundError } from '@/lib/db/cases';
import { appendAudit } from '@/lib/db/audit';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { requestOrigin } from '@/lib/server/session';
import { caseToFhirBundle } from '@/lib/export';
import { writeTx } from '@/lib/db/tx';

const Query = z.object({ version: z.coerce.number().int().min(1, { message: 'must be a version number' }).optional() });

/** The case as one FHIR R4 Bundle (a signed version, or the current draft when unsigned). */
export async function GET(req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('GET /api/v1/cases/[id]/fhir');
  if (user instanceof Response) return user;
  try {
    const { id } = await ctx.params;
    const url = new URL(req.url);
    const q = Query.parse(Object.fromEntries(url.searchParams));
    const t = now();
    const n = await noteForExport(db(), id, q.version ?? null, t);
    const c = await db().case.findUniqueOrThrow({ where: { id }, select: { patientId: true } });
    const bundle = caseToFhirBundle({ ...n, ids: { baseUrl: `${url.origin}/fhir`, patient: c.patientId, encounter: `enc-${id}`.slice(0, 40), case: id.slice(0, 40) }, generatedAt: t.toISOString() });
    const origin = await requestOrigin();
    await writeTx(db(), (tx) => appendAudit(tx, { at: t, actorId: user.id, role: user.role, action: 'export', entity: 'fhir_bundle', entityId: id, caseId: id, after: { version: n.draft ? 'draft' : n.note.version }, origin }));
    return new Response(JSON.stringify(bundle, null, 2), {
      headers: { 'content-type': 'application/fhir+json', 'content-disposition': `attachment; filename="plateau-case-${id.slice(0, 8)}-${n.draft ? 'draft' : `v${n.note.version}`}.fhir.json"`, 'cache-control': 'no-store' },
    });
  } catch (e) {
    if (e instanceof NotFoundError) return errorResponse(new HttpError(404, e.message));
    return errorResponse(e);
  }
}
