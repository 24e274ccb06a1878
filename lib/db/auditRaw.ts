import type Database from 'better-sqlite3';
import { auditContent, auditHash, GENESIS_HASH } from './audit';
import { isoDb } from './sqlite';

/** appendAudit for raw better-sqlite3 transactions (seed, bulk import). */
export function appendAuditRaw(raw: Database.Database, e: { at: Date; actorId?: string | null; role?: string | null; action: string; entity: string; entityId?: string | null; caseId?: string | null; before?: unknown; after?: unknown; origin?: string | null }) {
  const last = raw.prepare('SELECT seq, hash FROM AuditEntry ORDER BY seq DESC LIMIT 1').get() as { seq: number; hash: string } | undefined;
  const row = {
    seq: (last?.seq ?? 0) + 1,
    at: e.at,
    actorId: e.actorId ?? null,
    role: e.role ?? null,
    action: e.action,
    entity: e.entity,
    entityId: e.entityId ?? null,
    caseId: e.caseId ?? null,
    before: e.before === undefined ? null : JSON.stringify(e.before),
    after: e.after === undefined ? null : JSON.stringify(e.after),
    origin: e.origin ?? null,
    prevHash: last?.hash ?? GENESIS_HASH,
  };
  raw
    .prepare('INSERT INTO AuditEntry (seq, at, actorId, role, action, entity, entityId, caseId, before, after, origin, prevHash, hash) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)')
    .run(row.seq, isoDb(row.at), row.actorId, row.role, row.action, row.entity, row.entityId, row.caseId, row.before, row.after, row.origin, row.prevHash, auditHash(auditContent(row)));
}
