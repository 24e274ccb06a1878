/**
 * Everything SQLite-specific sits here (architecture: one module per database; PostgreSQL's
 * counterpart is lib/db/postgres.ts). WAL for concurrent readers, synchronous=FULL so an
 * acknowledged write survives power loss, foreign keys on, and a busy timeout so a second
 * writer waits instead of failing.
 */
import path from 'node:path';
import Database from 'better-sqlite3';
import { PrismaBetterSqlite3 } from '@prisma/adapter-better-sqlite3';
import type { SqlDriverAdapter, SqlMigrationAwareDriverAdapterFactory } from '@prisma/driver-adapter-utils';
import { Mutex, ident, placeholders, type Sql, type SqlValue, type TxOptions } from './sql';

export const BUSY_TIMEOUT_MS = 10_000;
// journal_mode is persistent in the file and needs the database to itself, so it is set once
// (ensureWal) and per-connection pragmas are applied on every open.
export const PRAGMAS = ['synchronous = FULL', 'foreign_keys = ON', `busy_timeout = ${BUSY_TIMEOUT_MS}`];

/** The database file: PLATEAU_DB_FILE, default ./data/plateau.db. */
export function databaseFile(env: NodeJS.ProcessEnv = process.env): string {
  return path.resolve(/*turbopackIgnore: true*/ env.PLATEAU_DB_FILE ?? path.join('data', 'plateau.db'));
}

/** A raw better-sqlite3 handle with Plateau's pragmas (checks, backup, the SQLite port). */
export function openRawDatabase(file: string = databaseFile()): Database.Database {
  const db = new Database(file, { timeout: BUSY_TIMEOUT_MS });
  if (db.pragma('journal_mode', { simple: true }) !== 'wal') db.pragma('journal_mode = WAL');
  for (const p of PRAGMAS) db.pragma(p);
  return db;
}

/** Puts a database file in WAL mode (persistent); call before other connections open. */
export function ensureWal(file: string): void {
  openRawDatabase(file).close();
}

/** The connection of Prisma's SQLite adapter, shared with the Sql port of the same client. */
export interface SharedWriter {
  conn: Database.Database;
  /** Takes the adapter's transaction lock and begins (IMMEDIATE); release() gives the lock back. */
  begin(): Promise<{ release(): Promise<void> }>;
}

/**
 * A Prisma adapter factory whose connections run Plateau's pragmas first and begin every
 * transaction IMMEDIATE: a deferred transaction that reads, then writes, fails at once with
 * SQLITE_BUSY when another connection wrote in between; IMMEDIATE takes the write lock up
 * front and waits for it (busy_timeout). `writer()` gives the Sql port the same connection and
 * the adapter's own transaction lock, so in one process the ORM's and the port's write
 * transactions take turns instead of competing for SQLite's file lock.
 */
export function adapterFactory(file: string = databaseFile()): SqlMigrationAwareDriverAdapterFactory & { writer(): Promise<SharedWriter> } {
  const inner = new PrismaBetterSqlite3({ url: `file:${file}`, timeout: BUSY_TIMEOUT_MS });
  let resolveWriter!: (w: SharedWriter) => void;
  const writer = new Promise<SharedWriter>((r) => (resolveWriter = r));
  const withPragmas = async (a: SqlDriverAdapter) => {
    const mode = await a.queryRaw({ sql: 'PRAGMA journal_mode', args: [], argTypes: [] });
    if (String(mode.rows[0]?.[0]).toLowerCase() !== 'wal') await a.queryRaw({ sql: 'PRAGMA journal_mode = WAL', args: [], argTypes: [] });
    for (const p of PRAGMAS) await a.queryRaw({ sql: `PRAGMA ${p}`, args: [], argTypes: [] });
    const conn = (a as unknown as { client?: Database.Database }).client;
    if (conn && typeof conn.prepare === 'function') {
      const prepare = conn.prepare.bind(conn);
      conn.prepare = ((sql: string) => prepare(sql === 'BEGIN' ? 'BEGIN IMMEDIATE' : sql)) as typeof conn.prepare;
      resolveWriter({
        conn,
        begin: async () => {
          const t = await a.startTransaction();
          return { release: () => t.commit() };
        },
      });
    }
    return a;
  };
  return {
    provider: inner.provider,
    adapterName: inner.adapterName,
    connect: async () => withPragmas(await inner.connect()),
    connectToShadowDb: () => inner.connectToShadowDb(),
    writer: () => writer,
  };
}

