/**
 * Offline access to Prisma's schema engine through its wasm build (@prisma/schema-engine-wasm),
 * bound to better-sqlite3. The CLI's native engine is a download this network blocks; the wasm
 * engine ships inside an npm package, so migrations apply on a fresh clone with npm alone.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { createRequire } from 'node:module';
import { pathToFileURL } from 'node:url';
import { PrismaBetterSqlite3 } from '@prisma/adapter-better-sqlite3';
import { bindMigrationAwareSqlAdapterFactory, type SqlMigrationAwareDriverAdapterFactory } from '@prisma/driver-adapter-utils';
import { ensureWal } from './sqlite';

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

import { MIGRATIONS_DIR, SCHEMA_PATH, migrationList } from './migrationFiles';

export { MIGRATIONS_DIR, SCHEMA_PATH };
const NO_FILTER = { externalTables: [], externalEnums: [] };

export function readSchema(): string {
  return fs.readFileSync(SCHEMA_PATH, 'utf8');
}

/**
 * Opens the schema engine on a SQLite file. `close()` frees the engine and disposes the
 * connections it opened: the engine keeps a lock on the file until they are closed.
 */
export async function openSchemaEngine(dbFile: string): Promise<{ engine: Engine; close(): Promise<void> }> {
  const bg = await loadWasm();
  // The shadow database (where the engine replays the migration history) is a scratch file:
  // the adapter's in-memory default fails to replay here.
  const shadow = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'plateau-shadow-')), 'shadow.db');
  const inner = new PrismaBetterSqlite3({ url: `file:${dbFile}` }, { shadowDatabaseUrl: `file:${shadow}` });
  const opened: { dispose(): Promise<void> }[] = [];
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
      opened.push(a);
      return a;
    },
  };
  const factory = bindMigrationAwareSqlAdapterFactory(tracking);
  const engine = await bg.SchemaEngine.new({ datamodels: [['schema.prisma', readSchema()]] }, () => {}, factory);
  return {
    engine,
    close: async () => {
      engine.free();
      for (const a of opened) await a.dispose().catch(() => {});
    },
  };
}

/** Applies every committed migration not yet applied to `dbFile`; returns the names applied. */
export async function applyMigrations(dbFile: string): Promise<string[]> {
  fs.mkdirSync(path.dirname(dbFile), { recursive: true });
  ensureWal(dbFile);
  const { engine, close } = await openSchemaEngine(dbFile);
  try {
    const out = await engine.applyMigrations({ migrationsList: migrationList(), filters: NO_FILTER });
    return out.appliedMigrationNames;
  } finally {
    await close();
  }
}

/**
 * SQL that would take a database from one state to another. `from`/`to`: 'empty', 'schema'
 * (prisma/schema.prisma), 'migrations' (the committed history) or a database file path.
 */
export async function diffSql(scratchDbFile: string, from: DiffSide, to: DiffSide): Promise<string> {
  // A live database is reached through the engine's own adapter (the wasm engine takes no URLs),
  // so the engine opens on that file when one side is a database.
  const live = typeof from === 'object' ? from.dbFile : typeof to === 'object' ? to.dbFile : scratchDbFile;
  const { engine, close } = await openSchemaEngine(live);
  const target = (s: DiffSide) => {
    if (s === 'empty') return { tag: 'empty' as const };
    if (s === 'schema') return { tag: 'schemaDatamodel' as const, files: [{ path: SCHEMA_PATH, content: readSchema() }] };
    if (s === 'migrations') return { tag: 'migrations' as const, ...migrationList() };
    return { tag: 'schemaDatasource' as const, files: [{ path: SCHEMA_PATH, content: readSchema() }], configDir: path.dirname(SCHEMA_PATH) };
  };
  try {
    const r = await engine.diff({ from: target(from), to: target(to), script: true, exitCode: null, filters: NO_FILTER });
    return (r as { stdout?: string }).stdout ?? '';
  } finally {
    await close();
  }
}

export type DiffSide = 'empty' | 'schema' | 'migrations' | { dbFile: string };

