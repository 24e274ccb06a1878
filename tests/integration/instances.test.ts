/**
 * Two app instances on one database, as behind a reverse proxy (docs/scale.md): a session made
 * on one works on the other and ends on both; monitor samples taken in by one arrive on the
 * other's live stream; a stale edit through one is refused by the other. Nothing an instance
 * keeps in memory may decide any of it. Runs on SQLite (two processes, one file) and on
 * PostgreSQL (two processes, one server).
 */
import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Client } from '../helpers/client';
import { makeDatabase, readAccounts, startApp, testSql, type AppServer, type DemoAccount } from '../helpers/appServer';
import { buildOru, readAck } from '@/lib/ingest/hl7';

let a: AppServer;
let b: AppServer;
let nurse: DemoAccount;
const CASE = 'case-demo-0001';
const sha256 = (s: string) => createHash('sha256').update(s).digest('hex');

beforeAll(async () => {
  const d = makeDatabase({ cases: 5 });
  const q = testSql(d.target);
  await q.run(`UPDATE "Case" SET "status" = 'recovery' WHERE "status" = 'in_progress'`);
  await q.run(`UPDATE "Case" SET "status" = 'in_progress', "roomId" = 'room-1' WHERE "id" = ?`, [CASE]);
  await q.run('INSERT INTO "ApiToken" ("id", "name", "tokenHash", "scope", "createdAt") VALUES (?, ?, ?, ?, ?)', ['tok-i', 'engine', sha256('two-instances-token'), 'hl7', new Date()]);
  a = await startApp({ database: d });
  // The second instance: same build, same database, its own process and port.
  b = await startApp({ database: d });
  nurse = readAccounts(d.dir).find((x) => x.role === 'nurse')!;
}, 240_000);

afterAll(async () => {
  // Both share one database: stop b without dropping it, then a (which drops it).
  await b?.stopServerOnly();
  await a?.stop();
});

describe('two app instances on one database', () => {
  it('a nurse signs in on one instance and is signed in on the other; signing out on the second ends it on the first', async () => {
    const onA = new Client(a.url);
    await onA.signIn(nurse.username, nurse.password);
    const onB = new Client(b.url);
    (onB as unknown as { cookie: string }).cookie = (onA as unknown as { cookie: string }).cookie;
    const me = await onB.get('/api/v1/me');
    expect(me.status).toBe(200);
    expect(me.json.username).toBe(nurse.username);
    expect((await onB.req('DELETE', '/api/v1/session', undefined, { origin: b.url })).status).toBeLessThan(300);
    expect((await onA.get('/api/v1/me')).status).toBe(401);
  });

  it('samples sent to one instance arrive on the live stream of the other within a few seconds', async () => {
    const viewer = new Client(b.url);
    await viewer.signIn(nurse.username, nurse.password);
    const res = await fetch(`${b.url}/api/v1/cases/${CASE}/live`, { headers: { cookie: (viewer as unknown as { cookie: string }).cookie } });
    expect(res.status).toBe(200);
    const reader = res.body!.getReader();
    const dec = new TextDecoder();
    let text = '';
    // Wait for the stream to start before sending, so the samples are new to it.
    while (!text.includes('event: ready')) text += dec.decode((await reader.read()).value);
    // An instant no seeded sample has, so both samples are new.
    const msg = buildOru({ controlId: 'TWO-1', at: new Date(Date.UTC(2031, 0, 2, 3, 4, 5)), sendingFacility: 'ENGINE', location: 'KB-ROOM-1', values: { etco2: 44, rr: 9 } });
    const sent = await fetch(`${a.url}/api/v1/hl7`, { method: 'POST', headers: { authorization: 'Bearer two-instances-token', 'content-type': 'text/plain' }, body: msg });
    const ack = readAck(await sent.text());
    expect([ack.code, ack.text]).toEqual(['AA', '2 samples stored']);
    const deadline = Date.now() + 8000;
    // One read in flight at a time: a read that lost the race to the timer still gets the next chunk.
    let pending = reader.read();
    while (!text.includes('event: samples') && Date.now() < deadline) {
      const chunk = await Promise.race([pending, new Promise<null>((r) => setTimeout(() => r(null), 500))]);
      if (chunk) {
        if (chunk.value) text += dec.decode(chunk.value);
        pending = reader.read();
      }
    }
    await reader.cancel();
    const data = text.split('\n').find((l) => l.startsWith('data: {"samples"'));
    expect(data, `the stream on b after the message to a:\n${text}`).toBeDefined();
    const samples = JSON.parse(data!.slice(6)).samples as { channel: string; value: number }[];
    expect(samples.map((s) => `${s.channel}=${s.value}`).sort()).toEqual(['etco2=44', 'rr=9']);
  });

  it('an edit made through one instance makes a stale edit through the other a conflict', async () => {
    const one = new Client(a.url);
    const two = new Client(b.url);
    await one.signIn(nurse.username, nurse.password);
    await two.signIn(nurse.username, nurse.password);
    const sheet = await one.get(`/api/v1/cases/${CASE}/sheet`);
    expect(sheet.status).toBe(200);
    const seen = sheet.json.case.weightKg;
    const first = await one.req('PATCH', `/api/v1/cases/${CASE}`, { changes: { weightKg: { from: seen, to: 81 } } }, { origin: a.url });
    expect(first.status).toBe(200);
    const stale = await two.req('PATCH', `/api/v1/cases/${CASE}`, { changes: { weightKg: { from: seen, to: 77 } } }, { origin: b.url });
    expect(stale.status).toBe(409);
    expect(stale.json.error).toMatch(/changes\.weightKg: changed by someone else/);
  });
});
