import { nextAuditRow, type AuditInput } from './audit';
import type { Sql } from './sql';

/**
 * appendAudit for Sql-port transactions (seed, bulk imports, the HL7 feed, bedside entries): the
 * same entry, the same chain. Call with the port `tx()` gave you, so the entry commits with the
 * change. It joins the writers' order first (`serialize`), so even a transaction begun for one
 * key only appends to one unbroken chain.
 */
export async function appendAuditSql(q: Sql, e: AuditInput): Promise<void> {
  await q.serialize();
  const last = await q.get<{ seq: number; hash: string }>('SELECT "seq", "hash" FROM "AuditEntry" ORDER BY "seq" DESC LIMIT 1');
  const r = nextAuditRow(last, e);
  await q.run(
    'INSERT INTO "AuditEntry" ("seq", "at", "actorId", "role", "action", "entity", "entityId", "caseId", "before", "after", "origin", "prevHash", "hash") VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)',
    [r.seq, r.at, r.actorId, r.role, r.action, r.entity, r.entityId, r.caseId, r.before, r.after, r.origin, r.prevHash, r.hash],
  );
}
