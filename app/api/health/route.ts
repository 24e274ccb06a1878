import { db } from '@/lib/db/client';
import { databaseHealth } from '@/lib/db/health';

export const dynamic = 'force-dynamic';

export async function GET() {
  const h = await databaseHealth(db());
  const ok = h.database === 'reachable' && h.migrations === 'current';
  return Response.json({ status: ok ? 'ok' : 'degraded', ...h }, { status: ok ? 200 : 503 });
}
