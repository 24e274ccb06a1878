import { z } from 'zod';
import { authorizeApi } from '@/lib/server/access';
import { errorResponse } from '@/lib/server/http';
import { searchPatients } from '@/lib/db/openCase';
import { unitForUser } from '@/lib/server/unit';
import { db } from '@/lib/db/client';

const Query = z.object({ q: z.string().trim().min(1, { message: 'type a record number or a name' }).max(80) });

/** Find a patient by record number or name. */
export async function GET(req: Request) {
  const user = await authorizeApi('GET /api/v1/patients');
  if (user instanceof Response) return user;
  try {
    const q = Query.parse(Object.fromEntries(new URL(req.url).searchParams));
    const unit = await unitForUser(user);
    return Response.json({ patients: unit ? await searchPatients(db(), unit.id, q.q) : [] });
  } catch (e) {
    return errorResponse(e);
  }
}
