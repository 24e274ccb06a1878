/**
 * The statistics rollup: for each rule-set version, unit and month, the statistics rows of the
 * unit's signed cases of that month packed into one StatsMonth row (lib/domain/statsRowCodec).
 * A year of a large system is a few hundred rollups, so statistics read kilobytes of a few
 * hundred rows instead of a row per case joined to its patient, summary and entries
 * (docs/scale.md has the figures).
 *
 * Why it stays right: a signed case is frozen — no entry, fact or sample can be added, voided or
 * re-timed (lib/db/entries.ts, sampleImport, hl7Store refuse) — so its row changes only when its
 * summary is stored again (a new rule-set version, or the rules recomputed). Signing a case
 * rebuilds its month; storing a signed case's summary drops its month's rollup for the next read
 * to rebuild; and the two never interleave (rebuildStatsMonth and lib/db/summaries take the
 * case's summary lock, then the write lock). A reader also compares each
 * rollup's case count with the live count of signed cases (an index-only query) and its packing
 * format with the code's, and rebuilds any that differ or are missing, inside a write
 * transaction so a rebuild never interleaves with a summary being stored. Names of rooms,
 * proceduralists and nurses are not packed: they are read fresh every time.
 *
 * Each app process keeps the rollups it has unpacked (a bounded cache, PLATEAU_STATS_CACHE_ROWS,
 * default 300,000 rows). It is only a saving of work, never a source: every read first asks the
 * database for each rollup's case count, format and digest (SHA-256 of its rows), and for the current names,
 * and unpacks again whatever differs — so a second instance, or a rollup rebuilt elsewhere, is
 * never missed. The rows it returns are shared: callers read them and never change them.
 */
import { createHash } from 'node:crypto';
import type { PrismaClient } from './generated/client';
import { sqlOf } from './client';
import type { Sql } from './sql';
import { joinedStatsRows, statsNames, summaryRuleIds, unitFilter, type StatsQuery } from './statsRows';
import { STATS_ROW_FORMAT, packStatsRow, unpackStatsRow, type PackedStatsRow } from '@/lib/domain/statsRowCodec';
import type { StatsRow } from '@/lib/domain/statsRow';

interface Key {
  unitId: string;
  month: string;
}

const lastDay = (month: string) => `${month}-31`;

/** A case's CaseSummary id under a rule-set version. */
export const summaryId = (caseId: string, rs: { id: string; version: number }) => `${caseId}:${rs.id}:${rs.version}`;

/** The lock a summary is stored under (lib/db/summaries.ts), and that a rebuild after signing takes first. */
export const summaryLockKey = (caseId: string, rs: { id: string; version: number }) => `summary:${summaryId(caseId, rs)}`;

/**
 * Packs the signed cases of one unit-month under a rule-set version and stores the rollup.
 * `opts.caseId`: a case just signed, whose summary may be being stored this moment (it was
 * stored under its own lock while unsigned): the rebuild takes that lock before the write lock,
 * the order a summary store takes them in, so it packs the summary that store leaves.
 */
export async function rebuildStatsMonth(q: Sql, ruleSet: { id: string; version: number }, key: Key, now: Date, opts: { caseId?: string } = {}): Promise<{ cases: number; digest: string; rows: PackedStatsRow[] }> {
  return q.tx(async (t) => {
    if (opts.caseId) await t.serialize();
    const rows = await joinedStatsRows(t, { unitIds: [key.unitId], from: `${key.month}-01`, to: lastDay(key.month), ruleSetId: ruleSet.id, ruleSetVersion: ruleSet.version, statuses: ['signed'] });
    const packed = rows.map((r) => packStatsRow(r.row, r.startMs));
    const text = JSON.stringify(packed);
    const digest = createHash('sha256').update(text).digest('hex');
    await t.run('DELETE FROM "StatsMonth" WHERE "ruleSetId" = ? AND "ruleSetVersion" = ? AND "unitId" = ? AND "month" = ?', [ruleSet.id, ruleSet.version, key.unitId, key.month]);
    await t.run('INSERT INTO "StatsMonth" ("ruleSetId", "ruleSetVersion", "unitId", "month", "cases", "format", "digest", "computedAt", "rows") VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?)', [
      ruleSet.id,
      ruleSet.version,
      key.unitId,
      key.month,
      packed.length,
      STATS_ROW_FORMAT,
      digest,
      now,
      text,
    ]);
    return { cases: packed.length, digest, rows: packed };
  }, opts.caseId ? { only: summaryLockKey(opts.caseId, ruleSet) } : undefined);
}

