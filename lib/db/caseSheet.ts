import type { PrismaClient } from './generated/client';
import { refreshSummary } from './summaries';
import { sqlOf } from './client';
import { asBool, asDate } from './sql';
import { loadCaseRows } from './caseRows';
import type { Analysis } from '@/lib/domain/episode';

export interface SheetEntryBase {
  id: string;
  at: string;
  by: string | null;
  createdAt: string;
  voided: { at: string; by: string | null; reason: string } | null;
  replacesId: string | null;
}

export interface CaseSheetData {
  serverNow: string;
  case: {
    id: string;
    status: string;
    version: number;
    startAt: string;
    scheduledDate: string;
    etco2Unit: 'mmHg' | 'kPa';
    procedureType: string;
    plannedDepth: string;
    reachedDepth: string | null;
    asaClass: string | null;
    asaEmergency: boolean;
    weightKg: number | null;
    heightCm: number | null;
    airwayClass: string | null;
    allergies: string | null;
    baselineSpo2: number | null;
    oxygenDelivery: string | null;
    stopBang: { snoring: boolean | null; tired: boolean | null; observed: boolean | null; pressure: boolean | null; neck: boolean | null; neckCm: number | null };
    room: string | null;
    proceduralist: string | null;
    nurse: string | null;
    patient: { mrn: string; familyName: string; givenName: string; birthDate: string; sex: string };
    unit: { name: string; timeZone: string; vitalsReminderMin: number };
  };
  drugs: { id: string; name: string; drugClass: string; defaultUnit: string; defaultRoute: string; usualDose: number | null; cautionAbove: number | null; concentration: string | null }[];
  doses: (SheetEntryBase & { drugId: string | null; drug: string; amount: number; unit: string; route: string })[];
  interventions: (SheetEntryBase & { kind: string; note: string | null })[];
  events: (SheetEntryBase & { kind: string; note: string | null })[];
  bloodGases: (SheetEntryBase & { paco2: number; enteredUnit: string; ph: number | null; pao2: number | null; fio2: number | null; sampleType: string })[];
  vitals: (SheetEntryBase & { sbp: number | null; dbp: number | null; hr: number | null; spo2: number | null; rr: number | null; etco2: number | null; sedationScore: number | null })[];
  recovery: (SheetEntryBase & { activity: number; respiration: number; circulation: number; consciousness: number; oxygenation: number; total: number })[];
  /** Monitor samples after `afterSampleId`, seconds from startAt, per channel (EtCO2 in mmHg). */
  samples: { lastId: number; channels: Record<string, { t: number[]; v: number[] }> };
  imports: { id: string; fileName: string; samples: number; createdAt: string }[];
  /** Raw CO2 waveform files stored for the case (the viewer is /cases/[id]/waveform). */
  waveformImports: number;
  analysis: Analysis | null;
}

