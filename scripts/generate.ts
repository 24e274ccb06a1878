// Runs `prisma generate` for both databases without the native schema engine, which this network
// cannot download: generation needs only the query compiler (shipped as wasm in the npm package),
// but the CLI insists that PRISMA_SCHEMA_ENGINE_BINARY names an executable. Any executable will do.
// The SQLite client comes from prisma/schema.prisma; the PostgreSQL client from the schema derived
// from it (lib/db/migrationFiles.ts), written to prisma/postgresql/schema.prisma (git-ignored).
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { PG_SCHEMA_PATH, SCHEMA_PATH, schemaText } from '../lib/db/migrationFiles';

const cli = path.join(process.cwd(), 'node_modules', 'prisma', 'build', 'index.js');
const env = {
  ...process.env,
  PRISMA_SCHEMA_ENGINE_BINARY: process.env.PRISMA_SCHEMA_ENGINE_BINARY ?? process.execPath,
  PRISMA_HIDE_UPDATE_MESSAGE: '1',
  CHECKPOINT_DISABLE: '1',
};
fs.mkdirSync(path.dirname(PG_SCHEMA_PATH), { recursive: true });
fs.writeFileSync(PG_SCHEMA_PATH, schemaText('postgresql'));
for (const schema of [SCHEMA_PATH, PG_SCHEMA_PATH]) {
  const r = spawnSync(process.execPath, [cli, 'generate', '--schema', schema], { stdio: 'inherit', env });
  if (r.status !== 0) process.exit(r.status ?? 1);
}
