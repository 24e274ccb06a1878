import type { PrismaClient } from './generated/client';
import { dialectOf } from './client';

/**
 * Extra options for a Prisma text filter (`contains`, `startsWith`) so it ignores letter case on
 * both databases: SQLite's LIKE already does for ASCII; PostgreSQL needs `mode: 'insensitive'`
 * (which the SQLite client's types do not know, hence the empty type).
 *
 * @example
 * client.patient.findMany({ where: { familyName: { startsWith: 'ha', ...caseless(client) } } })
 */
export function caseless(client: PrismaClient): object {
  return dialectOf(client) === 'postgresql' ? { mode: 'insensitive' } : {};
}
