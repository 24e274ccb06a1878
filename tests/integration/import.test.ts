/* eslint-disable @typescript-eslint/no-explicit-any -- JSON responses of many shapes */
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startApp, testSql, type AppServer } from '../helpers/appServer';
import { Client } from '../helpers/client';
import { asDate, type SqlValue } from '@/lib/db/sql';
import { APNEA, HOUR_ROWS, HOUR_VALUES } from '../fixtures/csv/generate';

let app: AppServer;

beforeAll(async () => {
  app = await startApp({ cases: 30 });
});
afterAll(async () => {
  await app?.stop();
});

const FIXTURES = path.resolve(__dirname, '..', 'fixtures', 'csv');
const fixture = (name: string) => fs.readFileSync(path.join(FIXTURES, name));
const HOUR_CHANNELS = [
  { column: 'EtCO2 (mmHg)', channel: 'etco2', unit: 'mmHg' },
  { column: 'awRR', channel: 'rr', unit: '/min' },
  { column: 'SpO2 (%)', channel: 'spo2', unit: '%' },
  { column: 'HR', channel: 'hr', unit: '/min' },
];

/** The first row of a query on the app's database. */
async function query<T>(sql: string, ...args: SqlValue[]): Promise<T> {
  return (await testSql(app).get<T>(sql, args))!;
}
const counts = async () => ({
  samples: (await query<{ n: number }>('SELECT COUNT(*) AS "n" FROM "Sample"')).n,
  imports: (await query<{ n: number }>('SELECT COUNT(*) AS "n" FROM "SampleImport"')).n,
  audit: (await query<{ n: number }>('SELECT COUNT(*) AS "n" FROM "AuditEntry"')).n,
});

/** A signed-in client, and its cookie for multipart requests the JSON client cannot send. */
async function signedIn(role: string): Promise<{ c: Client; cookie: string }> {
  const a = app.account(role);
  const r = await fetch(`${app.url}/api/v1/session`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ username: a.username, password: a.password }) });
  expect(r.status).toBe(200);
  const cookie = r.headers.getSetCookie().find((x) => x.startsWith('plateau_session='))!.split(';')[0];
  const c = new Client(app.url);
  await c.signIn(a.username, a.password);
  return { c, cookie };
}

async function postFile(cookie: string, url: string, file: Buffer, name: string, mapping?: unknown) {
  const form = new FormData();
  form.set('file', new File([new Uint8Array(file)], name, { type: 'text/csv' }));
  if (mapping !== undefined) form.set('mapping', JSON.stringify(mapping));
  const r = await fetch(app.url + url, { method: 'POST', headers: { cookie }, body: form });
  const text = await r.text();
  let json: any = null;
  try {
    json = JSON.parse(text);
  } catch {
    /* not JSON */
  }
  return { status: r.status, json, text };
}

/** An unsigned case of today, preferring one without samples; with a clock offset that puts a one-hour file after any samples it has. */
async function openCase(c: Client): Promise<{ id: string; startMs: number; offsetS: number }> {
  const list = await c.get('/api/v1/cases');
  expect(list.status).toBe(200);
  const open = list.json.cases.filter((x: { status: string }) => x.status !== 'signed');
  expect(open.length, 'the demo has an unsigned case today').toBeGreaterThan(0);
  const withCounts = await Promise.all(open.map(async (x: { id: string }) => ({ id: x.id, n: (await c.get(`/api/v1/cases/${x.id}`)).json._count.samples as number })));
  const pick = withCounts.sort((a, b) => a.n - b.n)[0];
  const row = await query<{ startAt: unknown; last: number | null }>('SELECT c."startAt", (SELECT MAX(s."atMs") FROM "Sample" s WHERE s."caseId" = c."id") AS "last" FROM "Case" c WHERE c."id" = ?', pick.id);
  const startMs = asDate(row.startAt).getTime();
  const offsetS = row.last === null ? 0 : Math.ceil((row.last - startMs) / 1000) + 60;
  return { id: pick.id, startMs, offsetS };
}

