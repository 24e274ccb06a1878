import { parseEntry } from '@/lib/domain/entry';
import { authorizeApi } from '@/lib/server/access';
import { checkOrigin, errorResponse, HttpError, parseJson } from '@/lib/server/http';
import { recordEntry } from '@/lib/db/entries';
import { ConflictError, NotFoundError } from '@/lib/db/cases';
import { scheduleSummary } from '@/lib/server/summaryQueue';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { requestOrigin } from '@/lib/server/session';
import { z } from 'zod';

/**
 * One bedside entry (dose, intervention, event, vital, recovery score, void, re-time).
 * Idempotent on the device-made id: 201 when stored now, 200 when it was already stored.
 */
export async function POST(req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('POST /api/v1/cases/[id]/entries');
  if (user instanceof Response) return user;
  try {
    checkOrigin(req);
    const { id } = await ctx.params;
    const entry = parseEntry(await parseJson(req, z.unknown()));
    const t = now();
    const r = await recordEntry(db(), id, entry, { id: user.id, role: user.role, origin: await requestOrigin() }, t);
    // The summary is derived data: recompute it soon (readers refresh a stale one themselves).
    if (r.created) scheduleSummary(id);
    return Response.json(r, { status: r.created ? 201 : 200 });
  } catch (e) {
    if (e instanceof NotFoundError) return errorResponse(new HttpError(404, e.message));
    if (e instanceof ConflictError) return errorResponse(new HttpError(409, e.message));
    return errorResponse(e);
  }
}
