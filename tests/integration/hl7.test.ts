/**
 * The monitor feed end to end: the real simulator script sends ORU^R01 over MLLP on loopback to
 * the listener, the listener stores into a real migrated and seeded database (SQLite or
 * PostgreSQL, PLATEAU_TEST_DIALECT), and a nurse's
 * SSE stream from the real built app sees the samples. Then routing (matched, unmatched then
 * attached, duplicate), HTTP ingest with an API token, sender authentication, and a 500-message
 * fuzz over the real database where no NACKed message writes anything.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import net from 'node:net';
import path from 'node:path';
import fc from 'fast-check';
import { freePort, makeDatabase, readAccounts, ROOT, startApp, testSql, type AppServer } from '../helpers/appServer';
import { Client } from '../helpers/client';
import type { Sql, SqlValue } from '@/lib/db/sql';
import { sha256 } from '@/lib/db/hl7Store';
import { startMllpServer, type MllpServer } from '@/lib/server/mllpServer';
import { buildOru, readAck } from '@/lib/ingest/hl7';
import { MllpDecoder, mllpFrame } from '@/lib/ingest/mllp';
import { mutate, mutationArb } from '../unit/hl7/mutate';

const CASE = 'case-demo-0001';
let app: AppServer;
let q: Sql;
let mllp: MllpServer;
let nurse: Client;

/** A sender that keeps one MLLP connection and awaits each ACK. */
async function connect(port: number) {
  const sock = net.connect({ port, host: '127.0.0.1' });
  await new Promise<void>((res, rej) => {
    sock.once('connect', () => res());
    sock.once('error', rej);
  });
  const d = new MllpDecoder();
  const waiting: ((s: string) => void)[] = [];
  sock.on('data', (c) => d.push(c).forEach((e) => e.kind === 'message' && waiting.shift()?.(e.text)));
  return {
    send: (msg: string) =>
      new Promise<string>((res) => {
        waiting.push(res);
        sock.write(mllpFrame(msg));
      }),
    close: () => sock.destroy(),
  };
}

const count = async (text: string, ...a: SqlValue[]) => Number((await q.get<{ n: number }>(text, a))!.n);

beforeAll(async () => {
  const d = makeDatabase({ cases: 10 });
  q = testSql(d.target);
  // A known state: one case in progress in room 1, none in room 2; devices for both rooms.
  await q.run(`UPDATE "Case" SET "status" = 'recovery' WHERE "status" = 'in_progress'`);
  await q.run(`UPDATE "Case" SET "status" = 'in_progress', "roomId" = 'room-1' WHERE "id" = ?`, [CASE]);
  await q.run(`UPDATE "Case" SET "status" = 'draft', "roomId" = 'room-3' WHERE "id" = 'case-demo-0002'`);
  const unit = (await q.get<{ id: string }>('SELECT "id" FROM "Unit" LIMIT 1'))!.id;
  const dev = 'INSERT INTO "Device" ("id", "unitId", "roomId", "label", "keyHash", "sendingFacility", "equipmentId", "active", "createdAt") VALUES (?, ?, ?, ?, ?, ?, ?, TRUE, ?)';
  await q.run(dev, ['dev-free', unit, null, 'Monitor by facility', null, 'KB-MON', null, new Date()]);
  await q.run(dev, ['dev-key', unit, 'room-1', 'Monitor by key', sha256('secret-key-1'), null, 'EQ-1', new Date()]);
  await q.run('INSERT INTO "ApiToken" ("id", "name", "tokenHash", "scope", "createdAt") VALUES (?, ?, ?, ?, ?)', ['tok-1', 'engine', sha256('plateau-token-abc'), 'hl7', new Date()]);
  app = await startApp({ database: d });
  mllp = await startMllpServer(q, { port: await freePort(), allow: ['127.0.0.1', '::1'] });
  nurse = new Client(app.url);
  const n = readAccounts(d.dir).find((a) => a.role === 'nurse')!;
  await nurse.signIn(n.username, n.password);
}, 180_000);

afterAll(async () => {
  await mllp?.close();
  await app?.stop();
});

