import { authorizeApi } from '@/lib/server/access';
import { CaseEditError, CaseEditInput, parseChanges } from '@/lib/domain/caseEdit';
import { checkOrigin, errorResponse, HttpError, parseJson } from '@/lib/server/http';
import { editCaseFacts } from '@/lib/db/entries';
import { ConflictError, NotFoundError } from '@/lib/db/cases';
import { scheduleSummary } from '@/lib/server/summaryQueue';
import { now } from '@/lib/server/clock';
import { requestOrigin } from '@/lib/server/session';
import { caseFacts } from '@/lib/db/cases';
import { db } from '@/lib/db/client';

export async function GET(_req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('GET /api/v1/cases/[id]');
  if (user instanceof Response) return user;
  const { id } = await ctx.params;
  const c = await caseFacts(db(), id);
  if (!c) return Response.json({ error: `case ${id} not found` }, { status: 404 });
  return Response.json(c);
}

/** Edits case facts; each change carries the value the editor saw (per-field conflict check). */
export async function PATCH(req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('PATCH /api/v1/cases/[id]');
  if (user instanceof Response) return user;
  try {
    checkOrigin(req);
    const { id } = await ctx.params;
    const input = await parseJson(req, CaseEditInput);
    const t = now();
    const r = await editCaseFacts(db(), id, parseChanges(input.changes), { id: user.id, role: user.role, origin: await requestOrigin() }, t);
    scheduleSummary(id);
    return Response.json(r);
  } catch (e) {
    if (e instanceof CaseEditError) return errorResponse(new HttpError(422, e.message));
    if (e instanceof NotFoundError) return errorResponse(new HttpError(404, e.message));
    if (e instanceof ConflictError) return errorResponse(new HttpError(409, e.message));
    return errorResponse(e);
  }
}
