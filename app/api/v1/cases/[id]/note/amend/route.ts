import { AmendNoteInput } from '@/lib/domain/noteAction';
import { authorizeApi } from '@/lib/server/access';
import { checkOrigin, errorResponse, HttpError, parseJson } from '@/lib/server/http';
import { confirmPassword } from '@/lib/server/reauth';
import { amendNote } from '@/lib/db/notes';
import { ConflictError, NotFoundError } from '@/lib/db/cases';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { requestOrigin } from '@/lib/server/session';

export async function POST(req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('POST /api/v1/cases/[id]/note/amend');
  if (user instanceof Response) return user;
  try {
    checkOrigin(req);
    const { id } = await ctx.params;
    const input = await parseJson(req, AmendNoteInput);
    await confirmPassword(user.id, input.password);
    const actor = { id: user.id, role: user.role, origin: await requestOrigin() };
    const r = await amendNote(db(), id, input.reason, input.freeText ?? null, actor, now());
    return Response.json({ id: r.id, version: r.version, kind: r.kind, cosignRequired: r.cosignRequired }, { status: 201 });
  } catch (e) {
    if (e instanceof NotFoundError) return errorResponse(new HttpError(404, e.message));
    if (e instanceof ConflictError) return errorResponse(new HttpError(409, e.message));
    return errorResponse(e);
  }
}
