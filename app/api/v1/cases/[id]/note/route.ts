import { authorizeApi } from '@/lib/server/access';
import { errorResponse, HttpError } from '@/lib/server/http';
import { draftNote, listNoteVersions } from '@/lib/db/notes';
import { NotFoundError } from '@/lib/db/cases';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';

/** The draft note (from the record as it is now) and every signed version. */
export async function GET(_req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('GET /api/v1/cases/[id]/note');
  if (user instanceof Response) return user;
  try {
    const { id } = await ctx.params;
    const [draft, versions] = await Promise.all([draftNote(db(), id, now()), listNoteVersions(db(), id)]);
    return Response.json({ status: draft.status, draft: draft.note, versions: versions.map((v) => ({ ...v, record: undefined })) });
  } catch (e) {
    if (e instanceof NotFoundError) return errorResponse(new HttpError(404, e.message));
    return errorResponse(e);
  }
}
