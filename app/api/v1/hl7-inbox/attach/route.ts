import { z } from 'zod';
import { authorizeApi } from '@/lib/server/access';
import { checkOrigin, errorResponse, HttpError, parseJson } from '@/lib/server/http';
import { db, sql } from '@/lib/db/client';
import { AttachError, attachInbox, type AttachSelection } from '@/lib/db/hl7Store';
import { appDebouncer } from '@/lib/server/liveBus';
import { now } from '@/lib/server/clock';

const Body = z.union([
  z.object({ caseId: z.string().min(1), messageIds: z.array(z.string().min(1)).min(1).max(10_000) }),
  z.object({ caseId: z.string().min(1), roomId: z.string().min(1), from: z.iso.datetime({ offset: true }), to: z.iso.datetime({ offset: true }) }),
]);

/** Attaches unmatched monitor samples to a case, each at its own time (audited). */
export async function POST(req: Request) {
  const user = await authorizeApi('POST /api/v1/hl7-inbox/attach');
  if (user instanceof Response) return user;
  try {
    checkOrigin(req);
    const b = await parseJson(req, Body);
    let sel: AttachSelection;
    if ('messageIds' in b) sel = { messageIds: b.messageIds };
    else {
      sel = { roomId: b.roomId, fromMs: Date.parse(b.from), toMs: Date.parse(b.to) };
      if (sel.toMs < sel.fromMs) throw new HttpError(422, 'to: must not be before from');
    }
    let r;
    try {
      r = await attachInbox(sql(), sel, b.caseId, { id: user.id, role: user.role, origin: req.headers.get('origin') }, now());
    } catch (e) {
      if (e instanceof AttachError) throw new HttpError(e.status, e.message);
      throw e;
    }
    if (r.stored > 0) appDebouncer(db).touch(b.caseId);
    return Response.json(r);
  } catch (e) {
    return errorResponse(e);
  }
}
