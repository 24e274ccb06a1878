import { db } from '@/lib/db/client';
import { firstUnit, unitOf } from '@/lib/db/cases';
import type { SessionUser } from './session';

/** The unit a user works in (their own, else the site's first unit). */
export async function unitForUser(user: SessionUser) {
  const u = user.unitId ? await unitOf(db(), user.unitId) : null;
  return u ?? (await firstUnit(db()));
}
