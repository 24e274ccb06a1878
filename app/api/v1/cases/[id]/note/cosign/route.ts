import { CosignNoteInput } from '@/lib/domain/noteAction';
import { authorizeApi } from '@/lib/server/access';
import { checkOrigin, errorResponse, HttpError, parseJson } from '@/lib/server/http';
import { confirmPassword } from '@/lib/server/reauth';
import { cosignNote } from '@/lib/db/notes';
import { ConflictError, NotFoundError } from '@/lib/db/cases';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { requestOrigin } from '@/lib/server/session';

export async function POST(req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('POST /api/v1/cases/[id]/note/cosign');
  if (user instanceof Response) return user;
  try {
    checkOrigin(req);
    const { id } = await ctx.params;
    const input = await parseJson(req, CosignNoteInput);
    await confirmPassword(user.id, input.password);
    const actor = { id: user.id, role: user.role, origin: await requestOrigin() };
    const r = await cosignNote(db(), id, actor, now());
    return Response.json(r, { status: 201 });
  } catch (e) {
    if (e instanceof NotFoundError) return errorResponse(new HttpError(404, e.message));
    if (e instanceof ConflictError) return errorResponse(new HttpError(409, e.message));
    return errorResponse(e);
  }
}