/** The months (YYYY-MM) from the month of `from` to the month of `to`. */
function monthsBetween(from: string, to: string): string[] {
  const out: string[] = [];
  let [y, m] = from.slice(0, 7).split('-').map(Number);
  const [ty, tm] = to.slice(0, 7).split('-').map(Number);
  while (y < ty || (y === ty && m <= tm)) {
    out.push(`${y}-${String(m).padStart(2, '0')}`);
    if (++m > 12) {
      m = 1;
      y++;
    }
  }
  return out;
}

interface Unpacked {
  stamp: string;
  context: string;
  rows: { row: StatsRow; startMs: number }[];
}

interface Cache {
  rows: number;
  map: Map<string, Unpacked>;
}

// One cache per database port (a process has one for the app's database; tests and benchmarks
// may open several), so rollups of two databases never meet.
const caches = new WeakMap<Sql, Cache>();
const cacheLimit = () => {
  const n = Number(process.env.PLATEAU_STATS_CACHE_ROWS);
  return Number.isInteger(n) && n >= 0 ? n : 300_000;
};

function cacheOf(q: Sql): Cache {
  let c = caches.get(q);
  if (!c) caches.set(q, (c = { rows: 0, map: new Map() }));
  return c;
}

/** Empties a port's cache of unpacked rollups (benchmarks measure the cold path with it). */
export function forgetUnpackedMonths(q: Sql): void {
  caches.delete(q);
}

function remember(c: Cache, key: string, value: Unpacked): void {
  const old = c.map.get(key);
  if (old) {
    c.rows -= old.rows.length;
    c.map.delete(key);
  }
  c.map.set(key, value);
  c.rows += value.rows.length;
  // Least recently used first out (a Map keeps insertion order; a hit re-inserts).
  for (const [k, v] of c.map) {
    if (c.rows <= cacheLimit() || k === key) break;
    c.map.delete(k);
    c.rows -= v.rows.length;
  }
  if (c.rows > cacheLimit()) {
    c.map.delete(key);
    c.rows -= value.rows.length;
  }
}

function recall(c: Cache, key: string, stamp: string, context: string): Unpacked | null {
  const hit = c.map.get(key);
  if (!hit || hit.stamp !== stamp || hit.context !== context) return null;
  c.map.delete(key);
  c.map.set(key, hit);
  return hit;
}


/**
 * The signed cases of a period from the rollups, rebuilding any missing or behind, unpacked
 * with today's names, cut to the period's days and ordered by date, start and id.
 */
