import type { PrismaClient } from './generated/client';
import type { EntryInput, EntryTarget } from '@/lib/domain/entry';
import { aldreteTotal } from '@/lib/domain/aldrete';
import { appendAudit } from './audit';
import { appendAuditSql } from './auditSql';
import { MMHG_PER_KPA } from '@/lib/domain/channel';
import { ConflictError, NotFoundError } from './cases';
import { writeTx } from './tx';
import { sqlOf } from './client';
import { asDate, ident, isUniqueViolation, placeholders, type Sql, type SqlValue } from './sql';

export interface Actor {
  id: string;
  role: string;
  origin: string | null;
}

/** What a bedside write did: created now, or already stored under that device id. */
export interface EntryResult {
  id: string;
  created: boolean;
  status: string;
}

const STATUS_AFTER_EVENT: Record<string, { from: string[]; to: string }> = {
  sedation_start: { from: ['draft'], to: 'in_progress' },
  recovery_start: { from: ['draft', 'in_progress'], to: 'recovery' },
};

const signedConflict = () => new ConflictError('case: the note is signed; amend the note instead of changing entries');

/** The table of each kind of bedside entry. */
const TABLE: Record<EntryTarget, string> = { dose: 'Dose', intervention: 'Intervention', event: 'CaseEvent', vital: 'ManualVital', recovery: 'RecoveryScore', blood_gas: 'BloodGas' };

type Row = Record<string, unknown> & { id: string; caseId: string; at: unknown; voidedAt: unknown; voidReason: string | null };

const byId = (t: Sql, target: EntryTarget, id: string) => t.get<Row>(`SELECT * FROM ${ident(TABLE[target])} WHERE "id" = ?`, [id]);

/** Inserts one row: `values` maps column names to values. */
function insert(t: Sql, table: string, values: Record<string, SqlValue>): Promise<number> {
  const cols = Object.keys(values);
  return t.run(`INSERT INTO ${ident(table)} (${cols.map(ident).join(', ')}) VALUES (${placeholders(cols.length)})`, cols.map((c) => values[c]));
}

/**
 * Stores one bedside entry idempotently (the device id decides), with its audit entry, in one
 * write transaction. A signed case refuses new entries; a changed re-send of the same id is a
 * conflict. Plain SQL through the Sql port: this is the busiest write of a morning (the load
 * benchmark in docs/trust.md), and the ORM costs several times more per statement.
 */
export async function recordEntry(client: PrismaClient, caseId: string, e: EntryInput, actor: Actor, now: Date): Promise<EntryResult> {
  try {
    return await storeEntry(client, caseId, e, actor, now);
  } catch (err) {
    // The same device id sent to two cases at once: the second insert meets the first's key.
    if (isUniqueViolation(err)) throw new ConflictError(`id: entry ${e.id} already exists with other content`);
    throw err;
  }
}

