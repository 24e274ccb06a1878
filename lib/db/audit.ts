import { createHash } from 'node:crypto';
import type { PrismaClient } from './generated/client';

type Tx = Omit<PrismaClient, '$connect' | '$disconnect' | '$on' | '$transaction' | '$extends'>;

export interface AuditInput {
  at: Date;
  actorId?: string | null;
  role?: string | null;
  action: string;
  entity: string;
  entityId?: string | null;
  caseId?: string | null;
  before?: unknown;
  after?: unknown;
  origin?: string | null;
}

export const GENESIS_HASH = '0'.repeat(64);

/** The content an entry's hash covers, in a fixed field order. */
export function auditContent(e: { seq: number; at: Date; actorId: string | null; role: string | null; action: string; entity: string; entityId: string | null; caseId: string | null; before: string | null; after: string | null; origin: string | null; prevHash: string }): string {
  return JSON.stringify([e.seq, e.at.toISOString(), e.actorId, e.role, e.action, e.entity, e.entityId, e.caseId, e.before, e.after, e.origin, e.prevHash]);
}

export function auditHash(content: string): string {
  return createHash('sha256').update(content).digest('hex');
}

/**
 * Appends one hash-chained audit entry. Call inside the same transaction as the change it
 * records, so the entry and the change commit together (SQLite serialises writers, so the
 * chain has no forks).
 */
export async function appendAudit(tx: Tx, input: AuditInput): Promise<void> {
  const last = await tx.auditEntry.findFirst({ orderBy: { seq: 'desc' }, select: { seq: true, hash: true } });
  const seq = (last?.seq ?? 0) + 1;
  const row = {
    seq,
    at: input.at,
    actorId: input.actorId ?? null,
    role: input.role ?? null,
    action: input.action,
    entity: input.entity,
    entityId: input.entityId ?? null,
    caseId: input.caseId ?? null,
    before: input.before === undefined ? null : JSON.stringify(input.before),
    after: input.after === undefined ? null : JSON.stringify(input.after),
    origin: input.origin ?? null,
    prevHash: last?.hash ?? GENESIS_HASH,
  };
  await tx.auditEntry.create({ data: { ...row, hash: auditHash(auditContent(row)) } });
}
