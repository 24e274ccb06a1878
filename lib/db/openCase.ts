import { randomUUID } from 'node:crypto';
import type { PrismaClient } from './generated/client';
import type { NewCaseInput } from '@/lib/domain/newCase';
import { appendAudit } from './audit';
import { ConflictError, NotFoundError } from './cases';
import type { Actor } from './entries';
import { writeTx } from './tx';
import { caseless } from './caseless';

/** Opens a case (adding the patient when new) for a nurse's unit, today, in one transaction. */
export async function openCase(client: PrismaClient, unitId: string, input: NewCaseInput, actor: Actor, now: Date, scheduledDate: string) {
  return writeTx(client, async (tx) => {
    const unit = await tx.unit.findUnique({ where: { id: unitId } });
    if (!unit) throw new NotFoundError('unit not found');
    const room = await tx.room.findFirst({ where: { id: input.roomId, unitId } });
    if (!room) throw new NotFoundError(`roomId: ${input.roomId} is not a room of this unit`);
    if (input.proceduralistId) {
      const p = await tx.proceduralist.findFirst({ where: { id: input.proceduralistId, unitId } });
      if (!p) throw new NotFoundError(`proceduralistId: ${input.proceduralistId} is not a proceduralist of this unit`);
    }
    let patientId = input.patientId;
    if (input.patient) {
      const clash = await tx.patient.findUnique({ where: { siteId_mrn: { siteId: unit.siteId, mrn: input.patient.mrn } } });
      if (clash) throw new ConflictError(`patient.mrn: record number ${input.patient.mrn} already belongs to a patient; search for them instead`);
      patientId = randomUUID();
      await tx.patient.create({ data: { id: patientId, siteId: unit.siteId, ...input.patient, createdAt: now, createdById: actor.id } });
      await appendAudit(tx, { at: now, actorId: actor.id, role: actor.role, action: 'create', entity: 'patient', entityId: patientId, after: { mrn: input.patient.mrn }, origin: actor.origin });
    } else {
      const p = await tx.patient.findFirst({ where: { id: patientId, siteId: unit.siteId } });
      if (!p) throw new NotFoundError(`patientId: ${patientId} not found`);
    }
    const id = randomUUID();
    const sb = input.stopBang ?? {};
    const c = await tx.case.create({
      data: {
        id,
        patientId: patientId!,
        unitId,
        roomId: room.id,
        procedureType: input.procedureType,
        plannedDepth: input.plannedDepth,
        asaClass: input.asaClass ?? null,
        asaEmergency: input.asaEmergency ?? false,
        weightKg: input.weightKg ?? null,
        heightCm: input.heightCm ?? null,
        neckCm: input.neckCm ?? null,
        sbSnoring: sb.snoring ?? null,
        sbTired: sb.tired ?? null,
        sbObserved: sb.observed ?? null,
        sbPressure: sb.pressure ?? null,
        sbNeck: sb.neck ?? null,
        airwayClass: input.airwayClass ?? null,
        fastingSolidsAt: input.fastingSolidsAt ? new Date(input.fastingSolidsAt) : null,
        fastingClearsAt: input.fastingClearsAt ? new Date(input.fastingClearsAt) : null,
        allergies: input.allergies ?? null,
        baselineSpo2: input.baselineSpo2 ?? null,
        oxygenDelivery: input.oxygenDelivery ?? null,
        proceduralistId: input.proceduralistId ?? null,
        nurseId: actor.role === 'nurse' || actor.role === 'lead' ? actor.id : null,
        status: 'draft',
        scheduledDate,
        startAt: now,
        etco2Unit: input.etco2Unit ?? 'mmHg',
        createdAt: now,
        createdById: actor.id,
      },
    });
    await appendAudit(tx, { at: now, actorId: actor.id, role: actor.role, action: 'create', entity: 'case', entityId: id, caseId: id, after: { ...input, patient: input.patient ? { mrn: input.patient.mrn } : undefined }, origin: actor.origin });
    return c;
  });
}

/** Patients of the unit's site whose record number or name starts with the query. */
export async function searchPatients(client: PrismaClient, unitId: string, q: string) {
  const unit = await client.unit.findUnique({ where: { id: unitId }, select: { siteId: true } });
  if (!unit) return [];
  const term = q.trim();
  if (!term) return [];
  const words = term.split(/[\s,]+/).filter(Boolean);
  const ci = caseless(client);
  return client.patient.findMany({
    where: {
      siteId: unit.siteId,
      OR: [{ mrn: { startsWith: term, ...ci } }, { AND: words.map((w) => ({ OR: [{ familyName: { startsWith: w, ...ci } }, { givenName: { startsWith: w, ...ci } }] })) }],
    },
    take: 12,
    orderBy: [{ familyName: 'asc' }, { givenName: 'asc' }],
    select: { id: true, mrn: true, familyName: true, givenName: true, birthDate: true, sex: true },
  });
}

/** What the open-a-case form offers: rooms, proceduralists, procedures, and the unit's defaults. */
export async function caseFormOptions(client: PrismaClient, unitId: string) {
  const [unit, rooms, proceduralists, procedures] = await Promise.all([
    client.unit.findUnique({ where: { id: unitId } }),
    client.room.findMany({ where: { unitId, active: true }, orderBy: { sortOrder: 'asc' } }),
    client.proceduralist.findMany({ where: { unitId, active: true }, orderBy: { name: 'asc' } }),
    client.procedureType.findMany({ where: { unitId, active: true }, orderBy: { label: 'asc' } }),
  ]);
  return {
    rooms: rooms.map((r) => ({ id: r.id, name: r.name })),
    proceduralists: proceduralists.map((p) => ({ id: p.id, name: p.name, specialty: p.specialty })),
    procedures: procedures.map((p) => ({ code: p.code, label: p.label })),
    defaults: { roomId: unit?.defaultRoomId ?? rooms[0]?.id ?? null, proceduralistId: unit?.usualProceduralistId ?? null },
  };
}
