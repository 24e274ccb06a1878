import fs from 'node:fs';
import path from 'node:path';

export const SCHEMA_PATH = path.join(/*turbopackIgnore: true*/ process.cwd(), 'prisma', 'schema.prisma');
export const MIGRATIONS_DIR = path.join(/*turbopackIgnore: true*/ process.cwd(), 'prisma', 'migrations');

/** The committed migration folders, as the engine expects them. */
export function migrationList() {
  const dirs = fs.existsSync(MIGRATIONS_DIR)
    ? fs.readdirSync(MIGRATIONS_DIR, { withFileTypes: true }).filter((d) => d.isDirectory()).map((d) => d.name).sort()
    : [];
  const lockPath = path.join(MIGRATIONS_DIR, 'migration_lock.toml');
  return {
    baseDir: MIGRATIONS_DIR,
    lockfile: { path: 'migration_lock.toml', content: fs.existsSync(lockPath) ? fs.readFileSync(lockPath, 'utf8') : null },
    shadowDbInitScript: '',
    migrationDirectories: dirs.map((d) => {
      const file = path.join(MIGRATIONS_DIR, d, 'migration.sql');
      return {
        path: d,
        migrationFile: {
          path: 'migration.sql',
          content: fs.existsSync(file) ? { tag: 'ok' as const, value: fs.readFileSync(file, 'utf8') } : { tag: 'error' as const, value: 'missing migration.sql' },
        },
      };
    }),
  };
}

/** Names of the committed migrations, oldest first. */
export function committedMigrationNames(): string[] {
  return migrationList().migrationDirectories.map((d) => d.path);
}