describe('live monitor feed over MLLP', () => {
  it('first the simulator sends three messages for room 1, then the nurse’s SSE stream shows the samples within 2 s', async () => {
    const res = await fetch(`${app.url}/api/v1/cases/${CASE}/live`, { headers: { cookie: (nurse as unknown as { cookie: string }).cookie } });
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/text\/event-stream/);
    const reader = res.body!.getReader();
    const seen: { channel: string; value: number; atMs: number }[] = [];
    let buf = '';
    const reading = (async () => {
      const dec = new TextDecoder();
      while (seen.length < 12) {
        const { value, done } = await reader.read();
        if (done) break;
        buf += dec.decode(value);
        let i;
        while ((i = buf.indexOf('\n\n')) !== -1) {
          const ev = buf.slice(0, i);
          buf = buf.slice(i + 2);
          if (ev.includes('event: samples')) seen.push(...JSON.parse(ev.split('\n').find((l) => l.startsWith('data: '))!.slice(6)).samples);
        }
      }
    })();
    const sim = spawn(path.join(ROOT, 'node_modules', '.bin', 'tsx'), [path.join(ROOT, 'scripts', 'simulate.ts'), '--room', 'room-1', '--scenario', 'apnea', '--count', '3', '--port', String(mllp.port)], { cwd: ROOT, env: app.env });
    let out = '';
    sim.stdout.on('data', (d) => (out += d));
    sim.stderr.on('data', (d) => (out += d));
    const code = await new Promise<number | null>((r) => sim.on('exit', r));
    expect(code, out).toBe(0);
    const sentAt = Date.now();
    expect(out.match(/→ AA/g)).toHaveLength(3);
    await Promise.race([reading, new Promise((r) => setTimeout(r, 5000))]);
    const lag = Date.now() - sentAt;
    await reader.cancel();
    expect(seen.length).toBe(12);
    expect(lag).toBeLessThan(2000);
    expect(new Set(seen.map((s) => s.channel))).toEqual(new Set(['etco2', 'rr', 'spo2', 'hr']));
    expect(await count(`SELECT COUNT(*) AS "n" FROM "Hl7Message" WHERE "status" = 'accepted' AND "caseId" = ?`, CASE)).toBe(3);
  });

  it('routes by the device binding when PV1-3 is missing, and a draft case gets nothing', async () => {
    const c = await connect(mllp.port);
    const at = new Date(Math.floor(Date.now() / 1000) * 1000 + 60_000);
    const byKey = buildOru({ controlId: 'K-1', at, sendingFacility: 'OTHER', deviceKey: 'secret-key-1', location: '', values: { spo2: 95 } });
    const a = readAck(await c.send(byKey));
    expect(a.code).toBe('AA');
    expect(await count('SELECT COUNT(*) AS "n" FROM "Sample" WHERE "caseId" = ? AND "atMs" = ? AND "channel" = ?', CASE, at.getTime(), 'spo2')).toBe(1);
    const draft = readAck(await c.send(buildOru({ controlId: 'D-1', at, sendingFacility: 'KB-MON', location: 'KB-ROOM-3', values: { spo2: 95 } })));
    expect(draft.text).toMatch(/no case in progress for KB-ROOM-3/);
    c.close();
  });

  it('keeps samples from a room with no open case in the inbox, and a nurse attaches them to the case by time (audited)', async () => {
    const c = await connect(mllp.port);
    const t0 = Date.UTC(2026, 11, 1, 7, 0, 0);
    for (let i = 0; i < 5; i++) {
      const ack = readAck(await c.send(buildOru({ controlId: `U-${i}`, at: new Date(t0 + i * 1000), sendingFacility: 'KB-MON', location: 'KB-ROOM-2', values: { etco2: 40 + i, spo2: 97 } })));
      expect(ack.code).toBe('AA');
    }
    c.close();
    const inbox = await nurse.get('/api/v1/hl7-inbox?roomId=room-2');
    expect(inbox.status).toBe(200);
    const ids = inbox.json.messages.map((m: { id: string }) => m.id);
    expect(ids).toHaveLength(5);
    expect(inbox.json.messages[0].samples).toBe(2);
    const r = await nurse.post('/api/v1/hl7-inbox/attach', { caseId: CASE, roomId: 'room-2', from: new Date(t0).toISOString(), to: new Date(t0 + 2000).toISOString() });
    expect(r.status, r.text).toBe(200);
    expect(r.json).toEqual({ messages: 3, stored: 6, skipped: 0 });
    const left = (await nurse.get('/api/v1/hl7-inbox?roomId=room-2')).json.messages.map((m: { id: string }) => m.id);
    expect(left).toHaveLength(2);
    const rest = await nurse.post('/api/v1/hl7-inbox/attach', { caseId: CASE, messageIds: left });
    expect(rest.json).toEqual({ messages: 2, stored: 4, skipped: 0 });
    expect(await count('SELECT COUNT(*) AS "n" FROM "Sample" WHERE "caseId" = ? AND "atMs" BETWEEN ? AND ?', CASE, t0, t0 + 4000)).toBe(10);
    expect(await count(`SELECT COUNT(*) AS "n" FROM "Hl7Message" WHERE "status" = 'attached' AND "caseId" = ?`, CASE)).toBe(5);
    expect(await count(`SELECT COUNT(*) AS "n" FROM "AuditEntry" WHERE "action" = 'hl7.attach' AND "caseId" = ?`, CASE)).toBe(2);
    expect((await nurse.post('/api/v1/hl7-inbox/attach', { caseId: CASE, messageIds: [ids[0]] })).status).toBe(409);
  });

  it('stores a duplicate once: the same control id again, and the same channel and instant under a new id, are both ACKed AA', async () => {
    const c = await connect(mllp.port);
    const at = new Date(Date.UTC(2026, 11, 1, 7, 30, 0));
    const msg = buildOru({ controlId: 'DUP-1', at, sendingFacility: 'KB-MON', location: 'KB-ROOM-1', values: { etco2: 41, hr: 70 } });
    expect(readAck(await c.send(msg)).code).toBe('AA');
    const again = readAck(await c.send(msg));
    expect(again.code).toBe('AA');
    expect(again.text).toMatch(/^duplicate of/);
    const sameInstant = readAck(await c.send(buildOru({ controlId: 'DUP-2', at, sendingFacility: 'KB-MON', location: 'KB-ROOM-1', values: { etco2: 45, hr: 71 } })));
    expect(sameInstant.code).toBe('AA');
    expect(sameInstant.text).toBe('0 samples stored');
    const rows = await q.all('SELECT "channel", "value" FROM "Sample" WHERE "caseId" = ? AND "atMs" = ? ORDER BY "channel"', [CASE, at.getTime()]);
    expect(rows).toEqual([{ channel: 'etco2', value: 41 }, { channel: 'hr', value: 70 }]);
    expect(await count(`SELECT COUNT(*) AS "n" FROM "Hl7Message" WHERE "controlId" = 'DUP-1' AND "status" = 'duplicate'`)).toBe(1);
    c.close();
  });

  it('refuses an unknown sender with AR naming MSH-4 and writes nothing', async () => {
    const c = await connect(mllp.port);
    const before = await count('SELECT COUNT(*) AS "n" FROM "Hl7Message"');
    const a = readAck(await c.send(buildOru({ controlId: 'X-1', at: new Date(), sendingFacility: 'STRANGER', location: 'KB-ROOM-1', values: { spo2: 97 } })));
    expect(a.code).toBe('AR');
    expect(a.err).toContain('MSH^1^4');
    expect(await count('SELECT COUNT(*) AS "n" FROM "Hl7Message"')).toBe(before);
    c.close();
  });

  it('closes a connection from an address outside the allow list before reading it', async () => {
    const strict = await startMllpServer(q, { port: await freePort(), allow: ['10.9.9.9'] });
    const sock = net.connect({ port: strict.port, host: '127.0.0.1' });
    const closed = await new Promise<boolean>((res) => {
      sock.on('close', () => res(true));
      sock.on('error', () => undefined);
      setTimeout(() => res(false), 2000);
    });
    expect(closed).toBe(true);
    await strict.close();
  });

  it('answers a NACK naming OBX[1]-5 for a bad value, and writes nothing', async () => {
    const c = await connect(mllp.port);
    const before = await count('SELECT COUNT(*) AS "n" FROM "Sample"');
    const bad = buildOru({ controlId: 'BAD-1', at: new Date(), sendingFacility: 'KB-MON', location: 'KB-ROOM-1', values: { spo2: 97, hr: 60 } }).replace('|97|', '|ninety|');
    const a = readAck(await c.send(bad));
    expect(a.code).toBe('AE');
    expect(a.text).toBe('OBX[1]-5: not a number ("ninety")');
    expect(a.err).toContain('OBX^1^5');
    expect(await count('SELECT COUNT(*) AS "n" FROM "Sample"')).toBe(before);
    c.close();
  });
});