describe('monitor CSV import: a nurse previews, then imports', () => {
  let target: { id: string; startMs: number; offsetS: number };
  let nurse: { c: Client; cookie: string };
  const hour = fixture('monitor-apnea.csv');
  let importId = '';

  beforeAll(async () => {
    nurse = await signedIn('nurse');
    target = await openCase(nurse.c);
  });

  it('previews the one-hour file: suggested mapping, series thinned for a chart, nothing written', async () => {
    const before = await counts();
    const r = await postFile(nurse.cookie, `/api/v1/cases/${target.id}/imports/preview`, hour, 'monitor-apnea.csv');
    expect(r.status, r.text).toBe(200);
    expect(r.json).toMatchObject({ ok: true, fileName: 'monitor-apnea.csv', rows: HOUR_ROWS, samples: HOUR_VALUES, firstAt: 0, lastAt: 3599 });
    expect(r.json.mapping).toEqual({ timeColumn: 'Time (s)', timeFormat: 'seconds', channels: HOUR_CHANNELS });
    expect(r.json.inspection.columns).toEqual(['Time (s)', 'EtCO2 (mmHg)', 'awRR', 'SpO2 (%)', 'HR']);
    expect(r.json.series.map((s: any) => [s.channel, s.samples, s.min])).toEqual([
      ['etco2', 3600, 0],
      ['rr', 3600, 0],
      ['spo2', 3590, 88],
      ['hr', 3600, expect.any(Number)],
    ]);
    for (const s of r.json.series) expect(s.points.t.length).toBeLessThanOrEqual(1000);
    // JSON {text, mapping} gives the same preview, here aligned with clockOffsetS.
    const json = await nurse.c.post(`/api/v1/cases/${target.id}/imports/preview`, { text: hour.toString('utf8'), mapping: { ...r.json.mapping, clockOffsetS: target.offsetS } });
    expect(json.status).toBe(200);
    expect(json.json.firstAt).toBe(target.offsetS);
    expect(await counts()).toEqual(before);
  });

  it('imports it atomically: the stored samples equal the file\'s non-empty cells, with the import row and an audit entry', async () => {
    const before = await counts();
    const mapping = { timeColumn: 'Time (s)', timeFormat: 'seconds', channels: HOUR_CHANNELS, clockOffsetS: target.offsetS };
    const t0 = performance.now();
    const r = await postFile(nurse.cookie, `/api/v1/cases/${target.id}/imports`, hour, 'monitor-apnea.csv', mapping);
    const ms = performance.now() - t0;
    console.log(`import: one-hour 1 Hz file (${HOUR_ROWS} rows, ${HOUR_VALUES} values) imported through POST /api/v1/cases/[id]/imports in ${ms.toFixed(0)} ms (round trip: upload, parse, hash, insert, audit)`);
    expect(r.status, r.text).toBe(201);
    expect(r.json).toMatchObject({ ok: true, rows: HOUR_ROWS, samples: HOUR_VALUES, skipped: 0, fileName: 'monitor-apnea.csv' });
    expect(r.json.byChannel).toEqual({ etco2: { inserted: 3600, skipped: 0 }, rr: { inserted: 3600, skipped: 0 }, spo2: { inserted: 3590, skipped: 0 }, hr: { inserted: 3600, skipped: 0 } });
    importId = r.json.importId;
    expect(r.json.fileHash).toBe(createHash('sha256').update(hour).digest('hex'));

    expect((await query<{ n: number }>('SELECT COUNT(*) AS "n" FROM "Sample" WHERE "importId" = ?', importId)).n).toBe(HOUR_VALUES);
    expect(await counts()).toEqual({ samples: before.samples + HOUR_VALUES, imports: before.imports + 1, audit: before.audit + 1 });
    const imp = await query<any>('SELECT "caseId", "fileHash", "fileName", "rows", "samples" FROM "SampleImport" WHERE "id" = ?', importId);
    expect(imp).toEqual({ caseId: target.id, fileHash: r.json.fileHash, fileName: 'monitor-apnea.csv', rows: HOUR_ROWS, samples: HOUR_VALUES });
    const audit = await query<any>(`SELECT "action", "entity", "entityId", "caseId", "after" FROM "AuditEntry" WHERE "entity" = 'sample_import' ORDER BY "seq" DESC LIMIT 1`);
    expect(audit).toMatchObject({ action: 'import', entityId: importId, caseId: target.id });
    expect(JSON.parse(audit.after)).toMatchObject({ samples: HOUR_VALUES, skipped: 0, rows: HOUR_ROWS });

    // Instants: case start + (t + offset)·1000, source monitor; the apnoea is where the file put it.
    const span = await query<{ lo: number; hi: number; src: string }>(`SELECT MIN("atMs") AS "lo", MAX("atMs") AS "hi", MIN("source") AS "src" FROM "Sample" WHERE "importId" = ? AND "channel" = 'etco2'`, importId);
    expect(span).toEqual({ lo: target.startMs + target.offsetS * 1000, hi: target.startMs + (target.offsetS + 3599) * 1000, src: 'monitor' });
    const apnea = await query<{ n: number; first: number }>(`SELECT COUNT(*) AS "n", MIN("atMs") AS "first" FROM "Sample" WHERE "importId" = ? AND "channel" = 'etco2' AND "value" < 5`, importId);
    expect(apnea).toEqual({ n: APNEA.seconds, first: target.startMs + (target.offsetS + APNEA.from) * 1000 });
  });

  it('refuses the same file a second time with 409 and adds nothing (multipart or JSON, any mapping)', async () => {
    expect(importId).not.toBe('');
    const before = await counts();
    const again = await postFile(nurse.cookie, `/api/v1/cases/${target.id}/imports`, hour, 'renamed.csv', { timeColumn: 'Time (s)', timeFormat: 'seconds', channels: HOUR_CHANNELS, clockOffsetS: target.offsetS + 7200 });
    expect(again.status).toBe(409);
    expect(again.json).toMatchObject({ ok: false, importId, error: expect.stringMatching(/already imported into this case \(as "monitor-apnea.csv"/) });
    const json = await nurse.c.post(`/api/v1/cases/${target.id}/imports`, { text: hour.toString('utf8'), mapping: { timeColumn: 'Time (s)', timeFormat: 'seconds', channels: HOUR_CHANNELS } });
    expect(json.status).toBe(409);
    expect(await counts()).toEqual(before);
  });

  it('skips samples at instants the case already has, keeping the stored values, and reports how many', async () => {
    const existing = await query<{ atMs: number; value: number }>(`SELECT "atMs", "value" FROM "Sample" WHERE "importId" = ? AND "channel" = 'hr' ORDER BY "atMs" LIMIT 1`, importId);
    const csv = `timestamp,HR\n${existing.atMs},150\n${existing.atMs + 500},151\n`;
    const before = await counts();
    const r = await nurse.c.post(`/api/v1/cases/${target.id}/imports`, { text: csv, fileName: 'overlap.csv', mapping: { timeColumn: 'timestamp', timeFormat: 'epoch_ms', channels: [{ column: 'HR', channel: 'hr', unit: '/min' }] } });
    expect(r.status, r.text).toBe(201);
    expect(r.json).toMatchObject({ samples: 1, skipped: 1, byChannel: { hr: { inserted: 1, skipped: 1 } } });
    expect((await query<{ value: number }>(`SELECT "value" FROM "Sample" WHERE "caseId" = ? AND "channel" = 'hr' AND "source" = 'monitor' AND "atMs" = ?`, target.id, existing.atMs)).value).toBe(existing.value);
    expect(await counts()).toEqual({ samples: before.samples + 1, imports: before.imports + 1, audit: before.audit + 1 });
  });
});

describe('monitor CSV import: refusals', () => {
  const malformed: { file: string; mapping: unknown; expect: { row: number; column: string | null; message: RegExp }[] }[] = [
    {
      file: 'missing-time-column.csv',
      mapping: { timeColumn: 'Time (s)', timeFormat: 'seconds', channels: HOUR_CHANNELS },
      expect: [{ row: 1, column: 'Time (s)', message: /the time column "Time \(s\)" is not in the header/ }],
    },
    {
      file: 'text-in-number.csv',
      mapping: { timeColumn: 'Time (s)', timeFormat: 'seconds', channels: HOUR_CHANNELS },
      expect: [
        { row: 4, column: 'awRR', message: /"fourteen" is not a number/ },
        { row: 6, column: 'HR', message: /"7O" is not a number/ },
      ],
    },
    {
      file: 'times-backwards.csv',
      mapping: { timeColumn: 'Time', timeFormat: 'iso_offset', channels: HOUR_CHANNELS },
      expect: [{ row: 5, column: 'Time', message: /time goes backwards/ }],
    },
    {
      file: 'kpa-label-mmhg-values.csv',
      mapping: { timeColumn: 'Time (s)', timeFormat: 'seconds', channels: [{ column: 'EtCO2 (kPa)', channel: 'etco2', unit: 'kPa' }, { column: 'awRR', channel: 'rr', unit: '/min' }] },
      expect: [
        { row: 2, column: 'EtCO2 (kPa)', message: /38 kPa \(285.02 mmHg\) is outside 0–150 mmHg; are these mmHg values labelled kPa\?/ },
        { row: 3, column: 'EtCO2 (kPa)', message: /outside/ },
        { row: 5, column: 'EtCO2 (kPa)', message: /outside/ },
      ],
    },
  ];

  for (const m of malformed) {
    it(`refuses ${m.file} with 422, naming rows and columns, and saves nothing`, async () => {
      const { c, cookie } = await signedIn('nurse');
      const target = await openCase(c);
      const before = await counts();
      const preview = await postFile(cookie, `/api/v1/cases/${target.id}/imports/preview`, fixture(m.file), m.file, m.mapping);
      expect(preview.status, preview.text).toBe(422);
      const r = await postFile(cookie, `/api/v1/cases/${target.id}/imports`, fixture(m.file), m.file, m.mapping);
      expect(r.status, r.text).toBe(422);
      for (const body of [preview.json, r.json]) {
        expect(body.errors).toHaveLength(m.expect.length);
        m.expect.forEach((e, i) => expect(body.errors[i]).toEqual({ row: e.row, column: e.column, message: expect.stringMatching(e.message) }));
        expect(body.errorCount).toBe(m.expect.length);
        expect(body.error).toMatch(new RegExp(`^file: ${m.expect.length} problems?; row ${m.expect[0].row}`));
      }
      expect(await counts()).toEqual(before);
    });
  }

  it('refuses an empty file, an import without a mapping, and a bad mapping, saving nothing', async () => {
    const { c, cookie } = await signedIn('nurse');
    const target = await openCase(c);
    const before = await counts();
    const empty = await postFile(cookie, `/api/v1/cases/${target.id}/imports`, Buffer.from(''), 'empty.csv', { timeColumn: 'Time', timeFormat: 'seconds', channels: HOUR_CHANNELS });
    expect(empty.status).toBe(422);
    expect(empty.json.errors).toEqual([{ row: 1, column: null, message: 'the file is empty' }]);
    const noMapping = await postFile(cookie, `/api/v1/cases/${target.id}/imports`, fixture('gaps.csv'), 'gaps.csv');
    expect(noMapping.status).toBe(422);
    expect(noMapping.json.error).toMatch(/mapping: is required/);
    const badUnit = await c.post(`/api/v1/cases/${target.id}/imports`, { text: 'Time (s),HR\n0,70\n', mapping: { timeColumn: 'Time (s)', timeFormat: 'seconds', channels: [{ column: 'HR', channel: 'bp', unit: '/min' }] } });
    expect(badUnit.status).toBe(422);
    expect(badUnit.json.error).toMatch(/mapping\.channels\[0\]\.channel: must be one of etco2/);
    expect(await counts()).toEqual(before);
  });

  it('refuses an import into a signed case with 409, and an unknown case with 404', async () => {
    const { c } = await signedIn('nurse');
    // Any signed demo case (today's list may have none yet early in the day).
    const signed = await query<{ id: string }>(`SELECT "id" FROM "Case" WHERE "status" = 'signed' ORDER BY "id" LIMIT 1`);
    const before = await counts();
    const body = { text: fixture('gaps.csv').toString('utf8'), mapping: { timeColumn: 'Time (s)', timeFormat: 'seconds', channels: HOUR_CHANNELS } };
    const r = await c.post(`/api/v1/cases/${signed.id}/imports`, body);
    expect(r.status).toBe(409);
    expect(r.json.error).toMatch(/the note is signed/);
    expect((await c.post('/api/v1/cases/no-such-case/imports', body)).status).toBe(404);
    expect((await c.post('/api/v1/cases/no-such-case/imports/preview', body)).status).toBe(404);
    expect(await counts()).toEqual(before);
  });

  it('refuses an upload over 20 MB with 413 and a clear message', async () => {
    const { c, cookie } = await signedIn('nurse');
    const target = await openCase(c);
    const big = Buffer.alloc(21 * 1024 * 1024, 'a');
    const r = await postFile(cookie, `/api/v1/cases/${target.id}/imports`, big, 'big.csv', { timeColumn: 'Time (s)', timeFormat: 'seconds', channels: HOUR_CHANNELS });
    expect(r.status).toBe(413);
    expect(r.json.error).toMatch(/file: larger than 20 MB/);
  });

  it('refuses a safety officer with 403 on preview and import, and saves nothing', async () => {
    const nurse = await signedIn('nurse');
    const target = await openCase(nurse.c);
    const { cookie } = await signedIn('safety');
    const before = await counts();
    const mapping = { timeColumn: 'Time (s)', timeFormat: 'seconds', channels: HOUR_CHANNELS };
    expect((await postFile(cookie, `/api/v1/cases/${target.id}/imports/preview`, fixture('gaps.csv'), 'gaps.csv', mapping)).status).toBe(403);
    expect((await postFile(cookie, `/api/v1/cases/${target.id}/imports`, fixture('gaps.csv'), 'gaps.csv', mapping)).status).toBe(403);
    expect(await counts()).toEqual(before);
  });

  it('refuses an import sent from another site (Origin check)', async () => {
    const { c } = await signedIn('nurse');
    const target = await openCase(c);
    const r = await c.post(`/api/v1/cases/${target.id}/imports`, { text: 'Time (s),HR\n0,70\n', mapping: { timeColumn: 'Time (s)', timeFormat: 'seconds', channels: [{ column: 'HR', channel: 'hr', unit: '/min' }] } }, { origin: 'https://evil.example' });
    expect(r.status).toBe(403);
  });
});
