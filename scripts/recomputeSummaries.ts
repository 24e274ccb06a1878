// Recomputes every case's stored summary for its unit's active rule set (only stale ones change).
import { openDb } from '../lib/db/client';
import { databaseFile } from '../lib/db/sqlite';
import { recomputeAllSummaries } from '../lib/db/summaries';

const client = openDb(databaseFile());
let last = 0;
recomputeAllSummaries(client, new Date(), (done, total) => {
  if (done === total || Date.now() - last > 1000) {
    last = Date.now();
    process.stdout.write(`\r${done}/${total} cases`);
  }
})
  .then((n) => console.log(`\nsummaries up to date for ${n} cases`))
  .finally(() => client.$disconnect());