/** An instant as Prisma stores DateTime in SQLite text columns, for raw writes. */
export function isoDb(d: Date): string {
  return d.toISOString().replace('Z', '+00:00');
}

/** A value as better-sqlite3 binds it: booleans as 0/1 and instants as Prisma's text. */
function bind(v: SqlValue): unknown {
  if (v === true) return 1;
  if (v === false) return 0;
  if (v instanceof Date) return isoDb(v);
  if (v instanceof Uint8Array && !Buffer.isBuffer(v)) return Buffer.from(v.buffer, v.byteOffset, v.byteLength);
  return v;
}
const bindAll = (params: readonly SqlValue[] | undefined) => (params ?? []).map(bind);

const statementsOf = new WeakMap<Database.Database, Statements>();
function statementsFor(conn: Database.Database): Statements {
  let st = statementsOf.get(conn);
  if (!st) statementsOf.set(conn, (st = new Statements(conn)));
  return st;
}

/** Statements on one connection, prepared once per SQL text. */
class Statements {
  private readonly cache = new Map<string, Database.Statement>();
  constructor(readonly conn: Database.Database) {}
  get(text: string): Database.Statement {
    let s = this.cache.get(text);
    if (!s) {
      s = this.conn.prepare(text);
      // Prisma's connection reads integers as BigInt; the port reads plain numbers.
      if (s.reader) s.safeIntegers(false);
      if (this.cache.size > 500) this.cache.clear();
      this.cache.set(text, s);
    }
    return s;
  }
}

function insertManyOn(st: Statements, table: string, columns: readonly string[], rows: readonly (readonly SqlValue[])[], ignoreConflicts: boolean): number {
  if (rows.length === 0) return 0;
  const cols = columns.map(ident).join(', ');
  const one = `(${placeholders(columns.length)})`;
  const tail = ignoreConflicts ? ' ON CONFLICT DO NOTHING' : '';
  let n = 0;
  // One prepared single-row statement reused is the fastest way into SQLite (no SQL parsing per
  // chunk); multi-row VALUES would only add parsing.
  const stmt = st.get(`INSERT INTO ${ident(table)} (${cols}) VALUES ${one}${tail}`);
  for (const r of rows) n += stmt.run(...r.map(bind)).changes;
  return n;
}

const isBusy = (e: unknown) => typeof e === 'object' && e !== null && 'code' in e && String((e as { code: unknown }).code).startsWith('SQLITE_BUSY');
const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/**
 * The Sql port on a SQLite file. Reads go to a read connection of their own (WAL readers never
 * wait for a writer and see committed data only). Writes:
 * - beside a Prisma client (lib/db/client.ts), on the client's own connection, inside the
 *   adapter's transaction lock — one write transaction at a time in the process, whichever
 *   API started it;
 * - standalone (scripts, tests), on a write connection of its own whose transactions run one at
 *   a time (a mutex) and take the file's write lock with BEGIN IMMEDIATE, retried
 *   asynchronously while another process holds it, so the event loop never blocks.
 */
export class SqliteSql implements Sql {
  readonly dialect = 'sqlite' as const;
  private readonly reader: Statements;
  private own: Statements | null = null;
  private readonly lock = new Mutex();

  constructor(
    readonly file: string,
    private readonly shared?: () => Promise<SharedWriter>,
  ) {
    this.reader = new Statements(openRawDatabase(file));
  }

  /** The raw read connection (checks such as PRAGMA integrity_check). */
  get raw(): Database.Database {
    return this.reader.conn;
  }

