import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startApp, testSql, type AppServer } from '../helpers/appServer';
import { Client } from '../helpers/client';
import { asBool, type SqlValue } from '@/lib/db/sql';

let app: AppServer;
beforeAll(async () => {
  app = await startApp({ cases: 20 });
});
afterAll(async () => {
  await app?.stop();
});

/** The first row of a query on the app's database. */
const q = async <T,>(sql: string, ...args: SqlValue[]): Promise<T> => (await testSql(app).get<T>(sql, args))!;

async function nurse(which = 0) {
  const accounts = app.accounts.filter((a) => a.role === 'nurse');
  const c = new Client(app.url);
  await c.signIn(accounts[which].username, accounts[which].password);
  return c;
}

async function newCase(c: Client) {
  const mrn = `T-${randomUUID().slice(0, 8)}`;
  const r = await c.post('/api/v1/cases', {
    patient: { mrn, familyName: 'Testperson', givenName: 'Alex', birthDate: '1960-05-04', sex: 'female' },
    procedureType: 'colonoscopy',
    roomId: 'room-1',
    plannedDepth: 'moderate',
    asaClass: 'II',
    weightKg: 80,
    heightCm: 170,
    stopBang: { snoring: true, tired: false, observed: false, pressure: true, neck: false },
  });
  expect(r.status, r.text).toBe(201);
  return r.json.id as string;
}

const entry = (c: Client, caseId: string, body: Record<string, unknown>) => c.post(`/api/v1/cases/${caseId}/entries`, { id: randomUUID(), at: new Date().toISOString(), ...body });

