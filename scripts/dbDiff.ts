// Writes a new migration, for both databases, with the SQL that takes each committed history to
// prisma/schema.prisma. Usage: npm run db:diff -- <name>
// PostgreSQL's diff replays its history on a shadow database, so it needs a server: the one at
// PLATEAU_PG_ADMIN_URL (a role that may create databases), else a throwaway local cluster from
// Debian's postgresql packages (scripts/pgServer.mjs).
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { diffSql, isEmptyDiff } from '../lib/db/schemaEngine';
import { lockfileText, migrationsDir } from '../lib/db/migrationFiles';
import type { DbTarget } from '../lib/db/target';
import type { Dialect } from '../lib/db/sql';
import { scratchDatabase } from './pgServer.mjs';

async function diffFor(dialect: Dialect): Promise<string> {
  const hasHistory = fs.existsSync(migrationsDir(dialect)) && fs.readdirSync(migrationsDir(dialect)).some((d) => /^\d/.test(d));
  if (dialect === 'sqlite') {
    const target: DbTarget = { dialect, file: path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'plateau-diff-')), 'scratch.db') };
    return diffSql(target, hasHistory ? 'migrations' : 'empty', 'schema');
  }
  const s = await scratchDatabase('plateau_diff', process.env.PLATEAU_PG_ADMIN_URL);
  try {
    return await diffSql({ dialect, url: s.url }, hasHistory ? 'migrations' : 'empty', 'schema');
  } finally {
    await s.done();
  }
}

async function main() {
  const name = (process.argv[2] ?? '').replace(/[^a-z0-9_]/gi, '_');
  if (!name) {
    console.error('usage: npm run db:diff -- <migration_name>');
    process.exit(2);
  }
  const stamp = new Date().toISOString().replace(/[-:T]/g, '').slice(0, 14);
  for (const dialect of ['sqlite', 'postgresql'] as const) {
    const sql = await diffFor(dialect);
    if (isEmptyDiff(sql)) {
      console.log(`${dialect}: schema.prisma matches the migrations: nothing to write`);
      continue;
    }
    const root = migrationsDir(dialect);
    const dir = path.join(root, `${stamp}_${name}`);
    fs.mkdirSync(dir, { recursive: true });
    fs.writeFileSync(path.join(dir, 'migration.sql'), sql);
    const lock = path.join(root, 'migration_lock.toml');
    if (!fs.existsSync(lock)) fs.writeFileSync(lock, lockfileText(dialect));
    console.log(`${dialect}: wrote ${path.relative(process.cwd(), dir)}/migration.sql`);
  }
}
main().catch((e) => {
  console.error(e);
  process.exit(1);
});
