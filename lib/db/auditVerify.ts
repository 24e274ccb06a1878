import type Database from 'better-sqlite3';
import { auditContent, auditHash, GENESIS_HASH } from './audit';

export type AuditVerdict = { ok: true; entries: number } | { ok: false; entries: number; brokenSeq: number; problem: string };

/**
 * Walks the audit chain in order and names the first entry whose content no longer matches
 * its hash, whose link to the previous entry is broken, or that is missing from the sequence.
 */
export function verifyAuditChain(raw: Database.Database): AuditVerdict {
  const rows = raw.prepare('SELECT seq, at, actorId, role, action, entity, entityId, caseId, before, after, origin, prevHash, hash FROM AuditEntry ORDER BY seq').iterate() as IterableIterator<{
    seq: number; at: string; actorId: string | null; role: string | null; action: string; entity: string; entityId: string | null; caseId: string | null; before: string | null; after: string | null; origin: string | null; prevHash: string; hash: string;
  }>;
  let prev = GENESIS_HASH;
  let expectSeq = 1;
  let n = 0;
  for (const r of rows) {
    n++;
    if (r.seq !== expectSeq) return { ok: false, entries: n, brokenSeq: expectSeq, problem: `entry ${expectSeq} is missing (next is ${r.seq})` };
    if (r.prevHash !== prev) return { ok: false, entries: n, brokenSeq: r.seq, problem: `entry ${r.seq} does not link to entry ${r.seq - 1}` };
    const content = auditContent({ ...r, at: new Date(r.at) });
    if (auditHash(content) !== r.hash) return { ok: false, entries: n, brokenSeq: r.seq, problem: `entry ${r.seq} was changed after it was written` };
    prev = r.hash;
    expectSeq++;
  }
  return { ok: true, entries: n };
}
