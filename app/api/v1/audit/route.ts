import { authorizeApi } from '@/lib/server/access';
import { errorResponse } from '@/lib/server/http';
import { AuditQuery, searchAudit } from '@/lib/db/auditSearch';
import { db } from '@/lib/db/client';

/** Searches the audit trail: ?caseId=&user=&action=&from=&to=&limit=&before= (newest first). */
export async function GET(req: Request) {
  const user = await authorizeApi('GET /api/v1/audit');
  if (user instanceof Response) return user;
  try {
    const q = AuditQuery.parse(Object.fromEntries(new URL(req.url).searchParams));
    return Response.json(await searchAudit(db(), q));
  } catch (e) {
    return errorResponse(e);
  }
}
