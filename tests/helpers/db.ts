/**
 * Database checks the integration tests share, one body for both databases (through the same
 * Sql port the app uses, `testSql`).
 */
import type { DbTarget } from '@/lib/db/target';
import { testSql } from './appServer';

/** What the maintenance scripts take as their database argument: the SQLite file or the PostgreSQL URL. */
export function dbArg(target: DbTarget | { target: DbTarget }): string {
  const t = 'target' in target ? target.target : target;
  return t.dialect === 'sqlite' ? t.file : t.url;
}

/**
 * The database's own consistency check; 'ok' when it finds nothing, else what it found.
 * - SQLite: `PRAGMA integrity_check` (pages, b-trees, indexes against their tables).
 * - PostgreSQL (a killed client cannot corrupt the server's files, so this checks that the
 *   database answers and, with the `amcheck` extension where the server has it, every B-tree
 *   index of the schema against its table (`bt_index_check(…, heapallindexed => true)`) and
 *   every table's heap (`verify_heapam`, PostgreSQL ≥ 14).
 */
export async function integrityCheck(target: DbTarget | { target: DbTarget }): Promise<string> {
  const q = testSql(target);
  if (q.dialect === 'sqlite') {
    const rows = await q.all<{ integrity_check: string }>('PRAGMA integrity_check');
    return rows.map((r) => r.integrity_check).join('; ');
  }
  const alive = await q.get<{ one: number }>('SELECT 1 AS "one"');
  if (alive?.one !== 1) return 'the database does not answer';
  const amcheck = await q.get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM pg_available_extensions WHERE name = 'amcheck'`);
  if (!amcheck?.n) return 'ok';
  await q.run('CREATE EXTENSION IF NOT EXISTS amcheck');
  const problems: string[] = [];
  const indexes = await q.all<{ name: string; oid: number }>(
    `SELECT c.relname AS "name", c.oid::int8 AS "oid" FROM pg_index i
       JOIN pg_class c ON c.oid = i.indexrelid JOIN pg_namespace n ON n.oid = c.relnamespace JOIN pg_am am ON am.oid = c.relam
     WHERE am.amname = 'btree' AND n.nspname = current_schema() ORDER BY c.relname`,
  );
  if (indexes.length === 0) problems.push('no B-tree index found to check');
  for (const ix of indexes) {
    try {
      await q.get('SELECT bt_index_check(?::int8::oid::regclass, TRUE)', [ix.oid]);
    } catch (e) {
      problems.push(`index ${ix.name}: ${e instanceof Error ? e.message : String(e)}`);
    }
  }
  const hasHeapCheck = await q.get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM pg_proc WHERE proname = 'verify_heapam'`);
  if (hasHeapCheck?.n) {
    const tables = await q.all<{ name: string; oid: number }>(
      `SELECT c.relname AS "name", c.oid::int8 AS "oid" FROM pg_class c JOIN pg_namespace n ON n.oid = c.relnamespace
       WHERE c.relkind = 'r' AND n.nspname = current_schema() ORDER BY c.relname`,
    );
    for (const t of tables) {
      const bad = await q.all<{ msg: string }>('SELECT msg AS "msg" FROM verify_heapam(?::int8::oid::regclass)', [t.oid]);
      for (const b of bad) problems.push(`table ${t.name}: ${b.msg}`);
    }
  }
  return problems.length ? problems.join('; ') : 'ok';
}