/** Everything the live case sheet shows, in one read; samples incrementally by id. */
export async function loadCaseSheet(client: PrismaClient, caseId: string, afterSampleId: number, now: Date): Promise<CaseSheetData | null> {
  const q = sqlOf(client);
  const rows = await loadCaseRows(q, caseId);
  if (!rows) return null;
  const c = rows.case;
  const [drugs, users, samples, imports, waveform] = await Promise.all([
    q.all<CaseSheetData['drugs'][number]>(
      'SELECT "id", "name", "drugClass", "defaultUnit", "defaultRoute", "usualDose", "cautionAbove", "concentration" FROM "Drug" WHERE "unitId" = ? AND "active" = TRUE ORDER BY "sortOrder", "name"',
      [c.unitId],
    ),
    q.all<{ id: string; displayName: string }>('SELECT "id", "displayName" FROM "User" WHERE "unitId" = ?', [c.unitId]),
    q
      .all<{ id: number; channel: string; atMs: number; value: number; probeOff: unknown }>(`SELECT "id", "channel", "atMs", "value", "probeOff" FROM "Sample" WHERE "caseId" = ? AND "id" > ? AND "source" = 'monitor' ORDER BY "atMs"`, [caseId, afterSampleId])
      .then((list) => list.map((r) => ({ ...r, probeOff: asBool(r.probeOff) }))),
    q.all<{ id: string; fileName: string; samples: number; createdAt: unknown }>('SELECT "id", "fileName", "samples", "createdAt" FROM "SampleImport" WHERE "caseId" = ? ORDER BY "createdAt"', [caseId]),
    q.get<{ n: number }>('SELECT COUNT(*) AS "n" FROM "WaveformImport" WHERE "caseId" = ?', [caseId]),
  ]);
  const gases = rows.bloodGases;
  const waveformImports = Number(waveform?.n ?? 0);
  const names = new Map(users.map((u) => [u.id, u.displayName]));
  const who = (id: string | null) => (id ? (names.get(id) ?? 'another unit') : null);
  const base = (r: { id: string; at: Date; createdById: string | null; createdAt: Date; voidedAt: Date | null; voidedById: string | null; voidReason: string | null; replacesId?: string | null }): SheetEntryBase => ({
    id: r.id,
    at: r.at.toISOString(),
    by: who(r.createdById),
    createdAt: r.createdAt.toISOString(),
    voided: r.voidedAt ? { at: r.voidedAt.toISOString(), by: who(r.voidedById), reason: r.voidReason ?? '' } : null,
    replacesId: r.replacesId ?? null,
  });
  const startMs = c.startAt.getTime();
  const channels: Record<string, { t: number[]; v: number[] }> = {};
  let lastId = afterSampleId;
  for (const s of samples) {
    if (s.id > lastId) lastId = s.id;
    if (s.probeOff) continue;
    const ch = (channels[s.channel] ??= { t: [], v: [] });
    ch.t.push((s.atMs - startMs) / 1000);
    ch.v.push(s.value);
  }
  let analysis: Analysis | null = null;
  try {
    analysis = await refreshSummary(client, caseId, now, undefined, rows);
  } catch (e) {
    console.error('analysis failed for a case', e instanceof Error ? e.message : 'unknown');
  }
  return {
    serverNow: now.toISOString(),
    case: {
      id: c.id,
      status: c.status,
      version: c.version,
      startAt: c.startAt.toISOString(),
      scheduledDate: c.scheduledDate,
      etco2Unit: c.etco2Unit === 'kPa' ? 'kPa' : 'mmHg',
      procedureType: c.procedureType,
      plannedDepth: c.plannedDepth,
      reachedDepth: c.reachedDepth,
      asaClass: c.asaClass,
      asaEmergency: c.asaEmergency,
      weightKg: c.weightKg,
      heightCm: c.heightCm,
      airwayClass: c.airwayClass,
      allergies: c.allergies,
      baselineSpo2: c.baselineSpo2,
      oxygenDelivery: c.oxygenDelivery,
      stopBang: { snoring: c.sbSnoring, tired: c.sbTired, observed: c.sbObserved, pressure: c.sbPressure, neck: c.sbNeck, neckCm: c.neckCm },
      room: c.room,
      proceduralist: c.proceduralist,
      nurse: c.nurse,
      patient: { mrn: c.patient.mrn, familyName: c.patient.familyName, givenName: c.patient.givenName, birthDate: c.patient.birthDate, sex: c.patient.sex },
      unit: c.unit,
    },
    drugs,
    doses: rows.doses.map((d) => ({ ...base(d), drugId: d.drugId, drug: d.drug, amount: d.amount, unit: d.unit, route: d.route })),
    interventions: rows.interventions.map((i) => ({ ...base(i), kind: i.kind, note: i.note })),
    events: rows.events.map((e) => ({ ...base(e), kind: e.kind, note: e.note })),
    bloodGases: gases.map((g) => ({ ...base({ ...g, replacesId: null }), paco2: g.paco2, enteredUnit: g.enteredUnit, ph: g.ph, pao2: g.pao2, fio2: g.fio2, sampleType: g.sampleType })),
    vitals: rows.vitals.map((v) => ({ ...base(v), sbp: v.sbp, dbp: v.dbp, hr: v.hr, spo2: v.spo2, rr: v.rr, etco2: v.etco2, sedationScore: v.sedationScore })),
    recovery: rows.recoveryScores.map((r) => ({ ...base({ ...r, replacesId: null }), activity: r.activity, respiration: r.respiration, circulation: r.circulation, consciousness: r.consciousness, oxygenation: r.oxygenation, total: r.total })),
    samples: { lastId, channels },
    imports: imports.map((i) => ({ id: i.id, fileName: i.fileName, samples: Number(i.samples), createdAt: asDate(i.createdAt).toISOString() })),
    analysis,
    waveformImports,
  };
}
