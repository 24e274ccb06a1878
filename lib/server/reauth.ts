import { db } from '@/lib/db/client';
import { verifyPassword } from './password';
import { HttpError } from './http';

/** Signing needs the password again: a signature is the person, not the open session. */
export async function confirmPassword(userId: string, password: string): Promise<void> {
  const u = await db().user.findUnique({ where: { id: userId }, select: { passwordHash: true } });
  if (!u || !(await verifyPassword(u.passwordHash, password))) throw new HttpError(403, 'password: not right; the note was not signed');
}