async function storeEntry(client: PrismaClient, caseId: string, e: EntryInput, actor: Actor, now: Date): Promise<EntryResult> {
  // Checks and the row under the case's own lock; only the audit append, at the end, waits for
  // every writer (PostgreSQL: a short critical section for the one global lock; SQLite: one
  // writer anyway).
  return sqlOf(client).tx(async (t) => {
    const c = await t.get<{ id: string; unitId: string; status: string }>('SELECT "id", "unitId", "status" FROM "Case" WHERE "id" = ?', [caseId]);
    if (!c) throw new NotFoundError(`case ${caseId} not found`);
    const at = new Date(e.at);
    const audit = async (action: string, entity: string, entityId: string, after: unknown, before?: unknown) => {
      // Now in every writer's order (appendAuditSql serialises): the case may have been signed
      // while this entry waited, and a signed case takes no more entries.
      await t.serialize();
      const now2 = await t.get<{ status: string }>('SELECT "status" FROM "Case" WHERE "id" = ?', [caseId]);
      if (now2?.status === 'signed') throw signedConflict();
      await appendAuditSql(t, { at: now, actorId: actor.id, role: actor.role, action, entity, entityId, caseId, before, after, origin: actor.origin });
    };
    const guardSigned = () => {
      if (c.status === 'signed') throw signedConflict();
    };
    const created = { createdAt: now, createdById: actor.id };

    switch (e.type) {
      case 'dose': {
        const existing = await byId(t, 'dose', e.id);
        if (existing) return same(existing.caseId === caseId && existing.amount === e.amount && existing.drugId === e.drugId, e.id, c.status);
        guardSigned();
        const drug = await t.get<{ id: string; name: string; drugClass: string }>('SELECT "id", "name", "drugClass" FROM "Drug" WHERE "id" = ? AND "unitId" = ?', [e.drugId, c.unitId]);
        if (!drug) throw new NotFoundError(`drugId: ${e.drugId} is not in this unit's formulary`);
        await insert(t, 'Dose', { id: e.id, caseId, drugId: drug.id, drug: drug.name, drugClass: drug.drugClass, amount: e.amount, unit: e.unit, route: e.route, at, ...created });
        await audit('create', 'dose', e.id, { drug: drug.name, amount: e.amount, unit: e.unit, route: e.route, at: e.at });
        return { id: e.id, created: true, status: c.status };
      }
      case 'intervention': {
        const existing = await byId(t, 'intervention', e.id);
        if (existing) return same(existing.caseId === caseId && existing.kind === e.kind, e.id, c.status);
        guardSigned();
        await insert(t, 'Intervention', { id: e.id, caseId, kind: e.kind, at, note: e.note || null, ...created });
        await audit('create', 'intervention', e.id, { kind: e.kind, at: e.at, note: e.note ?? null });
        return { id: e.id, created: true, status: c.status };
      }
      case 'event': {
        const existing = await byId(t, 'event', e.id);
        if (existing) return same(existing.caseId === caseId && existing.kind === e.kind, e.id, c.status);
        guardSigned();
        await insert(t, 'CaseEvent', { id: e.id, caseId, kind: e.kind, at, note: e.note || null, ...created });
        let status = c.status;
        const move = STATUS_AFTER_EVENT[e.kind];
        if (move && move.from.includes(c.status)) {
          status = move.to;
          // Only from the status read above: a case signed meanwhile is not moved back.
          const moved = await t.run(`UPDATE "Case" SET "status" = ?, "version" = "version" + 1, "updatedAt" = ? WHERE "id" = ? AND "status" = ?`, [status, now, caseId, c.status]);
          if (moved !== 1) throw new ConflictError('case: its status changed while this entry was saved; reload and enter it again');
        }
        await audit('create', 'event', e.id, { kind: e.kind, at: e.at, status, note: e.note ?? null });
        return { id: e.id, created: true, status };
      }
      case 'vital': {
        const existing = await byId(t, 'vital', e.id);
        if (existing) return same(existing.caseId === caseId, e.id, c.status);
        guardSigned();
        const data = { sbp: e.sbp ?? null, dbp: e.dbp ?? null, hr: e.hr ?? null, spo2: e.spo2 ?? null, rr: e.rr ?? null, etco2: e.etco2 ?? null, sedationScore: e.sedationScore ?? null };
        await insert(t, 'ManualVital', { id: e.id, caseId, at, ...data, ...created });
        await audit('create', 'vital', e.id, { at: e.at, ...data });
        return { id: e.id, created: true, status: c.status };
      }
      case 'recovery': {
        const existing = await byId(t, 'recovery', e.id);
        if (existing) return same(existing.caseId === caseId, e.id, c.status);
        guardSigned();
        const items = { activity: e.activity, respiration: e.respiration, circulation: e.circulation, consciousness: e.consciousness, oxygenation: e.oxygenation };
        const total = aldreteTotal(items);
        await insert(t, 'RecoveryScore', { id: e.id, caseId, at, ...items, total, ...created });
        await audit('create', 'recovery_score', e.id, { at: e.at, ...items, total });
        return { id: e.id, created: true, status: c.status };
      }
      case 'blood_gas': {
        const existing = await byId(t, 'blood_gas', e.id);
        if (existing) return same(existing.caseId === caseId, e.id, c.status);
        guardSigned();
        const paco2 = e.unit === 'kPa' ? Math.round(e.paco2 * MMHG_PER_KPA * 10) / 10 : e.paco2;
        const data = { paco2, enteredUnit: e.unit, ph: e.ph ?? null, pao2: e.pao2 ?? null, fio2: e.fio2 ?? null, sampleType: e.sampleType };
        await insert(t, 'BloodGas', { id: e.id, caseId, at, ...data, ...created });
        await audit('create', 'blood_gas', e.id, { at: e.at, ...data });
        return { id: e.id, created: true, status: c.status };
      }
      case 'void': {
        guardSigned();
        const row = await findTarget(t, e.target, e.targetId, caseId);
        if (row.voidedAt !== null) {
          if (row.voidReason === e.reason) return { id: e.id, created: false, status: c.status };
          throw new ConflictError(`targetId: this entry was already voided (${row.voidReason})`);
        }
        await voidRow(t, e.target, e.targetId, now, actor.id, e.reason);
        await audit('void', e.target, e.targetId, { reason: e.reason }, { voidedAt: null });
        return { id: e.id, created: true, status: c.status };
      }
      case 'retime': {
        if (await byId(t, e.target, e.id)) return { id: e.id, created: false, status: c.status };
        guardSigned();
        const row = await findTarget(t, e.target, e.targetId, caseId);
        if (row.voidedAt !== null) throw new ConflictError('targetId: this entry was voided or re-timed already; re-time the current entry');
        const newAt = new Date(e.newAt);
        const reason = e.reason ? `re-timed: ${e.reason}` : 're-timed (see the entry at the new time)';
        await voidRow(t, e.target, e.targetId, now, actor.id, reason);
        await copyWithNewTime(t, e.target, row, e.id, newAt, actor.id, now);
        await audit('retime', e.target, e.targetId, { at: e.newAt, newId: e.id }, { at: asDate(row.at).toISOString() });
        return { id: e.id, created: true, status: c.status };
      }
    }
  }, { only: `case:${caseId}` });
}

