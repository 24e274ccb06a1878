/**
 * One small async SQL port over both databases, for the paths where the ORM is too slow (bulk
 * sample writes, sample reads, the statistics query) or where a statement is plain SQL anyway.
 * `lib/db/sqlite.ts` and `lib/db/postgres.ts` implement it; callers write one SQL text.
 *
 * The SQL dialect callers write is the common part of SQLite ≥ 3.39 and PostgreSQL ≥ 13:
 * - `?` placeholders (PostgreSQL gets `$1…`; never put a literal `?` in SQL text);
 * - every table and column name double-quoted (`"Sample"."caseId"`: PostgreSQL folds unquoted
 *   names to lower case, Prisma created them mixed-case);
 * - `IS NOT DISTINCT FROM ?` for a comparison that matches NULL, `INSERT … ON CONFLICT DO NOTHING`,
 *   `string_agg(x, sep)`, `COALESCE`, window functions.
 * Values in: strings, numbers, booleans, Dates, Buffers, null. Values out differ by database
 * (booleans are 0/1 in SQLite, DateTime is text in SQLite): read them with `asBool` and `asDate`.
 */

export type Dialect = 'sqlite' | 'postgresql';

export type SqlValue = string | number | boolean | null | Date | Uint8Array | bigint;

export interface TxOptions {
  only?: string;
}

export interface Sql {
  readonly dialect: Dialect;
  /** Every row of a query. */
  all<T = Record<string, unknown>>(text: string, params?: readonly SqlValue[]): Promise<T[]>;
  /** The first row of a query, or undefined. */
  get<T = Record<string, unknown>>(text: string, params?: readonly SqlValue[]): Promise<T | undefined>;
  /** Runs a statement; the number of rows it changed. */
  run(text: string, params?: readonly SqlValue[]): Promise<number>;
  /**
   * Inserts many rows into one table in as few statements as the driver allows. With
   * `ignoreConflicts` a row that would break a unique key is skipped. Returns rows inserted.
   */
  insertMany(table: string, columns: readonly string[], rows: readonly (readonly SqlValue[])[], opts?: { ignoreConflicts?: boolean }): Promise<number>;
  /**
   * A write transaction, serialised with every other Plateau writer on the database (SQLite:
   * BEGIN IMMEDIATE; PostgreSQL: a transaction-scoped advisory lock), so read-check-write inside
   * it sees no concurrent change and the audit chain cannot fork. Rolls back when `fn` throws.
   * `opts.only`: a transaction that writes derived data of one key and appends no audit entry
   * (a case's summary) need only exclude writers of that key; on PostgreSQL it then takes a lock
   * of that key instead of the one every writer takes (SQLite has one writer anyway).
   */
  tx<T>(fn: (q: Sql) => Promise<T>, opts?: TxOptions): Promise<T>;
  /**
   * Inside a transaction begun with `only`: from here on, also wait for and exclude every other
   * writer (PostgreSQL: take the one write lock; a no-op where it is already held, and on
   * SQLite). appendAuditSql calls it, so the audit chain is one line whoever appends.
   */
  serialize(): Promise<void>;
  /** Closes the connections (scripts and tests; the app keeps one port for its lifetime). */
  close(): Promise<void>;
}

/** A boolean column as read from either database (SQLite gives 0/1). */
export function asBool(v: unknown): boolean {
  return v === true || v === 1 || v === 1n || v === '1' || v === 't';
}

/** A nullable boolean column (a yes/no answer not yet given is null). */
export function asBoolOrNull(v: unknown): boolean | null {
  return v === null || v === undefined ? null : asBool(v);
}

/** A DateTime column as read from either database (SQLite gives ISO text). */
export function asDate(v: unknown): Date {
  return v instanceof Date ? v : new Date(String(v));
}

/** A nullable DateTime column. */
export function asDateOrNull(v: unknown): Date | null {
  return v === null || v === undefined ? null : asDate(v);
}

/** A count or sum as a number (PostgreSQL returns 64-bit integers and numerics as text unless told). */
export function asNumber(v: unknown): number {
  return typeof v === 'number' ? v : Number(v);
}

/**
 * Rewrites `?` placeholders as `$1, $2, …`, leaving quoted strings and names alone.
 *
 * @example
 * numberedPlaceholders(`SELECT * FROM "T" WHERE a = ? AND b = '?'`) //=> `SELECT * FROM "T" WHERE a = $1 AND b = '?'`
 */
export function numberedPlaceholders(text: string): string {
  let out = '';
  let n = 0;
  let quote: string | null = null;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (quote) {
      if (ch === quote) quote = null;
      out += ch;
    } else if (ch === "'" || ch === '"') {
      quote = ch;
      out += ch;
    } else if (ch === '?') {
      out += `$${++n}`;
    } else out += ch;
  }
  return out;
}

/** Splits rows into chunks whose bound parameters stay under a driver's limit. */
export function chunkRows<T>(rows: readonly T[], columns: number, maxParams: number): T[][] {
  const per = Math.max(1, Math.floor(maxParams / Math.max(1, columns)));
  const out: T[][] = [];
  for (let i = 0; i < rows.length; i += per) out.push(rows.slice(i, i + per));
  return out;
}

/**
 * `n` parameter markers for an `IN (…)` list or a VALUES row.
 *
 * @example
 * placeholders(3) //=> '?, ?, ?'
 */
export function placeholders(n: number): string {
  return Array.from({ length: n }, () => '?').join(', ');
}

/** `"name"` — a quoted SQL identifier. */
export function ident(name: string): string {
  if (!/^[A-Za-z_][A-Za-z0-9_]*$/.test(name)) throw new Error(`not a plain SQL name: ${name}`);
  return `"${name}"`;
}

/** Serialises async critical sections (one SQLite write connection, one transaction at a time). */
export class Mutex {
  private tail: Promise<void> = Promise.resolve();
  private held = false;

  get locked(): boolean {
    return this.held;
  }

  async run<T>(fn: () => Promise<T>): Promise<T> {
    const prev = this.tail;
    let release!: () => void;
    this.tail = new Promise<void>((r) => (release = r));
    await prev;
    this.held = true;
    try {
      return await fn();
    } finally {
      this.held = false;
      release();
    }
  }
}

/** True for a unique-key violation from either database (better-sqlite3 or node-postgres). */
export function isUniqueViolation(e: unknown): boolean {
  if (typeof e !== 'object' || e === null || !('code' in e)) return false;
  const code = String((e as { code: unknown }).code);
  return code === 'SQLITE_CONSTRAINT_UNIQUE' || code === 'SQLITE_CONSTRAINT_PRIMARYKEY' || code === '23505';
}
