import type { PrismaClient } from './generated/client';

export async function insertSession(client: PrismaClient, s: { id: string; userId: string; now: Date; expiresAt: Date; origin: string | null }) {
  await client.session.create({ data: { id: s.id, userId: s.userId, createdAt: s.now, lastSeenAt: s.now, expiresAt: s.expiresAt, origin: s.origin } });
}

export function findSession(client: PrismaClient, id: string) {
  return client.session.findUnique({ where: { id }, include: { user: { select: { id: true, username: true, displayName: true, role: true, active: true, unitId: true } } } });
}

export async function touchSession(client: PrismaClient, id: string, now: Date) {
  await client.session.update({ where: { id }, data: { lastSeenAt: now } });
}

export async function revokeSession(client: PrismaClient, id: string, now: Date) {
  await client.session.updateMany({ where: { id, revokedAt: null }, data: { revokedAt: now } });
}
