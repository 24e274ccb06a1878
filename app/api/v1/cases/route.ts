import { z } from 'zod';
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
