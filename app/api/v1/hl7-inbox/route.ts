import { z } from 'zod';
import { authorizeApi } from '@/lib/server/access';
import { errorResponse } from '@/lib/server/http';
import { sql } from '@/lib/db/client';
import { listInbox } from '@/lib/db/hl7Store';

const Query = z.object({ roomId: z.string().min(1).optional(), limit: z.coerce.number().int().min(1).max(5000).optional() });

/** Monitor messages that matched no case in progress, with their sample time span. */
export async function GET(req: Request) {
  const user = await authorizeApi('GET /api/v1/hl7-inbox');
  if (user instanceof Response) return user;
  try {
    const q = Query.parse(Object.fromEntries(new URL(req.url).searchParams));
    const messages = await listInbox(sql(), q);
    return Response.json({ messages: messages.map((m) => ({ ...m, from: m.fromMs === null ? null : new Date(m.fromMs).toISOString(), to: m.toMs === null ? null : new Date(m.toMs).toISOString() })) }, { headers: { 'cache-control': 'no-store' } });
  } catch (e) {
    return errorResponse(e);
  }
}
