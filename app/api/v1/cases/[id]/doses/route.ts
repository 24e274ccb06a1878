import { DoseInput } from '@/lib/domain/dose';
import { authorizeApi } from '@/lib/server/access';
import { checkOrigin, errorResponse, HttpError, parseJson } from '@/lib/server/http';
import { ConflictError, NotFoundError, recordDose } from '@/lib/db/cases';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { requestOrigin } from '@/lib/server/session';

/** Records a dose; the device-made id makes a retry idempotent (200 on repeat, 201 first time). */
export async function POST(req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('POST /api/v1/cases/[id]/doses');
  if (user instanceof Response) return user;
  try {
    checkOrigin(req);
    const { id } = await ctx.params;
    const input = await parseJson(req, DoseInput);
    const r = await recordDose(db(), { ...input, caseId: id, at: new Date(input.at) }, { id: user.id, role: user.role, origin: await requestOrigin() }, now());
    return Response.json({ dose: r.dose, created: r.created }, { status: r.created ? 201 : 200 });
  } catch (e) {
    if (e instanceof NotFoundError) return errorResponse(new HttpError(404, e.message));
    if (e instanceof ConflictError) return errorResponse(new HttpError(409, e.message));
    return errorResponse(e);
  }
}
