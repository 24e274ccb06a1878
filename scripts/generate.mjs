// Runs `prisma generate` without the native schema engine, which this network cannot download:
// generation needs only the query compiler (shipped as wasm in the npm package), but the CLI
// insists that PRISMA_SCHEMA_ENGINE_BINARY names an executable. Any executable will do.
import { spawnSync } from 'node:child_process';
import path from 'node:path';

const cli = path.join(process.cwd(), 'node_modules', 'prisma', 'build', 'index.js');
const env = {
  ...process.env,
  PRISMA_SCHEMA_ENGINE_BINARY: process.env.PRISMA_SCHEMA_ENGINE_BINARY ?? process.execPath,
  PRISMA_HIDE_UPDATE_MESSAGE: '1',
  CHECKPOINT_DISABLE: '1',
};
const r = spawnSync(process.execPath, [cli, 'generate'], { stdio: 'inherit', env });
process.exit(r.status ?? 1);