function same(isSame: boolean, id: string, status: string): EntryResult {
  if (!isSame) throw new ConflictError(`id: entry ${id} already exists with other content`);
  return { id, created: false, status };
}

async function findTarget(t: Sql, target: EntryTarget, id: string, caseId: string): Promise<Row> {
  const row = await byId(t, target, id);
  if (!row || row.caseId !== caseId) throw new NotFoundError(`targetId: no ${target} ${id} in this case`);
  return row;
}

function voidRow(t: Sql, target: EntryTarget, id: string, now: Date, actorId: string, reason: string): Promise<number> {
  return t.run(`UPDATE ${ident(TABLE[target])} SET "voidedAt" = ?, "voidedById" = ?, "voidReason" = ? WHERE "id" = ?`, [now, actorId, reason, id]);
}

/** The re-timed copy: every column of the original but its id, time, author, void and link. */
const COPIED: Record<'dose' | 'intervention' | 'event' | 'vital', string[]> = {
  dose: ['drugId', 'drug', 'drugClass', 'amount', 'unit', 'route'],
  intervention: ['kind', 'note'],
  event: ['kind', 'note'],
  vital: ['sbp', 'dbp', 'hr', 'spo2', 'rr', 'etco2', 'sedationScore'],
};

async function copyWithNewTime(t: Sql, target: 'dose' | 'intervention' | 'event' | 'vital', row: Row, newId: string, at: Date, actorId: string, now: Date) {
  const copied = Object.fromEntries(COPIED[target].map((c) => [c, (row[c] ?? null) as SqlValue]));
  await insert(t, TABLE[target], { id: newId, caseId: row.caseId, at, createdAt: now, createdById: actorId, replacesId: row.id, ...copied });
}

/**
 * Applies edits to case facts with per-field optimistic concurrency: a field whose stored value
 * no longer equals what the editor saw is refused by name, and nothing is written.
 */
export async function editCaseFacts(client: PrismaClient, caseId: string, changes: { field: string; from: unknown; to: unknown }[], actor: Actor, now: Date) {
  return writeTx(client, async (tx) => {
    const c = await tx.case.findUnique({ where: { id: caseId } });
    if (!c) throw new NotFoundError(`case ${caseId} not found`);
    if (c.status === 'signed') throw new ConflictError('case: the note is signed; amend the note instead');
    const current = c as unknown as Record<string, unknown>;
    const stale = changes.filter((ch) => (current[ch.field] ?? null) !== (ch.from ?? null));
    if (stale.length) {
      const who = c.updatedAt.toISOString();
      throw new ConflictError(
        stale.map((s) => `changes.${s.field}: changed by someone else since you opened it (now ${JSON.stringify(current[s.field] ?? null)}, updated ${who}); reload and check before editing`).join('; '),
      );
    }
    const data = Object.fromEntries(changes.map((ch) => [ch.field, ch.to]));
    const updated = await tx.case.update({ where: { id: caseId }, data: { ...data, version: { increment: 1 } } });
    await appendAudit(tx, { at: now, actorId: actor.id, role: actor.role, action: 'update', entity: 'case', entityId: caseId, caseId, before: Object.fromEntries(changes.map((ch) => [ch.field, current[ch.field] ?? null])), after: data, origin: actor.origin });
    return { version: updated.version };
  });
}
