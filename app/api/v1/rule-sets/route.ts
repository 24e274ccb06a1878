import { authorizeApi } from '@/lib/server/access';
import { checkOrigin, parseJson } from '@/lib/server/http';
import { requestOrigin } from '@/lib/server/session';
import { now } from '@/lib/server/clock';
import { db } from '@/lib/db/client';
import { listRuleSets, saveRuleSet } from '@/lib/db/ruleSetStore';
import { SaveRuleSetInput } from '@/lib/domain/review';
import { reviewErrorResponse } from '@/app/(review)/_shared/review-context';

/** Built-in and saved rule sets. */
export async function GET() {
  const user = await authorizeApi('GET /api/v1/rule-sets');
  if (user instanceof Response) return user;
  try {
    return Response.json({ ruleSets: await listRuleSets(db()) });
  } catch (e) {
    return reviewErrorResponse(e);
  }
}

/** Saves a lead's rule set as a new immutable version (201), or 200 when it equals the latest version. */
export async function POST(req: Request) {
  const user = await authorizeApi('POST /api/v1/rule-sets');
  if (user instanceof Response) return user;
  try {
    checkOrigin(req);
    const input = await parseJson(req, SaveRuleSetInput);
    const r = await saveRuleSet(db(), input.ruleSet, { id: user.id, role: user.role, origin: await requestOrigin() }, now());
    return Response.json(r, { status: r.created ? 201 : 200 });
  } catch (e) {
    return reviewErrorResponse(e);
  }
}
