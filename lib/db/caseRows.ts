/**
 * One case's rows as the case sheet, the case record and the note read them: the case with its
 * patient, room, unit, proceduralist and nurse, and every entry (voided ones too, marked), in
 * time order. Plain SQL through the Sql port: the live sheet asks for this on every poll, and
 * the ORM's cost per statement was most of a poll's time (docs/trust.md, load).
 */
import { asBool, asBoolOrNull, asDate, asDateOrNull, type Sql } from './sql';

export interface CaseRow {
  id: string;
  unitId: string;
  status: string;
  version: number;
  startAt: Date;
  scheduledDate: string;
  etco2Unit: string;
  procedureType: string;
  plannedDepth: string;
  reachedDepth: string | null;
  asaClass: string | null;
  asaEmergency: boolean;
  weightKg: number | null;
  heightCm: number | null;
  neckCm: number | null;
  airwayClass: string | null;
  allergies: string | null;
  baselineSpo2: number | null;
  oxygenDelivery: string | null;
  sbSnoring: boolean | null;
  sbTired: boolean | null;
  sbObserved: boolean | null;
  sbPressure: boolean | null;
  sbNeck: boolean | null;
  patient: { mrn: string; familyName: string; givenName: string; birthDate: string; sex: string };
  room: string | null;
  unit: { name: string; timeZone: string; vitalsReminderMin: number };
  proceduralist: string | null;
  nurse: string | null;
}

/** What every entry row has. */
export interface EntryRowBase {
  id: string;
  at: Date;
  createdAt: Date;
  createdById: string | null;
  voidedAt: Date | null;
  voidedById: string | null;
  voidReason: string | null;
}

export type DoseRow = EntryRowBase & { drugId: string | null; drug: string; drugClass: string; amount: number; unit: string; route: string; replacesId: string | null };
export type InterventionRow = EntryRowBase & { kind: string; note: string | null; replacesId: string | null };
export type EventRow = EntryRowBase & { kind: string; note: string | null; replacesId: string | null };
export type VitalRow = EntryRowBase & { sbp: number | null; dbp: number | null; hr: number | null; spo2: number | null; rr: number | null; etco2: number | null; sedationScore: number | null; replacesId: string | null };
export type RecoveryRow = EntryRowBase & { activity: number; respiration: number; circulation: number; consciousness: number; oxygenation: number; total: number };
export type BloodGasRow = EntryRowBase & { paco2: number; enteredUnit: string; ph: number | null; pao2: number | null; fio2: number | null; sampleType: string };

export interface CaseRows {
  case: CaseRow;
  doses: DoseRow[];
  interventions: InterventionRow[];
  events: EventRow[];
  vitals: VitalRow[];
  recoveryScores: RecoveryRow[];
  bloodGases: BloodGasRow[];
}

function entries<T extends EntryRowBase>(rows: Record<string, unknown>[]): T[] {
  return rows.map((r) => ({ ...r, at: asDate(r.at), createdAt: asDate(r.createdAt), voidedAt: asDateOrNull(r.voidedAt) }) as unknown as T);
}

/** The case and all its entries (voided ones included), or null when there is no such case. */
export async function loadCaseRows(q: Sql, caseId: string): Promise<CaseRows | null> {
  const [c, doses, interventions, events, vitals, recoveryScores, bloodGases] = await Promise.all([
    q.get<Record<string, unknown>>(
      `SELECT c.*, p."mrn", p."familyName", p."givenName", p."birthDate", p."sex", r."name" AS "roomName",
         u."name" AS "unitName", u."timeZone", u."vitalsReminderMin", pr."name" AS "proceduralistName", n."displayName" AS "nurseName"
       FROM "Case" c
         JOIN "Patient" p ON p."id" = c."patientId"
         JOIN "Unit" u ON u."id" = c."unitId"
         LEFT JOIN "Room" r ON r."id" = c."roomId"
         LEFT JOIN "Proceduralist" pr ON pr."id" = c."proceduralistId"
         LEFT JOIN "User" n ON n."id" = c."nurseId"
       WHERE c."id" = ?`,
      [caseId],
    ),
    q.all<Record<string, unknown>>('SELECT * FROM "Dose" WHERE "caseId" = ? ORDER BY "at", "id"', [caseId]),
    q.all<Record<string, unknown>>('SELECT * FROM "Intervention" WHERE "caseId" = ? ORDER BY "at", "id"', [caseId]),
    q.all<Record<string, unknown>>('SELECT * FROM "CaseEvent" WHERE "caseId" = ? ORDER BY "at", "id"', [caseId]),
    q.all<Record<string, unknown>>('SELECT * FROM "ManualVital" WHERE "caseId" = ? ORDER BY "at", "id"', [caseId]),
    q.all<Record<string, unknown>>('SELECT * FROM "RecoveryScore" WHERE "caseId" = ? ORDER BY "at", "id"', [caseId]),
    q.all<Record<string, unknown>>('SELECT * FROM "BloodGas" WHERE "caseId" = ? ORDER BY "at", "id"', [caseId]),
  ]);
  if (!c) return null;
  const str = (v: unknown) => (v === null || v === undefined ? null : String(v));
  const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));
  return {
    case: {
      id: String(c.id),
      unitId: String(c.unitId),
      status: String(c.status),
      version: Number(c.version),
      startAt: asDate(c.startAt),
      scheduledDate: String(c.scheduledDate),
      etco2Unit: String(c.etco2Unit),
      procedureType: String(c.procedureType),
      plannedDepth: String(c.plannedDepth),
      reachedDepth: str(c.reachedDepth),
      asaClass: str(c.asaClass),
      asaEmergency: asBool(c.asaEmergency),
      weightKg: num(c.weightKg),
      heightCm: num(c.heightCm),
      neckCm: num(c.neckCm),
      airwayClass: str(c.airwayClass),
      allergies: str(c.allergies),
      baselineSpo2: num(c.baselineSpo2),
      oxygenDelivery: str(c.oxygenDelivery),
      sbSnoring: asBoolOrNull(c.sbSnoring),
      sbTired: asBoolOrNull(c.sbTired),
      sbObserved: asBoolOrNull(c.sbObserved),
      sbPressure: asBoolOrNull(c.sbPressure),
      sbNeck: asBoolOrNull(c.sbNeck),
      patient: { mrn: String(c.mrn), familyName: String(c.familyName), givenName: String(c.givenName), birthDate: String(c.birthDate), sex: String(c.sex) },
      room: str(c.roomName),
      unit: { name: String(c.unitName), timeZone: String(c.timeZone), vitalsReminderMin: Number(c.vitalsReminderMin) },
      proceduralist: str(c.proceduralistName),
      nurse: str(c.nurseName),
    },
    doses: entries<DoseRow>(doses),
    interventions: entries<InterventionRow>(interventions),
    events: entries<EventRow>(events),
    vitals: entries<VitalRow>(vitals),
    recoveryScores: entries<RecoveryRow>(recoveryScores),
    bloodGases: entries<BloodGasRow>(bloodGases),
  };
}
