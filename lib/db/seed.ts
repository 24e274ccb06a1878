/**
 * Writes the generated demo unit (lib/demo) into an empty database. Bulk rows go through one
 * Sql-port transaction (lib/db/sql.ts) on either database: about three million samples would
 * take minutes through the ORM, and a half-written demo would be worse than none.
 */
import type { DemoCase } from '@/lib/demo/types';
import { appendAuditSql } from './auditSql';
import type { Sql, SqlValue } from './sql';

export interface SeedInput {
  site: { id: string; name: string };
  unit: { id: string; name: string; timeZone: string; defaultRoomId: string | null; usualProceduralistId: string | null };
  rooms: { id: string; name: string; sortOrder: number; location: string }[];
  procedures: { id: string; code: string; label: string; typicalMin: number }[];
  users: { id: string; username: string; displayName: string; role: string; passwordHash: string }[];
  proceduralists: { id: string; name: string; specialty: string }[];
  drugs: { id: string; name: string; drugClass: string; defaultUnit: string; defaultRoute: string; usualDose: number; cautionAbove: number; concentration: string; sortOrder: number }[];
  patients: { id: string; mrn: string; familyName: string; givenName: string; birthDate: string; sex: string }[];
  cases: DemoCase[];
  now: Date;
}

/** True when the database has no unit and no user yet. */
export async function isEmpty(q: Sql): Promise<boolean> {
  const r = await q.get<{ n: number }>('SELECT (SELECT COUNT(*) FROM "Unit") + (SELECT COUNT(*) FROM "User") AS "n"');
  return Number(r?.n ?? 0) === 0;
}

const CASE_COLUMNS = ['id', 'key', 'patientId', 'unitId', 'roomId', 'procedureType', 'plannedDepth', 'asaClass', 'asaEmergency', 'weightKg', 'heightCm',
  'sbSnoring', 'sbTired', 'sbObserved', 'sbPressure', 'sbNeck', 'airwayClass', 'fastingSolidsAt', 'fastingClearsAt', 'baselineSpo2', 'oxygenDelivery', 'proceduralistId', 'nurseId',
  'status', 'scheduledDate', 'startAt', 'etco2Unit', 'version', 'createdAt', 'createdById', 'updatedAt'];

