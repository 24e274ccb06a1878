import { createHash, randomBytes } from 'node:crypto';
import { cookies, headers } from 'next/headers';
import { db } from '@/lib/db/client';
import { findSession, insertSession, revokeSession, touchSession } from '@/lib/db/sessions';
import { now } from './clock';
import { serverConfig } from './config';
import { isRole, type Role } from './roles';

export const SESSION_COOKIE = 'plateau_session';

export interface SessionUser {
  id: string;
  username: string;
  displayName: string;
  role: Role;
  unitId: string | null;
  sessionId: string;
}

export function tokenId(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}

/** Starts a new session (a fresh token at every sign-in) and sets the cookie. */
export async function startSession(userId: string, origin: string | null): Promise<void> {
  const token = randomBytes(32).toString('base64url');
  const t = now();
  const cfg = serverConfig();
  const expiresAt = new Date(t.getTime() + cfg.sessionLifetimeHours * 3600_000);
  await insertSession(db(), { id: tokenId(token), userId, now: t, expiresAt, origin });
  const jar = await cookies();
  jar.set(SESSION_COOKIE, token, { httpOnly: true, sameSite: 'lax', secure: cfg.secureCookies, path: '/', expires: expiresAt });
}

/** Ends the current session, server-side and in the browser. */
export async function endSession(): Promise<void> {
  const jar = await cookies();
  const token = jar.get(SESSION_COOKIE)?.value;
  if (token) await revokeSession(db(), tokenId(token), now());
  jar.delete(SESSION_COOKIE);
}

/** The signed-in user, or null when there is no valid session (expired, idle, revoked). */
export async function currentUser(): Promise<SessionUser | null> {
  const jar = await cookies();
  const token = jar.get(SESSION_COOKIE)?.value;
  if (!token || token.length > 200) return null;
  const id = tokenId(token);
  const s = await findSession(db(), id);
  if (!s || s.revokedAt || !s.user.active || !isRole(s.user.role)) return null;
  const t = now();
  const cfg = serverConfig();
  if (s.expiresAt.getTime() <= t.getTime()) return null;
  if (t.getTime() - s.lastSeenAt.getTime() > cfg.idleTimeoutMin * 60_000) {
    await revokeSession(db(), id, t);
    return null;
  }
  // Touch at most once a minute: a busy case sheet polls often.
  if (t.getTime() - s.lastSeenAt.getTime() > 60_000) await touchSession(db(), id, t);
  return { id: s.user.id, username: s.user.username, displayName: s.user.displayName, role: s.user.role, unitId: s.user.unitId, sessionId: id };
}

/** The request's origin, for the audit trail. */
export async function requestOrigin(): Promise<string | null> {
  const h = await headers();
  return h.get('x-forwarded-for')?.split(',')[0]?.trim() || h.get('x-real-ip') || null;
}