describe('HL7 over HTTP', () => {
  const msg = (id: string) => buildOru({ controlId: id, at: new Date(Date.UTC(2026, 11, 1, 7, 45, 0)), sendingFacility: 'ENGINE', location: 'KB-ROOM-1', values: { etco2: 39, rr: 12 } });

  it('takes a message with an API token and answers the ACK as text', async () => {
    const r = await fetch(`${app.url}/api/v1/hl7`, { method: 'POST', headers: { authorization: 'Bearer plateau-token-abc', 'content-type': 'text/plain' }, body: msg('H-1') });
    expect(r.status).toBe(200);
    const a = readAck(await r.text());
    expect([a.code, a.controlId, a.text]).toEqual(['AA', 'H-1', '2 samples stored']);
    expect(await count(`SELECT COUNT(*) AS "n" FROM "ApiToken" WHERE "id" = 'tok-1' AND "lastUsedAt" IS NOT NULL`)).toBe(1);
  });

  it('refuses a missing or wrong token with 401, and a non-ORU message with 400 and AR naming MSH-9', async () => {
    expect((await fetch(`${app.url}/api/v1/hl7`, { method: 'POST', headers: { 'content-type': 'text/plain' }, body: msg('H-2') })).status).toBe(401);
    expect((await fetch(`${app.url}/api/v1/hl7`, { method: 'POST', headers: { authorization: 'Bearer nope', 'content-type': 'text/plain' }, body: msg('H-3') })).status).toBe(401);
    const r = await fetch(`${app.url}/api/v1/hl7`, { method: 'POST', headers: { authorization: 'Bearer plateau-token-abc', 'content-type': 'text/plain' }, body: msg('H-4').replace('ORU^R01^ORU_R01', 'ADT^A01') });
    expect(r.status).toBe(400);
    expect(readAck(await r.text()).err).toContain('MSH^1^9');
  });
});

