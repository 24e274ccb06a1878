import { z } from 'zod';
import { authorizeApi } from '@/lib/server/access';
import { checkOrigin, errorResponse, HttpError, parseJson } from '@/lib/server/http';
import { setActiveRuleSet } from '@/lib/db/summaries';
import { unitForUser } from '@/lib/server/unit';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { requestOrigin } from '@/lib/server/session';

const Input = z.object({ ruleSetId: z.string().min(1, { message: 'is required' }).max(80), version: z.number().int().min(1, { message: 'must be a version number' }) });

/** Sets the unit's active rule set and recomputes the stored per-case summaries for it. */
export async function POST(req: Request) {
  const user = await authorizeApi('POST /api/v1/admin/rule-set');
  if (user instanceof Response) return user;
  try {
    checkOrigin(req);
    const input = await parseJson(req, Input);
    const unit = await unitForUser(user);
    if (!unit) throw new HttpError(409, 'unit: no unit is set up yet');
    const r = await setActiveRuleSet(db(), unit.id, { id: input.ruleSetId, version: input.version }, { id: user.id, role: user.role, origin: await requestOrigin() }, now()).catch((e: unknown) => {
      if (e instanceof Error && /not found/.test(e.message)) throw new HttpError(404, `ruleSetId: ${e.message}`);
      throw e;
    });
    return Response.json({ ok: true, ...r });
  } catch (e) {
    return errorResponse(e);
  }
}
