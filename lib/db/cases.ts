import type { PrismaClient } from './generated/client';
import { appendAudit } from './audit';
import { writeTx } from './tx';

export function unitOf(client: PrismaClient, unitId: string) {
  return client.unit.findUnique({ where: { id: unitId }, include: { rooms: { where: { active: true }, orderBy: { sortOrder: 'asc' } } } });
}

export function firstUnit(client: PrismaClient) {
  return client.unit.findFirst({ orderBy: { createdAt: 'asc' }, include: { rooms: { where: { active: true }, orderBy: { sortOrder: 'asc' } } } });
}

/** Cases scheduled on a day in a unit, with what the case list shows. */
export function casesForDay(client: PrismaClient, unitId: string, date: string) {
  return client.case.findMany({
    where: { unitId, scheduledDate: date },
    orderBy: [{ startAt: 'asc' }],
    select: {
      id: true,
      key: true,
      roomId: true,
      status: true,
      procedureType: true,
      plannedDepth: true,
      startAt: true,
      asaClass: true,
      patient: { select: { mrn: true, familyName: true, givenName: true, birthDate: true, sex: true } },
      proceduralist: { select: { name: true } },
      nurse: { select: { displayName: true } },
    },
  });
}

export function caseFacts(client: PrismaClient, id: string) {
  return client.case.findUnique({
    where: { id },
    include: {
      patient: true,
      room: true,
      unit: true,
      proceduralist: true,
      nurse: { select: { displayName: true } },
      doses: { orderBy: { at: 'asc' } },
      interventions: { orderBy: { at: 'asc' } },
      events: { orderBy: { at: 'asc' } },
      _count: { select: { samples: true } },
    },
  });
}

export class NotFoundError extends Error {}
export class ConflictError extends Error {}

/**
 * Stores a dose once: the same device id sent again returns the stored row (idempotent);
 * the same id with other content is a conflict, never an overwrite.
 */
export async function recordDose(
  client: PrismaClient,
  input: { id: string; caseId: string; drugId: string; amount: number; unit: string; route: string; at: Date },
  actor: { id: string; role: string; origin: string | null },
  now: Date,
) {
  return writeTx(client, async (tx) => {
    const existing = await tx.dose.findUnique({ where: { id: input.id } });
    if (existing) {
      const same = existing.caseId === input.caseId && existing.drugId === input.drugId && existing.amount === input.amount && existing.unit === input.unit && existing.at.getTime() === input.at.getTime();
      if (!same) throw new ConflictError(`id: entry ${input.id} already exists with other content`);
      return { dose: existing, created: false };
    }
    const c = await tx.case.findUnique({ where: { id: input.caseId }, select: { id: true, unitId: true, status: true } });
    if (!c) throw new NotFoundError(`case ${input.caseId} not found`);
    if (c.status === 'signed') throw new ConflictError('case: the note is signed; amend it instead of adding entries');
    const drug = await tx.drug.findFirst({ where: { id: input.drugId, unitId: c.unitId } });
    if (!drug) throw new NotFoundError(`drugId: ${input.drugId} is not in this unit's formulary`);
    const dose = await tx.dose.create({
      data: { id: input.id, caseId: input.caseId, drugId: drug.id, drug: drug.name, drugClass: drug.drugClass, amount: input.amount, unit: input.unit, route: input.route, at: input.at, createdAt: now, createdById: actor.id },
    });
    await appendAudit(tx, { at: now, actorId: actor.id, role: actor.role, action: 'create', entity: 'dose', entityId: dose.id, caseId: input.caseId, after: { drug: drug.name, amount: input.amount, unit: input.unit, route: input.route, at: input.at.toISOString() }, origin: actor.origin });
    return { dose, created: true };
  });
}
