import { authorizeApi } from '@/lib/server/access';
import { caseFacts } from '@/lib/db/cases';
import { db } from '@/lib/db/client';

export async function GET(_req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('GET /api/v1/cases/[id]');
  if (user instanceof Response) return user;
  const { id } = await ctx.params;
  const c = await caseFacts(db(), id);
  if (!c) return Response.json({ error: `case ${id} not found` }, { status: 404 });
  return Response.json(c);
}