/** Writes everything in one transaction; returns counts. */
export async function writeSeed(q: Sql, s: SeedInput): Promise<{ cases: number; samples: number }> {
  let samples = 0;
  const userIdByName = new Map(s.users.map((u) => [u.username, u.id]));
  const patientIdByMrn = new Map(s.patients.map((p) => [p.mrn, p.id]));
  const drugIdByName = new Map(s.drugs.map((d) => [d.name, d.id]));
  await q.tx(async (t) => {
    const now = s.now;
    await t.insertMany('Site', ['id', 'name', 'createdAt'], [[s.site.id, s.site.name, now]]);
    await t.insertMany('Unit', ['id', 'siteId', 'name', 'timeZone', 'defaultRoomId', 'usualProceduralistId', 'createdAt'], [[s.unit.id, s.site.id, s.unit.name, s.unit.timeZone, s.unit.defaultRoomId, s.unit.usualProceduralistId, now]]);
    await t.insertMany('Room', ['id', 'unitId', 'name', 'location', 'sortOrder', 'createdAt'], s.rooms.map((r) => [r.id, s.unit.id, r.name, r.location, r.sortOrder, now]));
    await t.insertMany('ProcedureType', ['id', 'unitId', 'code', 'label', 'typicalMin'], s.procedures.map((p) => [p.id, s.unit.id, p.code, p.label, p.typicalMin]));
    await t.insertMany('User', ['id', 'username', 'displayName', 'role', 'passwordHash', 'unitId', 'createdAt'], s.users.map((u) => [u.id, u.username, u.displayName, u.role, u.passwordHash, s.unit.id, now]));
    await t.insertMany('Proceduralist', ['id', 'unitId', 'name', 'specialty', 'createdAt'], s.proceduralists.map((p) => [p.id, s.unit.id, p.name, p.specialty, now]));
    await t.insertMany(
      'Drug',
      ['id', 'unitId', 'name', 'drugClass', 'defaultUnit', 'defaultRoute', 'usualDose', 'cautionAbove', 'concentration', 'sortOrder', 'createdAt'],
      s.drugs.map((d) => [d.id, s.unit.id, d.name, d.drugClass, d.defaultUnit, d.defaultRoute, d.usualDose, d.cautionAbove, d.concentration, d.sortOrder, now]),
    );
    await t.insertMany('Patient', ['id', 'siteId', 'mrn', 'familyName', 'givenName', 'birthDate', 'sex', 'createdAt'], s.patients.map((p) => [p.id, s.site.id, p.mrn, p.familyName, p.givenName, p.birthDate, p.sex, now]));

    const rows = { cases: [] as SqlValue[][], doses: [] as SqlValue[][], ivs: [] as SqlValue[][], evs: [] as SqlValue[][], mvs: [] as SqlValue[][], rss: [] as SqlValue[][] };
    for (const c of s.cases) {
      const caseId = `case-${c.key}`;
      const start = new Date(c.record.case.start);
      const startMs = start.getTime();
      const at = (sec: number) => new Date(startMs + Math.round(sec * 1000));
      const nurseId = userIdByName.get(c.nurseUsername) ?? null;
      const a = c.assessment;
      const asa = a.asaClass.replace(/E$/, '');
      rows.cases.push([
        caseId, c.key, patientIdByMrn.get(c.patientMrn) ?? null, s.unit.id, c.roomId, c.procedureId, a.plannedDepth, asa, a.asaClass.endsWith('E'), a.weightKg, a.heightCm,
        a.stopBang.snoring, a.stopBang.tiredness, a.stopBang.observedApnea, a.stopBang.highBloodPressure, a.stopBang.neckOver40, a.mallampati,
        new Date(startMs - a.fasting.solidsH * 3600_000), new Date(startMs - a.fasting.clearFluidsH * 3600_000),
        null, 'nasal cannula 2 L/min', c.proceduralistId, nurseId, c.status, localDateOf(start, s.unit.timeZone), start, c.record.case.etco2Unit,
        1, start, nurseId, now,
      ]);
      c.record.doses.forEach((d, i) => rows.doses.push([`${caseId}-d${i}`, caseId, drugIdByName.get(d.drug) ?? null, d.drug, d.drugClass ?? 'other', d.amount, d.unit, d.route, at(d.t), at(d.t), nurseId]));
      c.record.interventions.forEach((x, i) => rows.ivs.push([`${caseId}-i${i}`, caseId, x.kind, at(x.t), x.note ?? null, at(x.t), nurseId]));
      c.record.events.forEach((e, i) => rows.evs.push([`${caseId}-e${i}`, caseId, e.kind, at(e.t), at(e.t), nurseId]));
      c.manualVitals.forEach((v, i) => rows.mvs.push([`${caseId}-v${i}`, caseId, at(v.t), v.sbp, v.dbp, v.hr, at(v.t), nurseId]));
      c.aldrete.forEach((r, i) => rows.rss.push([`${caseId}-r${i}`, caseId, at(r.t), r.activity, r.respiration, r.circulation, r.consciousness, r.spo2, r.total, at(r.t), nurseId]));
    }
    await t.insertMany('Case', CASE_COLUMNS, rows.cases);
    await t.insertMany('Dose', ['id', 'caseId', 'drugId', 'drug', 'drugClass', 'amount', 'unit', 'route', 'at', 'createdAt', 'createdById'], rows.doses);
    await t.insertMany('Intervention', ['id', 'caseId', 'kind', 'at', 'note', 'createdAt', 'createdById'], rows.ivs);
    await t.insertMany('CaseEvent', ['id', 'caseId', 'kind', 'at', 'createdAt', 'createdById'], rows.evs);
    await t.insertMany('ManualVital', ['id', 'caseId', 'at', 'sbp', 'dbp', 'hr', 'createdAt', 'createdById'], rows.mvs);
    await t.insertMany('RecoveryScore', ['id', 'caseId', 'at', 'activity', 'respiration', 'circulation', 'consciousness', 'oxygenation', 'total', 'createdAt', 'createdById'], rows.rss);

    // Samples case by case, so three million rows never sit in memory at once.
    for (const c of s.cases) {
      const caseId = `case-${c.key}`;
      const startMs = new Date(c.record.case.start).getTime();
      const sm: SqlValue[][] = [];
      for (const series of c.record.series) {
        const off = series.probeOff;
        for (let i = 0; i < series.t.length; i++) sm.push([caseId, series.channel, startMs + Math.round(series.t[i] * 1000), series.v[i], series.source, !!(off && off[i])]);
      }
      samples += await t.insertMany('Sample', ['caseId', 'channel', 'atMs', 'value', 'source', 'probeOff'], sm);
    }
    await appendAuditSql(t, { at: s.now, action: 'seed', entity: 'unit', entityId: s.unit.id, after: { cases: s.cases.length, samples } });
  });
  return { cases: s.cases.length, samples };
}

function localDateOf(at: Date, timeZone: string): string {
  const parts = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).formatToParts(at);
  const get = (t: string) => parts.find((p) => p.type === t)?.value ?? '';
  return `${get('year')}-${get('month')}-${get('day')}`;
}
