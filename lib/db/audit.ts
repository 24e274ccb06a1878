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

/** The next entry of the chain after `last` (null: the first), with its hash. */
export function nextAuditRow(last: { seq: number; hash: string } | null | undefined, input: AuditInput) {
  const row = {
    seq: (last?.seq ?? 0) + 1,
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
  return { ...row, hash: auditHash(auditContent(row)) };
}

/**
 * Appends one hash-chained audit entry. Call inside the same write transaction as the change it
 * records (lib/db/tx.ts `writeTx`), so the entry and the change commit together and the chain
 * has no forks (writers are serialised on both databases).
 */
export async function appendAudit(tx: Tx, input: AuditInput): Promise<void> {
  const last = await tx.auditEntry.findFirst({ orderBy: { seq: 'desc' }, select: { seq: true, hash: true } });
  await tx.auditEntry.create({ data: nextAuditRow(last, input) });
}
