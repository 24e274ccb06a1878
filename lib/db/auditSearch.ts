import { z } from 'zod';
import type { PrismaClient } from './generated/client';
import { caseless } from './caseless';

/**
 * Searching the audit trail (leads and admins): by case, by user (username or display name,
 * matched as a substring) and by period. Read-only; the chain itself is checked by
 * `npm run audit:verify`.
 */
const day = /^\d{4}-\d{2}-\d{2}$/;
const instant = z.string().trim().refine((s) => day.test(s) || !Number.isNaN(Date.parse(s)), { message: 'must be a date (YYYY-MM-DD) or an ISO 8601 instant' });
const blankToUndef = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);

export const AuditQuery = z
  .object({
    caseId: z.preprocess(blankToUndef, z.string().trim().max(80, { message: 'must be at most 80 characters' }).optional()),
    user: z.preprocess(blankToUndef, z.string().trim().max(80, { message: 'must be at most 80 characters' }).optional()),
    action: z.preprocess(blankToUndef, z.string().trim().max(40, { message: 'must be at most 40 characters' }).optional()),
    from: z.preprocess(blankToUndef, instant.optional()),
    to: z.preprocess(blankToUndef, instant.optional()),
    limit: z.preprocess(blankToUndef, z.coerce.number({ message: 'must be a number' }).int({ message: 'must be a whole number' }).min(1, { message: 'must be 1–500' }).max(500, { message: 'must be 1–500' }).default(100)),
    before: z.preprocess(blankToUndef, z.coerce.number({ message: 'must be a number' }).int().positive({ message: 'must be an entry number' }).optional()),
  })
  .refine((q) => !q.from || !q.to || periodStart(q.from) <= periodEnd(q.to), { message: 'must not be before from', path: ['to'] });
export type AuditQuery = z.infer<typeof AuditQuery>;

/** A date means the start of that day (UTC) for `from` and its end for `to`. */
function periodStart(s: string): Date {
  return day.test(s) ? new Date(`${s}T00:00:00.000Z`) : new Date(s);
}
function periodEnd(s: string): Date {
  return day.test(s) ? new Date(new Date(`${s}T00:00:00.000Z`).getTime() + 86_400_000 - 1) : new Date(s);
}

export interface AuditRow {
  seq: number;
  at: string;
  actorId: string | null;
  actor: string | null;
  role: string | null;
  action: string;
  entity: string;
  entityId: string | null;
  caseId: string | null;
  before: string | null;
  after: string | null;
  origin: string | null;
}

export interface AuditPage {
  rows: AuditRow[];
  /** Pass as `before` for the next (older) page; null when there is none. */
  nextBefore: number | null;
}

/** Newest first; `before` pages back through older entries. */
export async function searchAudit(client: PrismaClient, q: AuditQuery): Promise<AuditPage> {
  const where: Record<string, unknown> = {};
  if (q.caseId) where.caseId = q.caseId;
  if (q.action) where.action = q.action;
  if (q.from || q.to) where.at = { ...(q.from ? { gte: periodStart(q.from) } : {}), ...(q.to ? { lte: periodEnd(q.to) } : {}) };
  if (q.before) where.seq = { lt: q.before };
  if (q.user) {
    const ci = caseless(client);
    const users = await client.user.findMany({ where: { OR: [{ username: { contains: q.user, ...ci } }, { displayName: { contains: q.user, ...ci } }, { id: q.user }] }, select: { id: true } });
    where.actorId = { in: users.map((u) => u.id) };
  }
  const found = await client.auditEntry.findMany({ where, orderBy: { seq: 'desc' }, take: q.limit + 1 });
  const page = found.slice(0, q.limit);
  const ids = [...new Set(page.map((r) => r.actorId).filter((x): x is string => Boolean(x)))];
  const names = new Map((await client.user.findMany({ where: { id: { in: ids } }, select: { id: true, username: true } })).map((u) => [u.id, u.username]));
  return {
    rows: page.map((r) => ({ seq: r.seq, at: r.at.toISOString(), actorId: r.actorId, actor: r.actorId ? (names.get(r.actorId) ?? r.actorId) : null, role: r.role, action: r.action, entity: r.entity, entityId: r.entityId, caseId: r.caseId, before: r.before, after: r.after, origin: r.origin })),
    nextBefore: found.length > q.limit ? page[page.length - 1].seq : null,
  };
}
