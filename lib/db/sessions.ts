import type { PrismaClient } from './generated/client';
import { sqlOf } from './client';
import { asBool, asDate, asDateOrNull } from './sql';

export async function insertSession(client: PrismaClient, s: { id: string; userId: string; now: Date; expiresAt: Date; origin: string | null }) {
  await client.session.create({ data: { id: s.id, userId: s.userId, createdAt: s.now, lastSeenAt: s.now, expiresAt: s.expiresAt, origin: s.origin } });
}

export interface FoundSession {
  id: string;
  lastSeenAt: Date;
  expiresAt: Date;
  revokedAt: Date | null;
  user: { id: string; username: string; displayName: string; role: string; active: boolean; unitId: string | null };
}

/**
 * A session and its user, by the token's hash. Asked on every request, so one plain SQL
 * statement through the Sql port rather than the ORM (docs/trust.md, load).
 */
export async function findSession(client: PrismaClient, id: string): Promise<FoundSession | null> {
  const r = await sqlOf(client).get<{ id: string; lastSeenAt: unknown; expiresAt: unknown; revokedAt: unknown; userId: string; username: string; displayName: string; role: string; active: unknown; unitId: string | null }>(
    `SELECT s."id", s."lastSeenAt", s."expiresAt", s."revokedAt", u."id" AS "userId", u."username", u."displayName", u."role", u."active", u."unitId"
     FROM "Session" s JOIN "User" u ON u."id" = s."userId" WHERE s."id" = ?`,
    [id],
  );
  if (!r) return null;
  return {
    id: r.id,
    lastSeenAt: asDate(r.lastSeenAt),
    expiresAt: asDate(r.expiresAt),
    revokedAt: asDateOrNull(r.revokedAt),
    user: { id: r.userId, username: r.username, displayName: r.displayName, role: r.role, active: asBool(r.active), unitId: r.unitId },
  };
}

export async function touchSession(client: PrismaClient, id: string, now: Date) {
  await client.session.update({ where: { id }, data: { lastSeenAt: now } });
}

export async function revokeSession(client: PrismaClient, id: string, now: Date) {
  await client.session.updateMany({ where: { id, revokedAt: null }, data: { revokedAt: now } });
}
