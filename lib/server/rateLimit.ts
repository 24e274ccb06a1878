import type { PrismaClient } from '@/lib/db/generated/client';
import { positiveEnv } from '@/lib/_shared/positiveEnv';

/**
 * Sign-in rate limiting and temporary lockout, kept in the SignInAttempt table so every app
 * instance on the same database sees the same counts.
 *
 * - Per username: `maxFailures` failed sign-ins within `windowMin` minutes (since the last
 *   successful one) lock the username for `lockoutMin` minutes from the last failure.
 * - Per origin (client address): `originMaxFailures` failures within `windowMin` minutes refuse
 *   further attempts from that address until the oldest of them leaves the window.
 *
 * While locked, attempts are refused before the password is checked and are not counted
 * (so a lockout does not extend itself); the caller audits them.
 */
export interface RateLimitConfig {
  maxFailures: number;
  windowMin: number;
  lockoutMin: number;
  originMaxFailures: number;
}

const int = (v: string | undefined, dflt: number) => positiveEnv(v, dflt, true);

export function rateLimitConfig(env: NodeJS.ProcessEnv = process.env): RateLimitConfig {
  return {
    maxFailures: int(env.PLATEAU_SIGNIN_MAX_FAILURES, 5),
    windowMin: int(env.PLATEAU_SIGNIN_WINDOW_MIN, 15),
    lockoutMin: int(env.PLATEAU_SIGNIN_LOCKOUT_MIN, 15),
    originMaxFailures: int(env.PLATEAU_SIGNIN_ORIGIN_MAX_FAILURES, 50),
  };
}

export type LockState = { locked: false } | { locked: true; until: Date; scope: 'username' | 'origin' };

type Client = Pick<PrismaClient, 'signInAttempt'>;

/** Usernames are matched case-insensitively for counting, so "Nurse" and "nurse" share a limit. */
export function limitKey(username: string): string {
  return username.trim().toLowerCase();
}

/** Whether a sign-in for `username` from `origin` at `t` must be refused without checking the password. */
export async function signInLock(client: Client, username: string, origin: string | null, t: Date, cfg: RateLimitConfig = rateLimitConfig()): Promise<LockState> {
  const key = limitKey(username);
  const windowMs = cfg.windowMin * 60_000;
  const lockMs = cfg.lockoutMin * 60_000;
  const lastSuccess = await client.signInAttempt.findFirst({ where: { username: key, success: true }, orderBy: { at: 'desc' }, select: { at: true } });
  const since = new Date(Math.max(t.getTime() - windowMs - lockMs, lastSuccess ? lastSuccess.at.getTime() + 1 : 0));
  const recent = await client.signInAttempt.findMany({ where: { username: key, success: false, at: { gte: since } }, orderBy: { at: 'desc' }, take: cfg.maxFailures, select: { at: true } });
  if (recent.length >= cfg.maxFailures) {
    const newest = recent[0].at.getTime();
    const oldest = recent[recent.length - 1].at.getTime();
    const until = newest + lockMs;
    if (newest - oldest <= windowMs && t.getTime() < until) return { locked: true, until: new Date(until), scope: 'username' };
  }
  if (origin) {
    const fromOrigin = await client.signInAttempt.findMany({ where: { origin, success: false, at: { gt: new Date(t.getTime() - windowMs) } }, orderBy: { at: 'desc' }, take: cfg.originMaxFailures, select: { at: true } });
    if (fromOrigin.length >= cfg.originMaxFailures) {
      const until = fromOrigin[fromOrigin.length - 1].at.getTime() + windowMs;
      if (t.getTime() < until) return { locked: true, until: new Date(until), scope: 'origin' };
    }
  }
  return { locked: false };
}

/** Records one checked sign-in attempt (not the refused-while-locked ones). */
export async function recordSignInAttempt(client: Client, username: string, origin: string | null, t: Date, success: boolean): Promise<void> {
  await client.signInAttempt.create({ data: { username: limitKey(username), origin, at: t, success } });
}

/** The message a locked-out user sees: when to try again, in minutes and as a UTC clock time. */
export function lockoutMessage(lock: Extract<LockState, { locked: true }>, t: Date): string {
  const minutes = Math.max(1, Math.ceil((lock.until.getTime() - t.getTime()) / 60_000));
  const at = lock.until.toISOString().slice(11, 16);
  const who = lock.scope === 'username' ? 'this account' : 'this address';
  return `Too many failed sign-ins for ${who}. Sign-in is locked; try again in ${minutes} minute${minutes === 1 ? '' : 's'} (at ${at} UTC).`;
}
