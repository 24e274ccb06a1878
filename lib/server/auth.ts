import { db } from '@/lib/db/client';
import { appendAudit } from '@/lib/db/audit';
import { findUserByUsername } from '@/lib/db/users';
import { isRole, type Role } from './roles';
import { dummyHash, verifyPassword } from './password';
import { now } from './clock';

export type SignInResult = { ok: true; userId: string; role: Role } | { ok: false; error: string };

/**
 * Checks a username and password. The same message for an unknown user and a wrong password,
 * so the form does not reveal who has an account; both outcomes are audited.
 */
export async function checkCredentials(username: string, password: string, origin: string | null): Promise<SignInResult> {
  const client = db();
  const user = await findUserByUsername(client, username);
  const valid = user && user.active ? await verifyPassword(user.passwordHash, password) : (await verifyPassword(await dummyHash(), password), false);
  const t = now();
  await client.$transaction(async (tx) => {
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
