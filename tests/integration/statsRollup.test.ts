/**
 * The monthly statistics rollup (lib/db/statsMonths.ts) on the database under test: it gives
 * exactly the rows the case tables give, follows a case being signed and a rule-set change,
 * rebuilds a rollup that is missing or behind, and an app process's unpacked copy never hides
 * a change another process made.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { dropDatabase, makeDatabase, type TestDatabase } from '../helpers/appServer';
import { closeDb, openDb, sqlOf, type Db } from '@/lib/db/client';
import { joinedStatsRows, loadStatsRows, type StatsQuery } from '@/lib/db/statsRows';
import { signNote } from '@/lib/db/notes';
import { activeRuleSet, refreshSummary, setActiveRuleSet } from '@/lib/db/summaries';
import { forgetUnpackedMonths, summaryId, summaryLockKey } from '@/lib/db/statsMonths';

let d: TestDatabase;
let client: Db;
let unitId: string;
const RS = { ruleSetId: 'plateau-default', ruleSetVersion: 1 };
const ALL = (over: Partial<StatsQuery> = {}): StatsQuery => ({ from: '2000-01-01', to: '2100-12-31', ...RS, ...over });
const sortById = <T extends { caseId: string }>(xs: T[]) => [...xs].sort((a, b) => (a.caseId < b.caseId ? -1 : 1));

beforeAll(async () => {
  d = makeDatabase({ cases: 60 });
  client = openDb(d.target);
  unitId = (await client.unit.findFirstOrThrow()).id;
}, 240_000);

afterAll(async () => {
  await closeDb(client);
  await dropDatabase(d);
});

describe('statistics from the monthly rollups', () => {
  it('gives the same rows, in the same order, as the case tables', async () => {
    const fromRollups = await loadStatsRows(client, ALL());
    const fromTables = (await joinedStatsRows(sqlOf(client), ALL({ statuses: ['signed'] }))).map((x) => x.row);
    expect(fromRollups.length).toBeGreaterThan(30);
    expect(fromRollups).toEqual(fromTables);
    const months = await sqlOf(client).get<{ n: number }>('SELECT COUNT(*) AS "n" FROM "StatsMonth" WHERE "ruleSetId" = ? AND "ruleSetVersion" = ?', [RS.ruleSetId, RS.ruleSetVersion]);
    expect(months!.n).toBeGreaterThan(3);
  });

  it('cuts a period inside a month to its days, and a unit filter to its unit', async () => {
    const all = await loadStatsRows(client, ALL());
    const month = all[Math.floor(all.length / 2)].month;
    const from = `${month}-05`;
    const to = `${month}-20`;
    const cut = await loadStatsRows(client, ALL({ from, to }));
    expect(cut).toEqual(all.filter((r) => r.date >= from && r.date <= to));
    expect(await loadStatsRows(client, ALL({ unitIds: ['no-such-unit'] }))).toEqual([]);
    expect((await loadStatsRows(client, ALL({ unitIds: [unitId] }))).length).toBe(all.length);
  });

  it('counts a case from the moment it is signed', async () => {
    const before = await loadStatsRows(client, ALL());
    const open = await client.case.findFirst({ where: { status: { not: 'signed' } }, orderBy: { startAt: 'asc' } });
    expect(open, 'the demo has an unsigned case').not.toBeNull();
    const nurse = await client.user.findFirstOrThrow({ where: { role: 'nurse' } });
    await signNote(client, open!.id, null, { id: nurse.id, role: 'nurse', origin: 'test' }, new Date());
    const after = await loadStatsRows(client, ALL());
    expect(after.length).toBe(before.length + 1);
    expect(after.find((r) => r.caseId === open!.id)?.status).toBe('signed');
    expect(sortById(after)).toEqual(sortById((await joinedStatsRows(sqlOf(client), ALL({ statuses: ['signed'] }))).map((x) => x.row)));
  });

  it('packs the summary a store leaves when the case is signed while that store is under way', async () => {
    const q = sqlOf(client);
    const open = await client.case.findFirst({ where: { status: { not: 'signed' } }, orderBy: { startAt: 'desc' } });
    expect(open, 'the demo has another unsigned case').not.toBeNull();
    const rs = await activeRuleSet(client, open!.unitId);
    await refreshSummary(client, open!.id, new Date(), rs);
    const stored = await q.get<{ lowestSpo2: number | null }>('SELECT "lowestSpo2" FROM "CaseSummary" WHERE "id" = ?', [summaryId(open!.id, rs)]);
    const replaced = (stored!.lowestSpo2 ?? 90) - 7;
    // A summary store of the unsigned case, held open under its own lock (as lib/db/summaries
    // stores one), while the nurse signs: the rebuild after signing must wait for it and pack
    // what it leaves. (On SQLite the held transaction is the one writer: signing cannot commit
    // until it ends, so the race cannot happen, and it is held no longer than signing may wait.)
    let locked!: () => void;
    let release!: () => void;
    const isLocked = new Promise<void>((r) => (locked = r));
    const released = new Promise<void>((r) => (release = r));
    const store = q.tx(async (t) => {
      locked();
      await released;
      await t.run('UPDATE "CaseSummary" SET "lowestSpo2" = ? WHERE "id" = ?', [replaced, summaryId(open!.id, rs)]);
    }, { only: summaryLockKey(open!.id, rs) });
    await isLocked;
    const nurse = await client.user.findFirstOrThrow({ where: { role: 'nurse' } });
    const signing = signNote(client, open!.id, null, { id: nurse.id, role: 'nurse', origin: 'test' }, new Date());
    for (let i = 0; i < (q.dialect === 'postgresql' ? 100 : 16); i++) {
      const c = await q.get<{ status: string }>('SELECT "status" FROM "Case" WHERE "id" = ?', [open!.id]);
      if (c?.status === 'signed') break;
      await new Promise((r) => setTimeout(r, 50));
    }
    await new Promise((r) => setTimeout(r, 200));
    release();
    await store;
    await signing;
    forgetUnpackedMonths(q);
    const row = (await loadStatsRows(client, ALL({ ruleSetId: rs.id, ruleSetVersion: rs.version }))).find((r) => r.caseId === open!.id);
    expect(row?.status).toBe('signed');
    expect(row?.summary?.lowestSpo2).toBe(replaced);
  });

  it('rebuilds a rollup that was deleted or whose case count is behind', async () => {
    const expected = await loadStatsRows(client, ALL());
    const q = sqlOf(client);
    const some = await q.get<{ unitId: string; month: string }>('SELECT "unitId", "month" FROM "StatsMonth" WHERE "ruleSetId" = ? ORDER BY "month" LIMIT 1', [RS.ruleSetId]);
    await q.run('DELETE FROM "StatsMonth" WHERE "unitId" = ? AND "month" = ?', [some!.unitId, some!.month]);
    await q.run(`UPDATE "StatsMonth" SET "cases" = "cases" - 1, "rows" = '[]' WHERE "month" = (SELECT MAX("month") FROM "StatsMonth")`);
    forgetUnpackedMonths(q);
    expect(await loadStatsRows(client, ALL())).toEqual(expected);
  });

  it('another process changing the summaries (a rule-set change) is seen by a process that had the rows unpacked', async () => {
    const other = openDb(d.target);
    try {
      const mine = await loadStatsRows(client, ALL({ ruleSetId: 'conway-2019', ruleSetVersion: 1 }));
      expect(mine.every((r) => r.summary === null)).toBe(true);
      // The other process switches the unit to another rule set: every case is summarised under it.
      await setActiveRuleSet(other, unitId, { id: 'conway-2019', version: 1 }, { id: 'test', role: 'admin', origin: null }, new Date());
      const now = await loadStatsRows(client, ALL({ ruleSetId: 'conway-2019', ruleSetVersion: 1 }));
      expect(now.length).toBe(mine.length);
      expect(now.every((r) => r.summary?.ruleSetId === 'conway-2019')).toBe(true);
      expect(now).toEqual((await joinedStatsRows(sqlOf(other), ALL({ ruleSetId: 'conway-2019', ruleSetVersion: 1, statuses: ['signed'] }))).map((x) => x.row));
    } finally {
      await closeDb(other);
    }
  });

  it('reads a renamed room under its new name without repacking', async () => {
    const before = await loadStatsRows(client, ALL());
    const roomId = before.find((r) => r.roomId)!.roomId!;
    await client.room.update({ where: { id: roomId }, data: { name: 'Renamed room' } });
    const after = await loadStatsRows(client, ALL());
    expect(after.filter((r) => r.roomId === roomId).every((r) => r.room === 'Renamed room')).toBe(true);
  });
});
