import path from 'node:path';
import { defineConfig } from 'prisma/config';

// The CLI is only used for `prisma generate` (scripts/generate.ts, for both databases);
// migrations are applied offline by scripts/migrate.ts through the schema engine's wasm build
// (see DEVELOPERS.md).
export default defineConfig({
  schema: path.join('prisma', 'schema.prisma'),
  migrations: { path: path.join('prisma', 'migrations', 'sqlite') },
  datasource: { url: `file:${process.env.PLATEAU_DB_FILE ?? './data/plateau.db'}` },
});