describe('fuzz over the real database', () => {
  it('answers 500 mutated messages with an ACK or NACK, and no NACKed message writes a row', async () => {
    const c = await connect(mllp.port);
    let i = 0;
    let nacks = 0;
    const totals = () => count('SELECT (SELECT COUNT(*) FROM "Sample") + (SELECT COUNT(*) FROM "Hl7InboxSample") + (SELECT COUNT(*) FROM "Hl7Message") AS "n"');
    await fc.assert(
      fc.asyncProperty(fc.array(mutationArb, { minLength: 1, maxLength: 3 }), async (ms) => {
        i++;
        const base = buildOru({ controlId: `FZ-${i}`, at: new Date(Date.UTC(2026, 11, 1, 6, 0, 0) + i * 1000), sendingFacility: 'KB-MON', location: i % 2 ? 'KB-ROOM-1' : 'KB-ROOM-2', values: { etco2: 38, rr: 14, spo2: 97, hr: 72 } });
        const before = await totals();
        const a = readAck(await c.send(mutate(base, ms)));
        expect(['AA', 'AE', 'AR']).toContain(a.code);
        // Refused for what it says, never because the database could not take it.
        expect(a.text).not.toMatch(/storage failed/);
        if (a.code !== 'AA') {
          nacks++;
          expect(await totals()).toBe(before);
        }
      }),
      { numRuns: 500, seed: 7 },
    );
    expect(nacks).toBeGreaterThan(50);
    c.close();
  });
});
