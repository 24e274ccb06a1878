/**
 * Everything PostgreSQL-specific sits here (the SQLite counterpart is lib/db/sqlite.ts): the
 * connection pool, the Sql port over node-postgres, the Prisma adapter on the same pool, and
 * the write lock.
 *
 * Writers are serialised with one transaction-scoped advisory lock (WRITE_LOCK_KEY), taken first
 * in every write transaction — the Sql port's `tx` and lib/db/tx.ts `writeTx` for Prisma. This
 * gives PostgreSQL the single-writer order SQLite has by nature, which three things rely on:
 * the audit chain (each entry reads the last hash, then appends), read-check-write conflict checks
 * (stale edits refused), and the live stream, which reads new samples by increasing id (ids are
 * taken inside the lock, so they commit in order and a reader never skips one).
 */
import { createHash } from 'node:crypto';
import pg from 'pg';
import { PrismaPg } from '@prisma/adapter-pg';
import type { SqlMigrationAwareDriverAdapterFactory } from '@prisma/driver-adapter-utils';
import { Mutex, chunkRows, ident, numberedPlaceholders, type Sql, type SqlValue, type TxOptions } from './sql';
import { positiveEnv } from '@/lib/_shared/positiveEnv';

/** The advisory lock key every Plateau write transaction takes (an arbitrary constant: "PLAT"). */
export const WRITE_LOCK_KEY = 0x504c4154;
export const WRITE_LOCK_SQL = `SELECT pg_advisory_xact_lock(${WRITE_LOCK_KEY})`;

/** True for a postgres:// or postgresql:// URL. */
export function isPostgresUrl(url: string | undefined): boolean {
  return !!url && /^postgres(ql)?:\/\//i.test(url);
}

// Parsers for the port's own queries (the Prisma adapter passes its own per query). DateTime
// columns are `timestamp(3)` holding UTC wall-clock time, as Prisma writes them.
const PARSERS: Record<number, (s: string) => unknown> = {
  20: (s) => Number(s), // int8: counts and sums
  1700: (s) => Number(s), // numeric
  1114: (s) => new Date(`${s.replace(' ', 'T')}Z`), // timestamp (UTC by convention)
  1184: (s) => new Date(s), // timestamptz
};
const TYPES = { getTypeParser: (oid: number, format?: string) => PARSERS[oid] ?? (pg.types.getTypeParser as (o: number, f?: string) => unknown)(oid, format) } as pg.CustomTypesConfig;

/** A value as node-postgres binds it: instants as UTC wall-clock text (timestamp(3) columns). */
function bind(v: SqlValue): unknown {
  if (v instanceof Date) return v.toISOString().slice(0, 23).replace('T', ' ');
  if (typeof v === 'bigint') return v.toString();
  if (v instanceof Uint8Array && !Buffer.isBuffer(v)) return Buffer.from(v.buffer, v.byteOffset, v.byteLength);
  return v;
}

/**
 * The PostgreSQL text of a statement and a name for it: node-postgres then prepares it once per
 * connection and only binds and executes afterwards (parsing and planning the bedside's few
 * statements on every call was a measurable share of a request).
 */
const textCache = new Map<string, { text: string; name: string }>();
function pgText(text: string): { text: string; name: string } {
  let t = textCache.get(text);
  if (t === undefined) {
    t = { text: numberedPlaceholders(text), name: `plateau_${createHash('sha1').update(text).digest('hex').slice(0, 16)}` };
    if (textCache.size > 2000) textCache.clear();
    textCache.set(text, t);
  }
  return t;
}

type Queryable = pg.Pool | pg.PoolClient;