describe('the bedside record', () => {
  it('opens a case for a new patient, and refuses a record number that already exists', async () => {
    const c = await nurse();
    const id = await newCase(c);
    const row = await q<{ status: string; weightKg: number; sbSnoring: unknown }>('SELECT "status", "weightKg", "sbSnoring" FROM "Case" WHERE "id" = ?', id);
    expect({ ...row, sbSnoring: asBool(row.sbSnoring) }).toEqual({ status: 'draft', weightKg: 80, sbSnoring: true });
    const mrn = (await q<{ mrn: string }>('SELECT p."mrn" FROM "Patient" p JOIN "Case" c ON c."patientId" = p."id" WHERE c."id" = ?', id)).mrn;
    const before = (await q<{ n: number }>('SELECT COUNT(*) AS "n" FROM "Case"')).n;
    const dup = await c.post('/api/v1/cases', { patient: { mrn, familyName: 'Other', givenName: 'X', birthDate: '1970-01-01', sex: 'male' }, procedureType: 'gastroscopy', roomId: 'room-1', plannedDepth: 'moderate' });
    expect(dup.status).toBe(409);
    expect(dup.json.error).toMatch(/patient\.mrn: record number .* already belongs/);
    const bad = await c.post('/api/v1/cases', { patientId: 'nope', procedureType: 'gastroscopy', roomId: 'room-1', plannedDepth: 'sleepy', weightKg: -3 });
    expect(bad.status).toBe(422);
    expect(bad.json.error).toMatch(/plannedDepth: choose the planned depth/);
    expect(bad.json.error).toMatch(/weightKg: must be at least 1 kg/);
    expect((await q<{ n: number }>('SELECT COUNT(*) AS "n" FROM "Case"')).n).toBe(before);
  });

  it('moves the case to "under sedation" at sedation start and to recovery at recovery start', async () => {
    const c = await nurse();
    const id = await newCase(c);
    expect((await entry(c, id, { type: 'event', kind: 'sedation_start' })).json.status).toBe('in_progress');
    expect((await entry(c, id, { type: 'event', kind: 'recovery_start' })).json.status).toBe('recovery');
  });

  it('stores every kind of entry once, even when the device sends it twice', async () => {
    const c = await nurse();
    const id = await newCase(c);
    const bodies = [
      { type: 'dose', drugId: 'drug-propofol', amount: 50, unit: 'mg', route: 'IV' },
      { type: 'intervention', kind: 'jaw_thrust', note: 'brief' },
      { type: 'vital', sbp: 120, dbp: 70, hr: 72, sedationScore: 3 },
      { type: 'recovery', activity: 2, respiration: 2, circulation: 2, consciousness: 1, oxygenation: 2 },
    ];
    for (const b of bodies) {
      const full = { id: randomUUID(), at: new Date().toISOString(), ...b };
      expect((await c.post(`/api/v1/cases/${id}/entries`, full)).status).toBe(201);
      expect((await c.post(`/api/v1/cases/${id}/entries`, full)).status).toBe(200);
    }
    expect((await q<{ n: number }>('SELECT COUNT(*) AS "n" FROM "Dose" WHERE "caseId" = ?', id)).n).toBe(1);
    expect((await q<{ n: number }>('SELECT COUNT(*) AS "n" FROM "Intervention" WHERE "caseId" = ?', id)).n).toBe(1);
    expect((await q<{ n: number }>('SELECT COUNT(*) AS "n" FROM "ManualVital" WHERE "caseId" = ?', id)).n).toBe(1);
    expect((await q<{ total: number }>('SELECT "total" FROM "RecoveryScore" WHERE "caseId" = ?', id)).total).toBe(9);
  });

  it('voids a wrong dose with a reason and keeps it visible in the history, and refuses a second, different void', async () => {
    const c = await nurse();
    const id = await newCase(c);
    const doseId = randomUUID();
    await c.post(`/api/v1/cases/${id}/entries`, { type: 'dose', id: doseId, at: new Date().toISOString(), drugId: 'drug-midazolam', amount: 5, unit: 'mg', route: 'IV' });
    const noReason = await entry(c, id, { type: 'void', target: 'dose', targetId: doseId, reason: '' });
    expect(noReason.status).toBe(422);
    expect(noReason.json.error).toMatch(/reason: say why/);
    expect((await entry(c, id, { type: 'void', target: 'dose', targetId: doseId, reason: 'wrong drug' })).status).toBe(201);
    const other = await nurse(1);
    const second = await entry(other, id, { type: 'void', target: 'dose', targetId: doseId, reason: 'duplicate' });
    expect(second.status).toBe(409);
    expect(second.json.error).toMatch(/already voided \(wrong drug\)/);
    const sheet = await c.get(`/api/v1/cases/${id}/sheet`);
    const d = sheet.json.doses.find((x: { id: string }) => x.id === doseId);
    expect(d.voided.reason).toBe('wrong drug');
    expect((await q<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "AuditEntry" WHERE "action" = 'void' AND "entityId" = ?`, doseId)).n).toBe(1);
  });

  it('re-times an intervention "2 min ago": the old entry is voided, the new one replaces it', async () => {
    const c = await nurse();
    const id = await newCase(c);
    const ivId = randomUUID();
    const at = new Date();
    await c.post(`/api/v1/cases/${id}/entries`, { type: 'intervention', id: ivId, at: at.toISOString(), kind: 'chin_lift' });
    const newAt = new Date(at.getTime() - 120_000).toISOString();
    const r = await entry(c, id, { type: 'retime', target: 'intervention', targetId: ivId, newAt });
    expect(r.status).toBe(201);
    const sheet = (await c.get(`/api/v1/cases/${id}/sheet`)).json;
    const live = sheet.interventions.filter((x: { voided: unknown }) => !x.voided);
    expect(live).toHaveLength(1);
    expect(live[0].at).toBe(newAt);
    expect(live[0].replacesId).toBe(ivId);
    const again = await entry(c, id, { type: 'retime', target: 'intervention', targetId: ivId, newAt });
    expect(again.status).toBe(409);
  });

  it('two nurses on one case see each other\'s entries', async () => {
    const a = await nurse(0);
    const b = await nurse(1);
    const id = await newCase(a);
    await entry(a, id, { type: 'dose', drugId: 'drug-fentanyl', amount: 50, unit: 'mcg', route: 'IV' });
    await entry(b, id, { type: 'intervention', kind: 'stimulation' });
    const seenByA = (await a.get(`/api/v1/cases/${id}/sheet`)).json;
    const seenByB = (await b.get(`/api/v1/cases/${id}/sheet`)).json;
    for (const s of [seenByA, seenByB]) {
      expect(s.doses).toHaveLength(1);
      expect(s.interventions).toHaveLength(1);
    }
    expect(seenByA.interventions[0].by).not.toBe(seenByA.doses[0].by);
  });

  it('refuses an edit of a field someone else changed meanwhile, by name, and keeps their value', async () => {
    const a = await nurse(0);
    const b = await nurse(1);
    const id = await newCase(a);
    const first = await a.req('PATCH', `/api/v1/cases/${id}`, { changes: { weightKg: { from: 80, to: 82 } } });
    expect(first.status, first.text).toBe(200);
    // b still saw 80 kg: their edit of the weight is refused, naming the field; nothing is written.
    const stale = await b.req('PATCH', `/api/v1/cases/${id}`, { changes: { weightKg: { from: 80, to: 79 }, allergies: { from: null, to: 'latex' } } });
    expect(stale.status).toBe(409);
    expect(stale.json.error).toMatch(/changes\.weightKg: changed by someone else/);
    const row = await q<{ weightKg: number; allergies: string | null }>('SELECT "weightKg", "allergies" FROM "Case" WHERE "id" = ?', id);
    expect(row).toEqual({ weightKg: 82, allergies: null });
    // A different field is not a conflict.
    const other = await b.req('PATCH', `/api/v1/cases/${id}`, { changes: { allergies: { from: null, to: 'latex' } } });
    expect(other.status).toBe(200);
    const bad = await b.req('PATCH', `/api/v1/cases/${id}`, { changes: { weightKg: { from: 82, to: -1 } } });
    expect(bad.status).toBe(422);
    expect(bad.json.error).toMatch(/changes\.weightKg: must be at least 1 kg/);
    const forbidden = await b.req('PATCH', `/api/v1/cases/${id}`, { changes: { status: { from: 'draft', to: 'signed' } } });
    expect(forbidden.status).toBe(422);
  });

  it('stores a blood gas entered in kPa as mmHg (1 kPa = 7.50062 mmHg), and refuses one out of range for its unit', async () => {
    const c = await nurse();
    const id = await newCase(c);
    const ok = await entry(c, id, { type: 'blood_gas', paco2: 6.2, unit: 'kPa', ph: 7.31, sampleType: 'arterial' });
    expect(ok.status, ok.text).toBe(201);
    expect(await q<{ paco2: number; enteredUnit: string }>('SELECT "paco2", "enteredUnit" FROM "BloodGas" WHERE "caseId" = ?', id)).toEqual({ paco2: 46.5, enteredUnit: 'kPa' });
    const bad = await entry(c, id, { type: 'blood_gas', paco2: 45, unit: 'kPa' });
    expect(bad.status).toBe(422);
    expect(bad.json.error).toMatch(/paco2: is out of range for the unit/);
    const sheet = (await c.get(`/api/v1/cases/${id}/sheet`)).json;
    expect(sheet.bloodGases).toHaveLength(1);
  });

  it('refuses malformed entries with the field named, and writes nothing', async () => {
    const c = await nurse();
    const id = await newCase(c);
    const audit = async () => (await q<{ n: number }>('SELECT COUNT(*) AS "n" FROM "AuditEntry"')).n;
    const before = await audit();
    const bad: [Record<string, unknown>, RegExp][] = [
      [{ type: 'teleport' }, /type: must be dose, intervention/],
      [{ type: 'intervention', kind: 'prayer' }, /kind: is not a known intervention/],
      [{ type: 'vital' }, /sbp: enter at least one reading/],
      [{ type: 'vital', sbp: 80, dbp: 90 }, /dbp: systolic must be above diastolic/],
      [{ type: 'vital', spo2: 140 }, /spo2: %: must be at most 100/],
      [{ type: 'recovery', activity: 3, respiration: 2, circulation: 2, consciousness: 2, oxygenation: 2 }, /activity: must be 0, 1 or 2/],
      [{ type: 'event', kind: 'lunch' }, /kind: must be one of/],
    ];
    for (const [body, msg] of bad) {
      const r = await entry(c, id, body);
      expect(r.status, JSON.stringify(body)).toBe(422);
      expect(r.json.error).toMatch(msg);
    }
    expect(await audit()).toBe(before);
  });

  it('gives the live sheet new monitor samples incrementally and the episodes from the rules', async () => {
    const c = await nurse();
    // Any demo case with monitor data (today's list may hold only cases not started yet, before 08:00).
    const done = { id: (await q<{ caseId: string }>(`SELECT "caseId" FROM "Sample" WHERE "source" = 'monitor' LIMIT 1`)).caseId };
    const full = (await c.get(`/api/v1/cases/${done.id}/sheet`)).json;
    expect(full.samples.lastId).toBeGreaterThan(0);
    expect(full.analysis.ruleSet).toEqual({ id: 'plateau-default', version: 1 });
    const none = (await c.get(`/api/v1/cases/${done.id}/sheet?after=${full.samples.lastId}`)).json;
    expect(Object.keys(none.samples.channels)).toHaveLength(0);
    const stored = (await q<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "Sample" WHERE "caseId" = ? AND "source" = 'monitor' AND "probeOff" = FALSE`, done.id)).n;
    const sent = Object.values(full.samples.channels as Record<string, { t: number[] }>).reduce((s, ch) => s + ch.t.length, 0);
    expect(sent).toBe(stored);
  });
});
