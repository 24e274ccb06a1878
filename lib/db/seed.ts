/**
 * Writes the generated demo unit (lib/demo) into an empty database. Bulk rows go through one
 * raw better-sqlite3 transaction: about three million samples would take minutes through the
 * ORM, and a half-written demo would be worse than none.
 */
import type Database from 'better-sqlite3';
import type { DemoCase } from '@/lib/demo/types';
import { isoDb } from './sqlite';
import { appendAuditRaw } from './auditRaw';

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

export function isEmpty(raw: Database.Database): boolean {
  const r = raw.prepare('SELECT (SELECT COUNT(*) FROM Unit) + (SELECT COUNT(*) FROM "User") AS n').get() as { n: number };
  return r.n === 0;
}

/** Writes everything in one transaction; returns counts. */
export function writeSeed(raw: Database.Database, s: SeedInput): { cases: number; samples: number } {
  const nowIso = isoDb(s.now);
  let samples = 0;
  const userIdByName = new Map(s.users.map((u) => [u.username, u.id]));
  const patientIdByMrn = new Map(s.patients.map((p) => [p.mrn, p.id]));
  const drugIdByName = new Map(s.drugs.map((d) => [d.name, d.id]));
  const tx = raw.transaction(() => {
    raw.prepare('INSERT INTO Site (id, name, createdAt) VALUES (?, ?, ?)').run(s.site.id, s.site.name, nowIso);
    raw
      .prepare('INSERT INTO Unit (id, siteId, name, timeZone, defaultRoomId, usualProceduralistId, createdAt) VALUES (?, ?, ?, ?, ?, ?, ?)')
      .run(s.unit.id, s.site.id, s.unit.name, s.unit.timeZone, s.unit.defaultRoomId, s.unit.usualProceduralistId, nowIso);
    const room = raw.prepare('INSERT INTO Room (id, unitId, name, location, sortOrder, createdAt) VALUES (?, ?, ?, ?, ?, ?)');
    for (const r of s.rooms) room.run(r.id, s.unit.id, r.name, r.location, r.sortOrder, nowIso);
    const proc = raw.prepare('INSERT INTO ProcedureType (id, unitId, code, label, typicalMin) VALUES (?, ?, ?, ?, ?)');
    for (const p of s.procedures) proc.run(p.id, s.unit.id, p.code, p.label, p.typicalMin);
    const user = raw.prepare('INSERT INTO "User" (id, username, displayName, role, passwordHash, unitId, createdAt) VALUES (?, ?, ?, ?, ?, ?, ?)');
    for (const u of s.users) user.run(u.id, u.username, u.displayName, u.role, u.passwordHash, s.unit.id, nowIso);
    const pr = raw.prepare('INSERT INTO Proceduralist (id, unitId, name, specialty, createdAt) VALUES (?, ?, ?, ?, ?)');
    for (const p of s.proceduralists) pr.run(p.id, s.unit.id, p.name, p.specialty, nowIso);
    const drug = raw.prepare(
      'INSERT INTO Drug (id, unitId, name, drugClass, defaultUnit, defaultRoute, usualDose, cautionAbove, concentration, sortOrder, createdAt) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)',
    );
    for (const d of s.drugs) drug.run(d.id, s.unit.id, d.name, d.drugClass, d.defaultUnit, d.defaultRoute, d.usualDose, d.cautionAbove, d.concentration, d.sortOrder, nowIso);
    const pat = raw.prepare('INSERT INTO Patient (id, siteId, mrn, familyName, givenName, birthDate, sex, createdAt) VALUES (?, ?, ?, ?, ?, ?, ?, ?)');
    for (const p of s.patients) pat.run(p.id, s.site.id, p.mrn, p.familyName, p.givenName, p.birthDate, p.sex, nowIso);

    const cs = raw.prepare(`INSERT INTO "Case" (id, key, patientId, unitId, roomId, procedureType, plannedDepth, asaClass, asaEmergency, weightKg, heightCm,
      sbSnoring, sbTired, sbObserved, sbPressure, sbNeck, airwayClass, fastingSolidsAt, fastingClearsAt, baselineSpo2, oxygenDelivery, proceduralistId, nurseId,
      status, scheduledDate, startAt, etco2Unit, version, createdAt, createdById, updatedAt)
      VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 1, ?, ?, ?)`);
    const dose = raw.prepare('INSERT INTO Dose (id, caseId, drugId, drug, drugClass, amount, unit, route, at, createdAt, createdById) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)');
    const iv = raw.prepare('INSERT INTO Intervention (id, caseId, kind, at, note, createdAt, createdById) VALUES (?, ?, ?, ?, ?, ?, ?)');
    const ev = raw.prepare('INSERT INTO CaseEvent (id, caseId, kind, at, createdAt, createdById) VALUES (?, ?, ?, ?, ?, ?)');
    const mv = raw.prepare('INSERT INTO ManualVital (id, caseId, at, sbp, dbp, hr, createdAt, createdById) VALUES (?, ?, ?, ?, ?, ?, ?, ?)');
    const rs = raw.prepare(
      'INSERT INTO RecoveryScore (id, caseId, at, activity, respiration, circulation, consciousness, oxygenation, total, createdAt, createdById) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)',
    );
    const sm = raw.prepare('INSERT INTO Sample (caseId, channel, atMs, value, source, probeOff) VALUES (?, ?, ?, ?, ?, ?)');

    for (const c of s.cases) {
      const caseId = `case-${c.key}`;
      const start = new Date(c.record.case.start);
      const startMs = start.getTime();
      const at = (t: number) => isoDb(new Date(startMs + Math.round(t * 1000)));
      const nurseId = userIdByName.get(c.nurseUsername) ?? null;
      const a = c.assessment;
      const asa = a.asaClass.replace(/E$/, '');
      const b = (x: boolean) => (x ? 1 : 0);
      cs.run(
        caseId, c.key, patientIdByMrn.get(c.patientMrn), s.unit.id, c.roomId, c.procedureId, a.plannedDepth, asa, b(a.asaClass.endsWith('E')), a.weightKg, a.heightCm,
        b(a.stopBang.snoring), b(a.stopBang.tiredness), b(a.stopBang.observedApnea), b(a.stopBang.highBloodPressure), b(a.stopBang.neckOver40), a.mallampati,
        isoDb(new Date(startMs - a.fasting.solidsH * 3600_000)), isoDb(new Date(startMs - a.fasting.clearFluidsH * 3600_000)),
        null, 'nasal cannula 2 L/min', c.proceduralistId, nurseId, c.status, localDateOf(start, s.unit.timeZone), isoDb(start), c.record.case.etco2Unit,
        isoDb(start), nurseId, nowIso,
      );
      c.record.doses.forEach((d, i) => dose.run(`${caseId}-d${i}`, caseId, drugIdByName.get(d.drug) ?? null, d.drug, d.drugClass ?? 'other', d.amount, d.unit, d.route, at(d.t), at(d.t), nurseId));
      c.record.interventions.forEach((x, i) => iv.run(`${caseId}-i${i}`, caseId, x.kind, at(x.t), x.note ?? null, at(x.t), nurseId));
      c.record.events.forEach((e, i) => ev.run(`${caseId}-e${i}`, caseId, e.kind, at(e.t), at(e.t), nurseId));
      c.manualVitals.forEach((v, i) => mv.run(`${caseId}-v${i}`, caseId, at(v.t), v.sbp, v.dbp, v.hr, at(v.t), nurseId));
      c.aldrete.forEach((r, i) => rs.run(`${caseId}-r${i}`, caseId, at(r.t), r.activity, r.respiration, r.circulation, r.consciousness, r.spo2, r.total, at(r.t), nurseId));
      for (const series of c.record.series) {
        const off = series.probeOff;
        for (let i = 0; i < series.t.length; i++) {
          sm.run(caseId, series.channel, startMs + Math.round(series.t[i] * 1000), series.v[i], series.source, off && off[i] ? 1 : 0);
        }
        samples += series.t.length;
      }
    }
    appendAuditRaw(raw, { at: s.now, action: 'seed', entity: 'unit', entityId: s.unit.id, after: { cases: s.cases.length, samples } });
  });
  tx();
  return { cases: s.cases.length, samples };
}

function localDateOf(at: Date, timeZone: string): string {
  const parts = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).formatToParts(at);
  const get = (t: string) => parts.find((p) => p.type === t)?.value ?? '';
  return `${get('year')}-${get('month')}-${get('day')}`;
}
