import type { PrismaClient } from './generated/client';
import { appendAudit } from './audit';
import { writeTx } from './tx';

export interface NewUser {
  id: string;
  username: string;
  displayName: string;
  role: string;
  passwordHash: string;
  unitId?: string | null;
}

export class DuplicateUsernameError extends Error {
  constructor(public username: string) {
    super(`username: "${username}" is already taken`);
  }
}

export async function createUser(client: PrismaClient, u: NewUser, actor: { id: string | null; role: string | null; origin?: string | null }, now: Date) {
  return writeTx(client, async (tx) => {
    const existing = await tx.user.findUnique({ where: { username: u.username } });
    if (existing) throw new DuplicateUsernameError(u.username);
    const user = await tx.user.create({ data: { ...u, createdById: actor.id, createdAt: now } });
    await appendAudit(tx, { at: now, actorId: actor.id, role: actor.role, action: 'create', entity: 'user', entityId: user.id, after: { username: u.username, role: u.role, displayName: u.displayName }, origin: actor.origin });
    return user;
  });
}

export function findUserByUsername(client: PrismaClient, username: string) {
  return client.user.findUnique({ where: { username } });
}

export function listUsers(client: PrismaClient) {
  return client.user.findMany({ orderBy: [{ role: 'asc' }, { username: 'asc' }], select: { id: true, username: true, displayName: true, role: true, active: true, createdAt: true } });
}
