import type { PrismaClient } from './generated/client';
import type { EntryInput } from '@/lib/domain/entry';
import { aldreteTotal } from '@/lib/domain/aldrete';
import { appendAudit } from './audit';
import { MMHG_PER_KPA } from '@/lib/domain/channel';
import { ConflictError, NotFoundError } from './cases';

export interface Actor {
  id: string;
  role: string;
  origin: string | null;
}

type Tx = Parameters<Parameters<PrismaClient['$transaction']>[0]>[0];

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

/**
 * Stores one bedside entry idempotently (the device id decides), with its audit entry, in one
 * transaction. A signed case refuses new entries; a changed re-send of the same id is a conflict.
 */
export async function recordEntry(client: PrismaClient, caseId: string, e: EntryInput, actor: Actor, now: Date): Promise<EntryResult> {
  return client.$transaction(async (tx) => {
    const c = await tx.case.findUnique({ where: { id: caseId }, select: { id: true, unitId: true, status: true } });
    if (!c) throw new NotFoundError(`case ${caseId} not found`);
    const at = new Date(e.at);
    const audit = (action: string, entity: string, entityId: string, after: unknown, before?: unknown) =>
      appendAudit(tx, { at: now, actorId: actor.id, role: actor.role, action, entity, entityId, caseId, before, after, origin: actor.origin });
    const guardSigned = () => {
      if (c.status === 'signed') throw new ConflictError('case: the note is signed; amend the note instead of changing entries');
    };

    switch (e.type) {
      case 'dose': {
        const existing = await tx.dose.findUnique({ where: { id: e.id } });
        if (existing) return same(existing.caseId === caseId && existing.amount === e.amount && existing.drugId === e.drugId, e.id, c.status);
        guardSigned();
        const drug = await tx.drug.findFirst({ where: { id: e.drugId, unitId: c.unitId } });
        if (!drug) throw new NotFoundError(`drugId: ${e.drugId} is not in this unit's formulary`);
        await tx.dose.create({ data: { id: e.id, caseId, drugId: drug.id, drug: drug.name, drugClass: drug.drugClass, amount: e.amount, unit: e.unit, route: e.route, at, createdAt: now, createdById: actor.id } });
        await audit('create', 'dose', e.id, { drug: drug.name, amount: e.amount, unit: e.unit, route: e.route, at: e.at });
        return { id: e.id, created: true, status: c.status };
      }
      case 'intervention': {
        const existing = await tx.intervention.findUnique({ where: { id: e.id } });
        if (existing) return same(existing.caseId === caseId && existing.kind === e.kind, e.id, c.status);
        guardSigned();
        await tx.intervention.create({ data: { id: e.id, caseId, kind: e.kind, at, note: e.note || null, createdAt: now, createdById: actor.id } });
        await audit('create', 'intervention', e.id, { kind: e.kind, at: e.at, note: e.note ?? null });
        return { id: e.id, created: true, status: c.status };
      }
      case 'event': {
        const existing = await tx.caseEvent.findUnique({ where: { id: e.id } });
        if (existing) return same(existing.caseId === caseId && existing.kind === e.kind, e.id, c.status);
        guardSigned();
        await tx.caseEvent.create({ data: { id: e.id, caseId, kind: e.kind, at, note: e.note || null, createdAt: now, createdById: actor.id } });
        let status = c.status;
        const move = STATUS_AFTER_EVENT[e.kind];
        if (move && move.from.includes(c.status)) {
          status = move.to;
          await tx.case.update({ where: { id: caseId }, data: { status, version: { increment: 1 } } });
        }
        await audit('create', 'event', e.id, { kind: e.kind, at: e.at, status, note: e.note ?? null });
        return { id: e.id, created: true, status };
      }
      case 'vital': {
        const existing = await tx.manualVital.findUnique({ where: { id: e.id } });
        if (existing) return same(existing.caseId === caseId, e.id, c.status);
        guardSigned();
        const data = { sbp: e.sbp ?? null, dbp: e.dbp ?? null, hr: e.hr ?? null, spo2: e.spo2 ?? null, rr: e.rr ?? null, etco2: e.etco2 ?? null, sedationScore: e.sedationScore ?? null };
        await tx.manualVital.create({ data: { id: e.id, caseId, at, ...data, createdAt: now, createdById: actor.id } });
        await audit('create', 'vital', e.id, { at: e.at, ...data });
        return { id: e.id, created: true, status: c.status };
      }
      case 'recovery': {
        const existing = await tx.recoveryScore.findUnique({ where: { id: e.id } });
        if (existing) return same(existing.caseId === caseId, e.id, c.status);
        guardSigned();
        const items = { activity: e.activity, respiration: e.respiration, circulation: e.circulation, consciousness: e.consciousness, oxygenation: e.oxygenation };
        const total = aldreteTotal(items);
        await tx.recoveryScore.create({ data: { id: e.id, caseId, at, ...items, total, createdAt: now, createdById: actor.id } });
        await audit('create', 'recovery_score', e.id, { at: e.at, ...items, total });
        return { id: e.id, created: true, status: c.status };
      }
      case 'blood_gas': {
        const existing = await tx.bloodGas.findUnique({ where: { id: e.id } });
        if (existing) return same(existing.caseId === caseId, e.id, c.status);
        guardSigned();
        const paco2 = e.unit === 'kPa' ? Math.round(e.paco2 * MMHG_PER_KPA * 10) / 10 : e.paco2;
        const data = { paco2, enteredUnit: e.unit, ph: e.ph ?? null, pao2: e.pao2 ?? null, fio2: e.fio2 ?? null, sampleType: e.sampleType };
        await tx.bloodGas.create({ data: { id: e.id, caseId, at, ...data, createdAt: now, createdById: actor.id } });
        await audit('create', 'blood_gas', e.id, { at: e.at, ...data });
        return { id: e.id, created: true, status: c.status };
      }
      case 'void': {
        guardSigned();
        const row = await findTarget(tx, e.target, e.targetId, caseId);
        if (row.voidedAt) {
          if (row.voidReason === e.reason) return { id: e.id, created: false, status: c.status };
          throw new ConflictError(`targetId: this entry was already voided (${row.voidReason})`);
        }
        await updateTarget(tx, e.target, e.targetId, { voidedAt: now, voidedById: actor.id, voidReason: e.reason });
        await audit('void', e.target, e.targetId, { reason: e.reason }, { voidedAt: null });
        return { id: e.id, created: true, status: c.status };
      }
      case 'retime': {
        const done = await findRetimed(tx, e.target, e.id);
        if (done) return { id: e.id, created: false, status: c.status };
        guardSigned();
        const row = await findTarget(tx, e.target, e.targetId, caseId);
        if (row.voidedAt) throw new ConflictError('targetId: this entry was voided or re-timed already; re-time the current entry');
        const newAt = new Date(e.newAt);
        const reason = e.reason ? `re-timed: ${e.reason}` : 're-timed (see the entry at the new time)';
        await updateTarget(tx, e.target, e.targetId, { voidedAt: now, voidedById: actor.id, voidReason: reason });
        await copyWithNewTime(tx, e.target, row, e.id, newAt, actor.id, now);
        await audit('retime', e.target, e.targetId, { at: e.newAt, newId: e.id }, { at: row.at.toISOString() });
        return { id: e.id, created: true, status: c.status };
      }
    }
  });
}

