/**
 * Offline access to Prisma's schema engine through its wasm build (@prisma/schema-engine-wasm),
 * bound to a driver adapter: better-sqlite3 for SQLite, node-postgres for PostgreSQL. The CLI's
 * native engine is a download this network blocks; the wasm engine ships inside an npm package,
 * so migrations apply on a fresh clone with npm alone.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createRequire } from 'node:module';
import { pathToFileURL } from 'node:url';
import { PrismaBetterSqlite3 } from '@prisma/adapter-better-sqlite3';
import { bindMigrationAwareSqlAdapterFactory, type SqlDriverAdapter, type SqlMigrationAwareDriverAdapterFactory } from '@prisma/driver-adapter-utils';
import { ensureWal } from './sqlite';
import { pgMigrationAdapter } from './postgres';
import { asTarget, type DbTarget } from './target';
import { SCHEMA_PATH, migrationList, schemaText } from './migrationFiles';

const requireHere = createRequire(import.meta.url);

type Bg = typeof import('@prisma/schema-engine-wasm/schema_engine_bg');
type Engine = Awaited<ReturnType<Bg['SchemaEngine']['new']>>;

let bgPromise: Promise<Bg> | null = null;

async function loadWasm(): Promise<Bg> {
  if (!bgPromise) {
    bgPromise = (async () => {
      const pkgDir = path.dirname(requireHere.resolve('@prisma/schema-engine-wasm/schema_engine_bg'));
      const bg = (await import(/* webpackIgnore: true */ pathToFileURL(path.join(pkgDir, 'schema_engine_bg.js')).href)) as Bg;
      const bytes = fs.readFileSync(path.join(pkgDir, 'schema_engine_bg.wasm'));
      const { instance } = await WebAssembly.instantiate(bytes, { './schema_engine_bg.js': bg as unknown as WebAssembly.ModuleImports });
      (bg as unknown as { __wbg_set_wasm(x: unknown): void }).__wbg_set_wasm(instance.exports);
      (instance.exports as { __wbindgen_start?: () => void }).__wbindgen_start?.();
      return bg;
    })();
  }
  return bgPromise;
}

export { SCHEMA_PATH };
const NO_FILTER = { externalTables: [], externalEnums: [] };

/** The schema text the engine sees for a target's dialect. */
export function readSchema(dialect: DbTarget['dialect'] = 'sqlite'): string {
  return schemaText(dialect);
}

function sqliteFactory(dbFile: string): SqlMigrationAwareDriverAdapterFactory {
  // The shadow database (where the engine replays the migration history) is a scratch file:
  // the adapter's in-memory default fails to replay here.
  const shadow = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'plateau-shadow-')), 'shadow.db');
  const inner = new PrismaBetterSqlite3({ url: `file:${dbFile}` }, { shadowDatabaseUrl: `file:${shadow}` });
  return {
    provider: inner.provider,
    adapterName: inner.adapterName,
    connect: () => inner.connect(),
    connectToShadowDb: async () => {
      const a = await inner.connectToShadowDb();
      // The engine replays each migration file on the shadow database with one executeRaw call;
      // better-sqlite3 prepares a single statement only, so a whole file goes to executeScript.
      const executeRaw = a.executeRaw.bind(a);
      a.executeRaw = async (q) => {
        try {
          return await executeRaw(q);
        } catch (e) {
          if (e instanceof RangeError && /more than one statement/.test(e.message) && q.args.length === 0) {
            await a.executeScript(q.sql);
            return 0;
          }
          throw e;
        }
      };
      return a;
    },
  };
}

/**
 * Opens the schema engine on a database. `close()` frees the engine and disposes the
 * connections it opened: on SQLite the engine keeps a lock on the file until they are closed.
 */
export async function openSchemaEngine(target: DbTarget | string): Promise<{ engine: Engine; close(): Promise<void> }> {
  const t = asTarget(target);
  const bg = await loadWasm();
  const inner = t.dialect === 'sqlite' ? sqliteFactory(t.file) : pgMigrationAdapter(t.url);
  const opened: SqlDriverAdapter[] = [];
  const tracking: SqlMigrationAwareDriverAdapterFactory = {
    provider: inner.provider,
    adapterName: inner.adapterName,
    connect: async () => {
      const a = await inner.connect();
      opened.push(a);
      return a;
    },
    connectToShadowDb: async () => {
      const a = await inner.connectToShadowDb();
      opened.push(a);
      return a;
    },
  };
  const factory = bindMigrationAwareSqlAdapterFactory(tracking);
  const engine = await bg.SchemaEngine.new({ datamodels: [['schema.prisma', readSchema(t.dialect)]] }, () => {}, factory);
  return {
    engine,
    close: async () => {
      engine.free();
      for (const a of opened) await a.dispose().catch(() => {});
    },
  };
}

/** Applies every committed migration of the target's dialect not yet applied; returns the names applied. */
export async function applyMigrations(target: DbTarget | string): Promise<string[]> {
  const t = asTarget(target);
  if (t.dialect === 'sqlite') {
    fs.mkdirSync(path.dirname(t.file), { recursive: true });
    ensureWal(t.file);
  }
  const { engine, close } = await openSchemaEngine(t);
  try {
    const out = await engine.applyMigrations({ migrationsList: migrationList(t.dialect), filters: NO_FILTER });
    return out.appliedMigrationNames;
  } finally {
    await close();
  }
}

/**
 * SQL that would take a database from one state to another, in the target's dialect. `from`/`to`:
 * 'empty', 'schema' (prisma/schema.prisma, derived for the dialect), 'migrations' (the dialect's
 * committed history, replayed on a shadow database) or 'database' (the target itself).
 */
export async function diffSql(target: DbTarget | string, from: DiffSide, to: DiffSide): Promise<string> {
  const t = asTarget(target);
  const { engine, close } = await openSchemaEngine(t);
  const schemaFile = { path: SCHEMA_PATH, content: readSchema(t.dialect) };
  const side = (s: DiffSide) => {
    if (s === 'empty') return { tag: 'empty' as const };
    if (s === 'schema') return { tag: 'schemaDatamodel' as const, files: [schemaFile] };
    if (s === 'migrations') return { tag: 'migrations' as const, ...migrationList(t.dialect) };
    return { tag: 'schemaDatasource' as const, files: [schemaFile], configDir: path.dirname(SCHEMA_PATH) };
  };
  try {
    const r = await engine.diff({ from: side(from), to: side(to), script: true, exitCode: null, filters: NO_FILTER });
    return (r as { stdout?: string }).stdout ?? '';
  } finally {
    await close();
  }
}

export type DiffSide = 'empty' | 'schema' | 'migrations' | 'database';

/** True when a diff script changes nothing. */
export function isEmptyDiff(sql: string): boolean {
  return !sql.trim() || /^-- This is an empty migration/.test(sql.trim());
}
