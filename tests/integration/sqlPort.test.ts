/**
 * The Sql port and the write lock on the database under test (SQLite or PostgreSQL, as the run
 * says): values round-trip the same way through the port and through Prisma, a failed write
 * transaction leaves nothing, concurrent writers are serialised — the property the audit chain
 * and the stale-edit checks rely on — and unique-key errors are recognised.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { dropDatabase, makeDatabase, type TestDatabase } from '../helpers/appServer';
import { closeDb, openDb, sqlOf, type Db } from '@/lib/db/client';
import { writeTx } from '@/lib/db/tx';
import { appendAudit } from '@/lib/db/audit';
import { appendAuditSql } from '@/lib/db/auditSql';
import { verifyAuditChain } from '@/lib/db/auditVerify';
import { asBool, asDate, isUniqueViolation, type Sql } from '@/lib/db/sql';
import { recordEntry } from '@/lib/db/entries';
import { signNote } from '@/lib/db/notes';
import { ConflictError } from '@/lib/db/cases';
import { lastSampleId, samplesAfter } from '@/lib/server/liveBus';

let d: TestDatabase;
let client: Db;
let q: Sql;

beforeAll(async () => {
  d = makeDatabase({ cases: 0 });
  client = openDb(d.target);
  q = sqlOf(client);
  await client.site.create({ data: { id: 'site-1', name: 'Port test site' } });
  await client.unit.create({ data: { id: 'unit-1', siteId: 'site-1', name: 'Port test unit', timeZone: 'UTC' } });
});

afterAll(async () => {
  await closeDb(client);
  await dropDatabase(d);
});

describe(`the Sql port on ${process.env.PLATEAU_TEST_DIALECT ?? 'sqlite'}`, () => {
  it('stores an instant and a boolean that Prisma reads back unchanged, and reads back what Prisma wrote', async () => {
    const at = new Date('2026-03-02T09:15:30.250Z');
    await q.tx((t) => t.run('INSERT INTO "Room" ("id", "unitId", "name", "sortOrder", "active", "createdAt") VALUES (?, ?, ?, ?, ?, ?)', ['room-a', 'unit-1', 'Room A', 1, false, at]));
    const viaPrisma = await client.room.findUniqueOrThrow({ where: { id: 'room-a' } });
    expect(viaPrisma.createdAt.toISOString()).toBe(at.toISOString());
    expect(viaPrisma.active).toBe(false);
    const later = new Date('2026-03-02T10:00:00.001Z');
    await client.room.create({ data: { id: 'room-b', unitId: 'unit-1', name: 'Room B', active: true, createdAt: later } });
    const viaPort = await q.get<{ active: unknown; createdAt: unknown }>('SELECT "active", "createdAt" FROM "Room" WHERE "id" = ?', ['room-b']);
    expect(asBool(viaPort!.active)).toBe(true);
    expect(asDate(viaPort!.createdAt).toISOString()).toBe(later.toISOString());
    const found = await q.all<{ id: string }>('SELECT "id" FROM "Room" WHERE "active" = ? AND "createdAt" < ? ORDER BY "id"', [true, new Date('2027-01-01T00:00:00Z')]);
    expect(found.map((r) => r.id)).toEqual(['room-b']);
  });

  it('inserts many rows at once and counts the ones a unique key skipped', async () => {
    await client.case.create({ data: { id: 'case-1', patient: { create: { id: 'pat-1', siteId: 'site-1', mrn: 'M1', familyName: 'Test', givenName: 'Port', birthDate: '1960-01-01', sex: 'female' } }, unit: { connect: { id: 'unit-1' } }, procedureType: 'gastroscopy', plannedDepth: 'moderate', scheduledDate: '2026-03-02', startAt: new Date('2026-03-02T09:00:00Z') } });
    const rows = Array.from({ length: 2500 }, (_, i) => ['case-1', 'etco2', 1_772_442_000_000 + i * 1000, 35 + (i % 7), 'monitor', i % 100 === 0]);
    expect(await q.insertMany('Sample', ['caseId', 'channel', 'atMs', 'value', 'source', 'probeOff'], rows)).toBe(2500);
    const again = [...rows.slice(0, 10), ['case-1', 'etco2', 1_772_442_000_000 + 2500 * 1000, 40, 'monitor', false]];
    expect(await q.insertMany('Sample', ['caseId', 'channel', 'atMs', 'value', 'source', 'probeOff'], again, { ignoreConflicts: true })).toBe(1);
    const n = await q.get<{ n: number; off: number }>(`SELECT COUNT(*) AS "n", SUM(CASE WHEN "probeOff" = TRUE THEN 1 ELSE 0 END) AS "off" FROM "Sample" WHERE "caseId" = ?`, ['case-1']);
    expect(n).toEqual({ n: 2501, off: 25 });
  });

  // A year of a large system's 1 Hz traces is over a billion samples: keys must not stop at 2^31
  // (PostgreSQL's integer; SQLite's integer key is 64-bit by nature).
  it('numbers samples past 2^31 and streams them back by key in order', async () => {
    const past = 2 ** 31 + 1000;
    if (q.dialect === 'postgresql') await q.get(`SELECT setval('"Sample_id_seq"', ?)`, [past]);
    else await q.tx((t) => t.run('INSERT INTO "Sample" ("id", "caseId", "channel", "atMs", "value", "source") VALUES (?, ?, ?, ?, ?, ?)', [past, 'case-1', 'rr', 1_772_442_000_000, 12, 'monitor']));
    const rows = Array.from({ length: 5 }, (_, i) => ['case-1', 'spo2', 1_772_442_000_000 + i * 1000, 95 + i, 'monitor', false]);
    expect(await q.insertMany('Sample', ['caseId', 'channel', 'atMs', 'value', 'source', 'probeOff'], rows)).toBe(5);
    const streamed = await samplesAfter(q, 'case-1', past);
    expect(streamed.map((r) => r.value)).toEqual([95, 96, 97, 98, 99]);
    expect(streamed.every((r) => Number.isSafeInteger(r.id) && r.id > past)).toBe(true);
    expect(await lastSampleId(q, 'case-1')).toBe(streamed[4].id);
  });

  it('rolls a write transaction back whole when it throws', async () => {
    await expect(
      q.tx(async (t) => {
        await t.run('INSERT INTO "Proceduralist" ("id", "unitId", "name", "createdAt") VALUES (?, ?, ?, ?)', ['pr-1', 'unit-1', 'Dr One', new Date()]);
        throw new Error('changed my mind');
      }),
    ).rejects.toThrow('changed my mind');
    expect(await q.get('SELECT "id" FROM "Proceduralist" WHERE "id" = ?', ['pr-1'])).toBeUndefined();
  });

  it('recognises a duplicate primary key as a unique violation', async () => {
    const insert = () => q.run('INSERT INTO "Proceduralist" ("id", "unitId", "name", "createdAt") VALUES (?, ?, ?, ?)', ['pr-2', 'unit-1', 'Dr Two', new Date()]);
    await insert();
    const err = await insert().then(() => null, (e: unknown) => e);
    expect(isUniqueViolation(err)).toBe(true);
  });

  it('serialises concurrent read-then-write transactions: 40 parallel increments give 40', async () => {
    await q.run('INSERT INTO "Drug" ("id", "unitId", "name", "drugClass", "defaultUnit", "sortOrder", "createdAt") VALUES (?, ?, ?, ?, ?, ?, ?)', ['drug-counter', 'unit-1', 'counter', 'other', 'mg', 0, new Date()]);
    await Promise.all(
      Array.from({ length: 40 }, (_, i) =>
        i % 2 === 0
          ? q.tx(async (t) => {
              const r = await t.get<{ sortOrder: number }>('SELECT "sortOrder" FROM "Drug" WHERE "id" = ?', ['drug-counter']);
              await new Promise((res) => setTimeout(res, 2));
              await t.run('UPDATE "Drug" SET "sortOrder" = ? WHERE "id" = ?', [r!.sortOrder + 1, 'drug-counter']);
            })
          : writeTx(client, async (tx) => {
              const r = await tx.drug.findUniqueOrThrow({ where: { id: 'drug-counter' } });
              await new Promise((res) => setTimeout(res, 2));
              await tx.drug.update({ where: { id: 'drug-counter' }, data: { sortOrder: r.sortOrder + 1 } });
            }, { timeout: 30_000, maxWait: 30_000 }),
      ),
    );
    expect((await client.drug.findUniqueOrThrow({ where: { id: 'drug-counter' } })).sortOrder).toBe(40);
  });

  it('never lands a bedside entry on a case signed while it waited: every accepted entry is in the chain before the signature', async () => {
    const nurse = await client.user.create({ data: { id: 'user-race', username: 'race.nurse', displayName: 'Race Nurse', role: 'nurse', passwordHash: 'x', unitId: 'unit-1' } });
    await client.drug.create({ data: { id: 'drug-race', unitId: 'unit-1', name: 'propofol', drugClass: 'sedative', defaultUnit: 'mg' } });
    const actor = { id: nurse.id, role: 'nurse', origin: 'test' };
    const tries = Array.from({ length: 30 }, (_, i) =>
      recordEntry(client, 'case-1', { type: 'dose', id: `race-${i}`, at: new Date(Date.UTC(2026, 2, 2, 9, 1, i)).toISOString(), drugId: 'drug-race', amount: 10, unit: 'mg', route: 'IV' }, actor, new Date()).then(
        () => `race-${i}`,
        (e: unknown) => (e instanceof ConflictError ? null : Promise.reject(e)),
      ),
    );
    const signing = (async () => {
      await new Promise((r) => setTimeout(r, 5));
      await signNote(client, 'case-1', null, actor, new Date());
    })();
    const accepted = (await Promise.all(tries)).filter((x): x is string => x !== null);
    await signing;
    const rows = await q.all<{ seq: number; action: string; entityId: string | null }>(`SELECT "seq", "action", "entityId" FROM "AuditEntry" WHERE "caseId" = ? ORDER BY "seq"`, ['case-1']);
    const signedAt = rows.find((r) => r.action === 'sign')!.seq;
    for (const id of accepted) expect(rows.find((r) => r.entityId === id)!.seq).toBeLessThan(signedAt);
    const stored = await q.all<{ id: string }>(`SELECT "id" FROM "Dose" WHERE "caseId" = ? AND "id" LIKE 'race-%'`, ['case-1']);
    expect(stored.map((r) => r.id).sort()).toEqual([...accepted].sort());
    expect((await verifyAuditChain(q)).ok).toBe(true);
  });

  it('keeps one unbroken audit chain when the ORM and the port append at the same time', async () => {
    const at = new Date('2026-03-02T12:00:00Z');
    await Promise.all(
      Array.from({ length: 30 }, (_, i) =>
        i % 2 === 0
          ? writeTx(client, (tx) => appendAudit(tx, { at, action: 'test', entity: 'port', entityId: `orm-${i}` }), { timeout: 30_000, maxWait: 30_000 })
          : q.tx((t) => appendAuditSql(t, { at, action: 'test', entity: 'port', entityId: `sql-${i}` })),
      ),
    );
    const v = await verifyAuditChain(q);
    expect(v.ok).toBe(true);
    expect(v.entries).toBeGreaterThanOrEqual(30);
  });
});