  async all<T>(text: string, params?: readonly SqlValue[]): Promise<T[]> {
    return this.reader.get(text).all(...bindAll(params)) as T[];
  }
  async get<T>(text: string, params?: readonly SqlValue[]): Promise<T | undefined> {
    return this.reader.get(text).get(...bindAll(params)) as T | undefined;
  }
  async run(text: string, params?: readonly SqlValue[]): Promise<number> {
    return this.tx((q) => q.run(text, params));
  }
  async insertMany(table: string, columns: readonly string[], rows: readonly (readonly SqlValue[])[], opts: { ignoreConflicts?: boolean } = {}): Promise<number> {
    return this.tx((q) => q.insertMany(table, columns, rows, opts));
  }

  // opts.only changes nothing here: SQLite has one writer.
  async tx<T>(fn: (q: Sql) => Promise<T>, _opts?: TxOptions): Promise<T> {
    if (this.shared) {
      const w = await this.shared();
      const held = await w.begin();
      try {
        return await this.body(w.conn, fn);
      } finally {
        await held.release();
      }
    }
    return this.lock.run(async () => {
      if (!this.own) {
        const w = openRawDatabase(this.file);
        w.pragma('busy_timeout = 0');
        this.own = new Statements(w);
      }
      await beginImmediate(this.own.conn);
      return this.body(this.own.conn, fn);
    });
  }

  /** Runs `fn` in the transaction already begun on `conn`; commits, or rolls back when it throws. */
  private async body<T>(conn: Database.Database, fn: (q: Sql) => Promise<T>): Promise<T> {
    const port = new SqliteTxSql(statementsFor(conn));
    try {
      const out = await fn(port);
      port.done = true;
      conn.exec('COMMIT');
      return out;
    } catch (e) {
      port.done = true;
      if (conn.inTransaction) conn.exec('ROLLBACK');
      throw e;
    }
  }

  async serialize(): Promise<void> {}

  async close(): Promise<void> {
    await this.lock.run(async () => {
      this.reader.conn.close();
      this.own?.conn.close();
    });
  }
}

async function beginImmediate(conn: Database.Database): Promise<void> {
  const deadline = Date.now() + BUSY_TIMEOUT_MS;
  // Short waits first: another process's write transaction is usually over within milliseconds
  // (the MLLP listener's ACK latency depends on it).
  for (let wait = 1; ; wait = Math.min(wait * 2, 10)) {
    try {
      conn.exec('BEGIN IMMEDIATE');
      return;
    } catch (e) {
      if (!isBusy(e) || Date.now() > deadline) throw e;
      await sleep(wait * (0.5 + Math.random()));
    }
  }
}

/** The port inside a SQLite write transaction: every statement on the write connection. */
class SqliteTxSql implements Sql {
  readonly dialect = 'sqlite' as const;
  done = false;
  constructor(private readonly st: Statements) {}
  private check() {
    if (this.done) throw new Error('the transaction is over: use the port you were given only inside tx()');
  }
  async all<T>(text: string, params?: readonly SqlValue[]): Promise<T[]> {
    this.check();
    return this.st.get(text).all(...bindAll(params)) as T[];
  }
  async get<T>(text: string, params?: readonly SqlValue[]): Promise<T | undefined> {
    this.check();
    return this.st.get(text).get(...bindAll(params)) as T | undefined;
  }
  async run(text: string, params?: readonly SqlValue[]): Promise<number> {
    this.check();
    return this.st.get(text).run(...bindAll(params)).changes;
  }
  async insertMany(table: string, columns: readonly string[], rows: readonly (readonly SqlValue[])[], opts: { ignoreConflicts?: boolean } = {}): Promise<number> {
    this.check();
    return insertManyOn(this.st, table, columns, rows, !!opts.ignoreConflicts);
  }
  async tx<T>(fn: (q: Sql) => Promise<T>, _opts?: TxOptions): Promise<T> {
    this.check();
    return fn(this);
  }
  async serialize(): Promise<void> {}
  async close(): Promise<void> {}
}
