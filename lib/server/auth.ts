import { db } from '@/lib/db/client';
import { appendAudit } from '@/lib/db/audit';
import { findUserByUsername } from '@/lib/db/users';
import { isRole, type Role } from './roles';
import { dummyHash, verifyPassword } from './password';
import { now } from './clock';
import { lockoutMessage, rateLimitConfig, recordSignInAttempt, signInLock } from './rateLimit';
import { writeTx } from '@/lib/db/tx';

export type SignInResult = { ok: true; userId: string; role: Role } | { ok: false; error: string; lockedUntil?: Date };

/**
 * Checks a username and password. The same message for an unknown user and a wrong password,
 * so the form does not reveal who has an account; both outcomes are audited.
 *
 * Rate limited (lib/server/rateLimit.ts): after too many failures for a username (or from one
 * address) the attempt is refused before the password is checked, with a message that says
 * when to retry, and audited as `sign_in_locked`. An unknown username is limited like a real
 * one, so the lockout does not reveal who has an account either.
 */
export async function checkCredentials(username: string, password: string, origin: string | null): Promise<SignInResult> {
  const client = db();
  const t = now();
  const lock = await signInLock(client, username, origin, t, rateLimitConfig());
  if (lock.locked) {
    await writeTx(client, async (tx) => {
      await appendAudit(tx, { at: t, actorId: null, role: null, action: 'sign_in_locked', entity: 'session', entityId: null, after: { username, scope: lock.scope, until: lock.until.toISOString() }, origin });
    });
    return { ok: false, error: lockoutMessage(lock, t), lockedUntil: lock.until };
  }
  const user = await findUserByUsername(client, username);
  const valid = user && user.active ? await verifyPassword(user.passwordHash, password) : (await verifyPassword(await dummyHash(), password), false);
  await writeTx(client, async (tx) => {
    await recordSignInAttempt(tx, username, origin, t, Boolean(valid));
    await appendAudit(tx, {
      at: t,
      actorId: valid && user ? user.id : null,
      role: valid && user ? user.role : null,
      action: valid ? 'sign_in' : 'sign_in_failed',
      entity: 'session',
      entityId: null,
      after: { username },
      origin,
    });
  });
  if (!valid || !user || !isRole(user.role)) return { ok: false, error: 'Username or password is not right.' };
  return { ok: true, userId: user.id, role: user.role };
}
