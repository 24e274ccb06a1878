/* eslint-disable @typescript-eslint/no-explicit-any -- JSON responses of many shapes */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startApp, testSql, type AppServer } from '../helpers/appServer';
import { Client } from '../helpers/client';
import { asDate, type SqlValue } from '@/lib/db/sql';
import { generateCapnogram } from '@/lib/capnogram';

let app: AppServer;
beforeAll(async () => {
  app = await startApp({ cases: 10 });
});
afterAll(async () => {
  await app?.stop();
});

/** The first row of a query on the app's database. */
async function query<T>(sql: string, ...args: SqlValue[]): Promise<T> {
  return (await testSql(app).get<T>(sql, args))!;
}
async function signedIn(role: string): Promise<Client> {
  const c = new Client(app.url);
  const a = app.account(role);
  await c.signIn(a.username, a.password);
  return c;
}

/** Ten minutes at 100 Hz: normal, one minute of rebreathing, then a 15 s flat line, then normal. */
function tenMinutes(seed = 1): string {
  const { segment } = generateCapnogram({
    rateHz: 100,
    stretches: [{ durationS: 240 }, { durationS: 60, inspired: 6 }, { durationS: 60 }, { durationS: 15, flat: true }, { durationS: 225 }],
    noiseSd: 0.4,
    seed,
  });
  const rows = ['time_s,co2_mmHg'];
  for (let i = 0; i < segment.v.length; i++) rows.push(`${(i / 100).toFixed(2)},${segment.v[i].toFixed(2)}`);
  return rows.join('\n');
}

describe('raw CO2 waveform: import, storage and the viewer', () => {
  let caseId = '';
  const text = tenMinutes();

  it('first the nurse imports a 10-minute CSV into an open case; it is stored as 10 s binary chunks aligned to the case clock', async () => {
    const c = await signedIn('nurse');
    // A new case of today, so nothing else (the demo seeds a waveform on one open case) overlaps.
    const opened = await c.post('/api/v1/cases', { patient: { mrn: 'WAVE-0001', familyName: 'Waveform', givenName: 'Wil', birthDate: '1970-06-01', sex: 'male' }, procedureType: 'bronchoscopy', roomId: 'room-4', plannedDepth: 'moderate' });
    expect(opened.status, opened.text).toBe(201);
    caseId = opened.json.id;
    const before = (await query<{ n: number }>('SELECT COUNT(*) AS "n" FROM "AuditEntry"')).n;
    const r = await c.post(`/api/v1/cases/${caseId}/waveform`, { text, fileName: 'capno.csv', rateHz: 100, unit: 'mmHg', clockOffsetS: 120 });
    expect(r.status, r.text).toBe(201);
    expect(r.json).toMatchObject({ ok: true, samples: 60000, chunks: 60, startS: 120, endS: 720, badValues: 0 });
    expect(r.json.breaths).toBeGreaterThan(130);
    const start = asDate((await query<{ startAt: unknown }>('SELECT "startAt" FROM "Case" WHERE "id" = ?', caseId)).startAt).getTime();
    const first = await query<any>(`SELECT "startMs", "rateHz", "count", length("data") AS "bytes", "source" FROM "WaveformChunk" WHERE "caseId" = ? ORDER BY "startMs" LIMIT 1`, caseId);
    expect(first).toEqual({ startMs: start + 120_000, rateHz: 100, count: 1000, bytes: 4000, source: 'csv' });
    expect(await query<any>('SELECT "fileName", "rateHz", "samples" FROM "WaveformImport" WHERE "caseId" = ?', caseId)).toEqual({ fileName: 'capno.csv', rateHz: 100, samples: 60000 });
    expect((await query<{ n: number }>('SELECT COUNT(*) AS "n" FROM "AuditEntry"')).n).toBe(before + 1);
    expect(await query<any>(`SELECT "action", "caseId" FROM "AuditEntry" WHERE "entity" = 'waveform_import' ORDER BY "seq" DESC LIMIT 1`)).toEqual({ action: 'import', caseId });
  });

  it('then the same file again is refused and nothing is added', async () => {
    const c = await signedIn('nurse');
    const r = await c.post(`/api/v1/cases/${caseId}/waveform`, { text, fileName: 'again.csv', rateHz: 100, unit: 'mmHg', clockOffsetS: 120 });
    expect(r.status).toBe(409);
    expect(r.json.error).toMatch(/already imported/);
    expect((await query<{ n: number }>('SELECT COUNT(*) AS "n" FROM "WaveformChunk" WHERE "caseId" = ?', caseId)).n).toBe(60);
  });

  it('refuses a wrong stated rate, an overlap and a bad body, naming the field', async () => {
    const c = await signedIn('nurse');
    const other = tenMinutes(2);
    const wrong = await c.post(`/api/v1/cases/${caseId}/waveform`, { text: other, fileName: 'x.csv', rateHz: 50, unit: 'mmHg', clockOffsetS: 2000 });
    expect(wrong.status).toBe(422);
    expect(wrong.json.field).toBe('rateHz');
    const overlap = await c.post(`/api/v1/cases/${caseId}/waveform`, { text: other, fileName: 'x.csv', rateHz: 100, unit: 'mmHg', clockOffsetS: 300 });
    expect(overlap.status).toBe(409);
    const bad = await c.post(`/api/v1/cases/${caseId}/waveform`, { text: other, fileName: 'x.csv', rateHz: 1000, unit: 'mmHg' });
    expect(bad.status).toBe(422);
    expect(bad.json.error).toMatch(/rateHz/);
  });

  it('the viewer API returns a window with breaths and the findings computed on the fly', async () => {
    const c = await signedIn('lead');
    const r = await c.get(`/api/v1/cases/${caseId}/waveform?from=360&to=420&points=8000`);
    expect(r.status, r.text).toBe(200);
    expect(r.json.coverage).toEqual([{ startS: 120, endS: 720, rateHz: 100 }]);
    expect(r.json.points.t.length).toBe(6000);
    expect(r.json.downsampled).toBe(false);
    expect(r.json.breaths.length).toBeGreaterThan(5);
    const kinds = r.json.findings.map((f: any) => f.kind);
    expect(kinds).toContain('rebreathing');
    expect(kinds).toContain('sudden_zero');
    const zero = r.json.findings.find((f: any) => f.kind === 'sudden_zero');
    expect(zero.startS).toBeGreaterThan(475);
    expect(zero.endS).toBeLessThan(500);
    const wide = await c.get(`/api/v1/cases/${caseId}/waveform?from=0&to=900&points=2000`);
    expect(wide.json.downsampled).toBe(true);
    expect(wide.json.points.t.length).toBeLessThanOrEqual(2000);
    const backwards = await c.get(`/api/v1/cases/${caseId}/waveform?from=400&to=300`);
    expect(backwards.status).toBe(422);
  });

  it('shows the viewer page to the nurse, and keeps the admin from importing', async () => {
    const nurse = await signedIn('nurse');
    const page = await nurse.req('GET', `/cases/${caseId}/waveform`);
    expect(page.status).toBe(200);
    expect(page.text).toContain('CO2 waveform');
    const admin = await signedIn('admin');
    const r = await admin.post(`/api/v1/cases/${caseId}/waveform`, { text: tenMinutes(3), fileName: 'y.csv', rateHz: 100, unit: 'mmHg', clockOffsetS: 5000 });
    expect(r.status).toBe(403);
    const anon = new Client(app.url);
    expect((await anon.get(`/api/v1/cases/${caseId}/waveform`)).status).toBe(401);
  });
});