export async function loadFromMonths(q: Sql, query: StatsQuery): Promise<StatsRow[]> {
  const months = monthsBetween(query.from, query.to);
  if (months.length === 0 || query.from > query.to) return [];
  const first = months[0];
  const last = months[months.length - 1];
  const cu = unitFilter(query.unitIds, '"unitId"');
  // The live count of signed cases per unit and month (index-only on Case(status, scheduledDate, unitId)).
  const [live, meta, ruleIds, names] = await Promise.all([
    q.all<{ unitId: string; month: string; n: number }>(
      `SELECT "unitId", substr("scheduledDate", 1, 7) AS "month", COUNT(*) AS "n" FROM "Case"
       WHERE "status" = 'signed' AND "scheduledDate" >= ? AND "scheduledDate" <= ?${cu.sql}
       GROUP BY "unitId", substr("scheduledDate", 1, 7)`,
      [`${first}-01`, lastDay(last), ...cu.args],
    ),
    q.all<{ unitId: string; month: string; cases: number; format: number; digest: string }>(
      `SELECT "unitId", "month", "cases", "format", "digest" FROM "StatsMonth"
       WHERE "ruleSetId" = ? AND "ruleSetVersion" = ? AND "month" >= ? AND "month" <= ?${cu.sql}`,
      [query.ruleSetId, query.ruleSetVersion, first, last, ...cu.args],
    ),
    summaryRuleIds(q, query.ruleSetId, query.ruleSetVersion),
    statsNames(q),
  ]);
  if (live.length === 0) return [];
  const context = createHash('sha1')
    .update(JSON.stringify([ruleIds, [...names.room], [...names.proceduralist], [...names.user]]))
    .digest('hex');
  const monthKey = (k: Key) => `${k.unitId}|${k.month}`;
  const metaByKey = new Map(meta.map((m) => [monthKey(m), m]));
  const cacheKey = (k: Key) => `${query.ruleSetId}@${query.ruleSetVersion}|${monthKey(k)}`;
  const unpackAll = (unitId: string, packed: PackedStatsRow[]) => {
    const ctx = { unitId, status: 'signed', ruleSetId: query.ruleSetId, ruleSetVersion: query.ruleSetVersion, ruleIds, names };
    return packed.map((r) => ({ row: unpackStatsRow(r, ctx), startMs: r[3] }));
  };

  const cache = cacheOf(q);
  const parts = new Map<string, Unpacked['rows']>();
  const keep = (k: Key, digest: string, rows: Unpacked['rows']) => {
    parts.set(monthKey(k), rows);
    remember(cache, cacheKey(k), { stamp: digest, context, rows });
  };
  const now = new Date();
  const rebuild = async (k: Key) => {
    const r = await rebuildStatsMonth(q, { id: query.ruleSetId, version: query.ruleSetVersion }, k, now);
    keep(k, r.digest, unpackAll(k.unitId, r.rows));
  };
  const toFetch: Key[] = [];
  const toRebuild: Key[] = [];
  for (const l of live) {
    const m = metaByKey.get(monthKey(l));
    if (!m || Number(m.cases) !== Number(l.n) || Number(m.format) !== STATS_ROW_FORMAT) toRebuild.push(l);
    else {
      const hit = recall(cache, cacheKey(l), m.digest, context);
      if (hit) parts.set(monthKey(l), hit.rows);
      else toFetch.push(l);
    }
  }
  for (const k of toRebuild) await rebuild(k);
  if (toFetch.length) {
    const wanted = new Set(toFetch.map(monthKey));
    // A few: one by one; many (a cold start): the whole range at once.
    const fetched =
      toFetch.length <= 8
        ? (
            await Promise.all(
              toFetch.map((k) =>
                q.all<{ unitId: string; month: string; digest: string; rows: string }>(
                  `SELECT "unitId", "month", "digest", "rows" FROM "StatsMonth" WHERE "ruleSetId" = ? AND "ruleSetVersion" = ? AND "unitId" = ? AND "month" = ?`,
                  [query.ruleSetId, query.ruleSetVersion, k.unitId, k.month],
                ),
              ),
            )
          ).flat()
        : await q.all<{ unitId: string; month: string; digest: string; rows: string }>(
            `SELECT "unitId", "month", "digest", "rows" FROM "StatsMonth"
             WHERE "ruleSetId" = ? AND "ruleSetVersion" = ? AND "month" >= ? AND "month" <= ?${cu.sql}`,
            [query.ruleSetId, query.ruleSetVersion, first, last, ...cu.args],
          );
    for (const f of fetched) if (wanted.has(monthKey(f))) keep(f, f.digest, unpackAll(f.unitId, JSON.parse(f.rows) as PackedStatsRow[]));
    // Rebuilt between the two reads, or gone: pack it now.
    for (const k of toFetch) if (!parts.has(monthKey(k))) await rebuild(k);
  }

  // Month by month (each rollup is already in order): one month's units merged, then the next.
  const byMonth = new Map<string, Unpacked['rows'][]>();
  for (const l of [...live].sort((a, b) => (a.month < b.month ? -1 : a.month > b.month ? 1 : a.unitId < b.unitId ? -1 : 1))) {
    const rows = parts.get(monthKey(l));
    if (!rows) continue;
    const list = byMonth.get(l.month) ?? [];
    list.push(rows);
    byMonth.set(l.month, list);
  }
  const out: StatsRow[] = [];
  const whole = (month: string) => `${month}-01` >= query.from && lastDay(month) <= query.to;
  for (const [month, lists] of byMonth) {
    const inRange = whole(month) ? (x: Unpacked['rows'][number]) => x !== undefined : (x: Unpacked['rows'][number]) => x.row.date >= query.from && x.row.date <= query.to;
    if (lists.length === 1) {
      for (const x of lists[0]) if (inRange(x)) out.push(x.row);
      continue;
    }
    const merged = lists.flat().filter(inRange);
    merged.sort((a, b) => (a.row.date < b.row.date ? -1 : a.row.date > b.row.date ? 1 : a.startMs - b.startMs || (a.row.caseId < b.row.caseId ? -1 : a.row.caseId > b.row.caseId ? 1 : 0)));
    for (const x of merged) out.push(x.row);
  }
  return out;
}

