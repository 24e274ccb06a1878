import { auditContent, auditHash, GENESIS_HASH } from './audit';
import { asDate, type Sql } from './sql';

export type AuditVerdict = { ok: true; entries: number } | { ok: false; entries: number; brokenSeq: number; problem: string };

type Row = { seq: number; at: unknown; actorId: string | null; role: string | null; action: string; entity: string; entityId: string | null; caseId: string | null; before: string | null; after: string | null; origin: string | null; prevHash: string; hash: string };

const PAGE = 5000;

/**
 * Walks the audit chain in order and names the first entry whose content no longer matches
 * its hash, whose link to the previous entry is broken, or that is missing from the sequence.
 * Reads the trail a page at a time, so a long trail never sits in memory whole.
 */
export async function verifyAuditChain(q: Sql): Promise<AuditVerdict> {
  let prev = GENESIS_HASH;
  let expectSeq = 1;
  let n = 0;
  for (let after = 0; ; ) {
    const rows = await q.all<Row>(
      'SELECT "seq", "at", "actorId", "role", "action", "entity", "entityId", "caseId", "before", "after", "origin", "prevHash", "hash" FROM "AuditEntry" WHERE "seq" > ? ORDER BY "seq" LIMIT ?',
      [after, PAGE],
    );
    for (const r of rows) {
      n++;
      if (r.seq !== expectSeq) return { ok: false, entries: n, brokenSeq: expectSeq, problem: `entry ${expectSeq} is missing (next is ${r.seq})` };
      if (r.prevHash !== prev) return { ok: false, entries: n, brokenSeq: r.seq, problem: `entry ${r.seq} does not link to entry ${r.seq - 1}` };
      const content = auditContent({ ...r, at: asDate(r.at) });
      if (auditHash(content) !== r.hash) return { ok: false, entries: n, brokenSeq: r.seq, problem: `entry ${r.seq} was changed after it was written` };
      prev = r.hash;
      expectSeq++;
    }
    if (rows.length < PAGE) break;
    after = rows[rows.length - 1].seq;
  }
  return { ok: true, entries: n };
}
