import { z } from 'zod';
import { NewCaseInput } from '@/lib/domain/newCase';
import { checkOrigin, HttpError, parseJson } from '@/lib/server/http';
import { openCase } from '@/lib/db/openCase';
import { ConflictError, NotFoundError } from '@/lib/db/cases';
import { requestOrigin } from '@/lib/server/session';
import { authorizeApi } from '@/lib/server/access';
import { errorResponse } from '@/lib/server/http';
import { unitForUser } from '@/lib/server/unit';
import { casesForDay } from '@/lib/db/cases';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { localDate } from '@/lib/_shared/time';

const Query = z.object({ date: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, { message: 'must be YYYY-MM-DD' }).optional() });

/** Cases of the user's unit on a day (default today in the unit's zone). */
export async function GET(req: Request) {
  const user = await authorizeApi('GET /api/v1/cases');
  if (user instanceof Response) return user;
  try {
    const q = Query.parse(Object.fromEntries(new URL(req.url).searchParams));
    const unit = await unitForUser(user);
    if (!unit) return Response.json({ cases: [] });
    const date = q.date ?? localDate(now(), unit.timeZone);
    const cases = await casesForDay(db(), unit.id, date);
    return Response.json({ date, unit: { id: unit.id, name: unit.name, timeZone: unit.timeZone }, cases });
  } catch (e) {
    return errorResponse(e);
  }
}

/** Opens a case for today in the user's unit (adding the patient when new). */
export async function POST(req: Request) {
  const user = await authorizeApi('POST /api/v1/cases');
  if (user instanceof Response) return user;
  try {
    checkOrigin(req);
    const input = await parseJson(req, NewCaseInput);
    const unit = await unitForUser(user);
    if (!unit) throw new HttpError(409, 'unit: no unit is set up yet');
    const t = now();
    const c = await openCase(db(), unit.id, input, { id: user.id, role: user.role, origin: await requestOrigin() }, t, localDate(t, unit.timeZone));
    return Response.json({ id: c.id }, { status: 201 });
  } catch (e) {
    if (e instanceof NotFoundError) return errorResponse(new HttpError(404, e.message));
    if (e instanceof ConflictError) return errorResponse(new HttpError(409, e.message));
    return errorResponse(e);
  }
}