/**
 * Rebuilds the rollups a case's month has, after the case was signed: for every rule-set version
 * with a summary of the case, and for `also` (the unit's active rule set and the indicators'),
 * so the next statistics read finds them current.
 */
export async function rebuildMonthsOfCase(client: PrismaClient, caseId: string, also: readonly { id: string; version: number }[], now: Date): Promise<number> {
  const q = sqlOf(client);
  const c = await q.get<{ unitId: string; scheduledDate: string }>('SELECT "unitId", "scheduledDate" FROM "Case" WHERE "id" = ?', [caseId]);
  if (!c) return 0;
  const versions = await q.all<{ ruleSetId: string; ruleSetVersion: number }>('SELECT DISTINCT "ruleSetId", "ruleSetVersion" FROM "CaseSummary" WHERE "caseId" = ?', [caseId]);
  const sets = new Map<string, { id: string; version: number }>();
  for (const v of versions) sets.set(`${v.ruleSetId}@${v.ruleSetVersion}`, { id: v.ruleSetId, version: Number(v.ruleSetVersion) });
  for (const a of also) sets.set(`${a.id}@${a.version}`, a);
  for (const rs of sets.values()) await rebuildStatsMonth(q, rs, { unitId: c.unitId, month: c.scheduledDate.slice(0, 7) }, now, { caseId });
  return sets.size;
}

/**
 * Rebuilds every rollup of a rule-set version (optionally one unit's): after a rule-set change
 * recomputed the summaries, or from `npm run summaries:recompute`. Returns the months rebuilt.
 */
export async function rebuildAllStatsMonths(client: PrismaClient, ruleSet: { id: string; version: number }, now: Date, unitId?: string): Promise<number> {
  const q = sqlOf(client);
  const cu = unitFilter(unitId ? [unitId] : undefined, '"unitId"');
  const keys = await q.all<Key>(`SELECT DISTINCT "unitId", substr("scheduledDate", 1, 7) AS "month" FROM "Case" WHERE "status" = 'signed'${cu.sql}`, cu.args);
  for (const k of keys) await rebuildStatsMonth(q, ruleSet, k, now);
  return keys.length;
}