function same(isSame: boolean, id: string, status: string): EntryResult {
  if (!isSame) throw new ConflictError(`id: entry ${id} already exists with other content`);
  return { id, created: false, status };
}

type TargetRow = { id: string; caseId: string; at: Date; voidedAt: Date | null; voidReason: string | null } & Record<string, unknown>;

async function findTarget(tx: Tx, target: string, id: string, caseId: string): Promise<TargetRow> {
  const where = { where: { id } };
  const row = (await (target === 'dose'
    ? tx.dose.findUnique(where)
    : target === 'intervention'
      ? tx.intervention.findUnique(where)
      : target === 'event'
        ? tx.caseEvent.findUnique(where)
        : target === 'vital'
          ? tx.manualVital.findUnique(where)
          : tx.recoveryScore.findUnique(where))) as TargetRow | null;
  if (!row || row.caseId !== caseId) throw new NotFoundError(`targetId: no ${target} ${id} in this case`);
  return row;
}

async function updateTarget(tx: Tx, target: string, id: string, data: { voidedAt: Date; voidedById: string; voidReason: string }) {
  const args = { where: { id }, data };
  if (target === 'dose') await tx.dose.update(args);
  else if (target === 'intervention') await tx.intervention.update(args);
  else if (target === 'event') await tx.caseEvent.update(args);
  else if (target === 'vital') await tx.manualVital.update(args);
  else if (target === 'blood_gas') await tx.bloodGas.update(args);
  else await tx.recoveryScore.update(args);
}

async function findRetimed(tx: Tx, target: string, id: string) {
  const where = { where: { id } };
  if (target === 'dose') return tx.dose.findUnique(where);
  if (target === 'intervention') return tx.intervention.findUnique(where);
  if (target === 'event') return tx.caseEvent.findUnique(where);
  return tx.manualVital.findUnique(where);
}

async function copyWithNewTime(tx: Tx, target: string, row: TargetRow, newId: string, at: Date, actorId: string, now: Date) {
  const base = { id: newId, caseId: row.caseId, at, createdAt: now, createdById: actorId, replacesId: row.id };
  if (target === 'dose') {
    const r = row as unknown as { drugId: string | null; drug: string; drugClass: string; amount: number; unit: string; route: string };
    await tx.dose.create({ data: { ...base, drugId: r.drugId, drug: r.drug, drugClass: r.drugClass, amount: r.amount, unit: r.unit, route: r.route } });
  } else if (target === 'intervention') {
    const r = row as unknown as { kind: string; note: string | null };
    await tx.intervention.create({ data: { ...base, kind: r.kind, note: r.note } });
  } else if (target === 'event') {
    const r = row as unknown as { kind: string; note: string | null };
    await tx.caseEvent.create({ data: { ...base, kind: r.kind, note: r.note } });
  } else {
    const r = row as unknown as { sbp: number | null; dbp: number | null; hr: number | null; spo2: number | null; rr: number | null; etco2: number | null; sedationScore: number | null };
    await tx.manualVital.create({ data: { ...base, sbp: r.sbp, dbp: r.dbp, hr: r.hr, spo2: r.spo2, rr: r.rr, etco2: r.etco2, sedationScore: r.sedationScore } });
  }
}

/**
 * Applies edits to case facts with per-field optimistic concurrency: a field whose stored value
 * no longer equals what the editor saw is refused by name, and nothing is written.
 */
export async function editCaseFacts(client: PrismaClient, caseId: string, changes: { field: string; from: unknown; to: unknown }[], actor: Actor, now: Date) {
  return client.$transaction(async (tx) => {
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
