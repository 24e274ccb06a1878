import type { PrismaClient } from './generated/client';

/** Signed (completed) cases per calendar month of a unit, oldest first. */
export async function casesPerMonth(client: PrismaClient, unitId: string): Promise<{ month: string; cases: number }[]> {
  const rows = await client.case.groupBy({ by: ['scheduledDate'], where: { unitId, status: 'signed' }, _count: { _all: true } });
  const byMonth = new Map<string, number>();
  for (const r of rows) byMonth.set(r.scheduledDate.slice(0, 7), (byMonth.get(r.scheduledDate.slice(0, 7)) ?? 0) + r._count._all);
  return [...byMonth.entries()].sort(([a], [b]) => a.localeCompare(b)).map(([month, cases]) => ({ month, cases }));
}