async function query<T>(on: Queryable, text: string, params?: readonly SqlValue[]): Promise<pg.QueryResult<T & pg.QueryResultRow>> {
  const t = pgText(text);
  // Statements built per call (IN lists of varying length) are not worth preparing.
  const named = text.length < 4000 && !/\bIN \(\?/.test(text);
  return on.query<T & pg.QueryResultRow>({ text: t.text, ...(named ? { name: t.name } : {}), values: (params ?? []).map(bind), types: TYPES });
}

/** Column types of a table (information_schema udt names), cached per process. */
const columnTypes = new Map<string, Promise<Map<string, string>>>();
function typesOf(on: Queryable, table: string): Promise<Map<string, string>> {
  let p = columnTypes.get(table);
  if (!p) {
    p = on
      .query<{ column_name: string; udt_name: string }>({ text: 'SELECT column_name, udt_name FROM information_schema.columns WHERE table_schema = current_schema() AND table_name = $1', values: [table] })
      .then((r) => new Map(r.rows.map((x) => [x.column_name, x.udt_name])));
    p.catch(() => columnTypes.delete(table));
    columnTypes.set(table, p);
  }
  return p;
}

/**
 * Many rows in one statement per 20,000: each column goes as one array parameter and
 * `unnest` turns them back into rows — a handful of parameters instead of one per value, which
 * PostgreSQL parses and plans in a fraction of the time of a long VALUES list.
 */
async function insertManyOn(on: Queryable, table: string, columns: readonly string[], rows: readonly (readonly SqlValue[])[], ignoreConflicts: boolean): Promise<number> {
  if (rows.length === 0) return 0;
  const types = await typesOf(on, table);
  const casts = columns.map((c) => {
    const t = types.get(c);
    if (!t) throw new Error(`insertMany: ${table}.${c} is not a column`);
    return t;
  });
  const cols = columns.map(ident).join(', ');
  const text = `INSERT INTO ${ident(table)} (${cols}) SELECT * FROM unnest(${casts.map((t, i) => `$${i + 1}::${t}[]`).join(', ')})${ignoreConflicts ? ' ON CONFLICT DO NOTHING' : ''}`;
  let n = 0;
  for (const chunk of chunkRows(rows, 1, 20_000)) {
    const values = columns.map((_, i) => chunk.map((r) => bind(r[i])));
    const r = await on.query({ text, values });
    n += r.rowCount ?? 0;
  }
  return n;
}

/** Connections per app process for reads (PLATEAU_PG_POOL, default 10); writes get half as many more. */
const poolSize = () => positiveEnv(process.env.PLATEAU_PG_POOL, 10, true);

/** A connection pool for a database URL (`max` connections; default PLATEAU_PG_POOL, else 10). */
export function newPgPool(url: string, max: number = poolSize()): pg.Pool {
  const pool = new pg.Pool({ connectionString: url, max });
  // An idle client's error (server restart) must not crash the app; the next query reconnects.
  pool.on('error', () => undefined);
  return pool;
}

/** The Prisma adapter for the app, on the pool its Sql port uses. */
export function pgAdapter(pool: pg.Pool): PrismaPg {
  return new PrismaPg(pool);
}

type PerformIO = (q: unknown) => Promise<{ fields: { dataTypeID: number }[] }>;
const PG_CHAR = 18;
const PG_TEXT = 25;

/**
 * The schema engine reads PostgreSQL's catalogues, which have `"char"` columns (pg_class.relkind
 * and the like); @prisma/adapter-pg 7.10 has no column type for them and fails the whole
 * describe ("Column type 'char' could not be deserialized"). They are one-letter text: report
 * them as text. Applies to the adapter and to its transactions.
 */
function readCharAsText<T extends object>(queryable: T): T {
  const q = queryable as unknown as { performIO?: PerformIO; startTransaction?: (...a: unknown[]) => Promise<object> };
  const perform = q.performIO?.bind(queryable);
  if (perform) {
    q.performIO = async (query) => {
      const r = await perform(query);
      for (const f of r.fields) if (f.dataTypeID === PG_CHAR) f.dataTypeID = PG_TEXT;
      return r;
    };
  }
  const start = q.startTransaction?.bind(queryable);
  if (start) q.startTransaction = async (...a) => readCharAsText(await start(...a));
  return queryable;
}

/** The Prisma adapter for the schema engine: its own connections, and shadow databases it may create. */
export function pgMigrationAdapter(url: string): SqlMigrationAwareDriverAdapterFactory {
  // Parsed, not as a connection string: the adapter makes its shadow database's config as
  // { ...config, database }, and node-postgres lets a connectionString override `database`, so
  // the "shadow" would be the target itself.
  const u = new URL(url);
  const inner = new PrismaPg({
    host: decodeURIComponent(u.hostname),
    port: u.port ? Number(u.port) : 5432,
    user: decodeURIComponent(u.username) || undefined,
    password: u.password ? decodeURIComponent(u.password) : undefined,
    database: decodeURIComponent(u.pathname.slice(1)) || undefined,
    ...(u.searchParams.get('sslmode') && u.searchParams.get('sslmode') !== 'disable' ? { ssl: { rejectUnauthorized: u.searchParams.get('sslmode') === 'verify-full' } } : {}),
  });
  return {
    provider: inner.provider,
    adapterName: inner.adapterName,
    connect: async () => readCharAsText(await inner.connect()),
    connectToShadowDb: async () => {
      const a = readCharAsText(await inner.connectToShadowDb());
      // The adapter drops the shadow database before closing its own pool to it, and PostgreSQL
      // refuses to drop a database someone is connected to: close the pool first.
      const dispose = a.dispose.bind(a);
      a.dispose = async () => {
        await a.underlyingDriver().end().catch(() => undefined);
        await dispose().catch((e: unknown) => {
          if (!/more than once/i.test(String(e))) throw e;
        });
      };
      return a;
    },
  };
}

/**
 * The Sql port on a PostgreSQL database, owning its pools: `pool` for reads (which a Prisma
 * client may share) and a small one of its own for write transactions. A write transaction holds
 * its connection while it waits for a lock; on one shared pool, a queue of such writers took
 * every connection and reads (the bedside sheet's dozen) waited behind them.
 */
export class PgSql implements Sql {
  readonly dialect = 'postgresql' as const;
  private readonly writes: pg.Pool;
  constructor(
    readonly url: string,
    readonly pool: pg.Pool = newPgPool(url),
  ) {
    this.writes = newPgPool(url, Math.max(2, Math.ceil(poolSize() / 2)));
  }

  async all<T>(text: string, params?: readonly SqlValue[]): Promise<T[]> {
    return (await query<T>(this.pool, text, params)).rows;
  }
  async get<T>(text: string, params?: readonly SqlValue[]): Promise<T | undefined> {
    return (await query<T>(this.pool, text, params)).rows[0];
  }
  async run(text: string, params?: readonly SqlValue[]): Promise<number> {
    return (await query(this.pool, text, params)).rowCount ?? 0;
  }
  async insertMany(table: string, columns: readonly string[], rows: readonly (readonly SqlValue[])[], opts: { ignoreConflicts?: boolean } = {}): Promise<number> {
    if (rows.length === 0) return 0;
    return this.tx((q) => q.insertMany(table, columns, rows, opts));
  }
  async tx<T>(fn: (q: Sql) => Promise<T>, opts?: TxOptions): Promise<T> {
    const client = await this.writes.connect();
    const port = new PgTxSql(client);
    try {
      await client.query('BEGIN');
      // A key's own lock: (1, hash of the key) never meets the one-number WRITE_LOCK_KEY.
      if (opts?.only) await client.query({ text: 'SELECT pg_advisory_xact_lock(1, hashtext($1))', values: [opts.only] });
      else {
        await client.query(WRITE_LOCK_SQL);
        port.serialized = true;
      }
      const out = await fn(port);
      port.done = true;
      await client.query('COMMIT');
      return out;
    } catch (e) {
      port.done = true;
      await client.query('ROLLBACK').catch(() => undefined);
      throw e;
    } finally {
      client.release();
    }
  }
  async serialize(): Promise<void> {
    throw new Error('serialize() belongs inside tx(): use the port tx() gives you');
  }
  async close(): Promise<void> {
    await this.pool.end().catch(() => undefined);
    await this.writes.end().catch(() => undefined);
  }
}

/**
 * The port inside a PostgreSQL write transaction: every statement on its connection, one at a
 * time (a connection runs one query at a time; callers may start several with Promise.all).
 */
class PgTxSql implements Sql {
  readonly dialect = 'postgresql' as const;
  done = false;
  /** Whether this transaction holds the write lock (every tx but one begun with `only`). */
  serialized = false;
  private readonly one = new Mutex();
  constructor(private readonly client: pg.PoolClient) {}
  private check() {
    if (this.done) throw new Error('the transaction is over: use the port you were given only inside tx()');
  }
  async all<T>(text: string, params?: readonly SqlValue[]): Promise<T[]> {
    this.check();
    return this.one.run(async () => (await query<T>(this.client, text, params)).rows);
  }
  async get<T>(text: string, params?: readonly SqlValue[]): Promise<T | undefined> {
    this.check();
    return this.one.run(async () => (await query<T>(this.client, text, params)).rows[0]);
  }
  async run(text: string, params?: readonly SqlValue[]): Promise<number> {
    this.check();
    return this.one.run(async () => (await query(this.client, text, params)).rowCount ?? 0);
  }
  async insertMany(table: string, columns: readonly string[], rows: readonly (readonly SqlValue[])[], opts: { ignoreConflicts?: boolean } = {}): Promise<number> {
    this.check();
    return this.one.run(() => insertManyOn(this.client, table, columns, rows, !!opts.ignoreConflicts));
  }
  async tx<T>(fn: (q: Sql) => Promise<T>, _opts?: TxOptions): Promise<T> {
    this.check();
    return fn(this);
  }
  /** Advisory locks are re-entrant: taking the write lock again where it is held costs a round trip, nothing more. */
  async serialize(): Promise<void> {
    if (this.serialized) return;
    await this.run(WRITE_LOCK_SQL);
    this.serialized = true;
  }
  async close(): Promise<void> {}
}
