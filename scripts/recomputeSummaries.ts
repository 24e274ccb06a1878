// Recomputes every case's stored summary for its unit's active rule set (only stale ones change),
// then rebuilds the monthly statistics rollups of every unit (lib/db/statsMonths.ts).
import { openDb, closeDb } from '../lib/db/client';
import { databaseTarget, describeTarget } from '../lib/db/target';
import { recomputeAllSummaries } from '../lib/db/summaries';
import { rebuildAllStatsMonths } from '../lib/db/statsMonths';
import { activeRuleSet } from '../lib/db/summaries';
import { getCatalogue } from '../lib/indicators/catalogue';

async function main() {
  const target = databaseTarget();
  const client = openDb(target);
  try {
    let last = 0;
    const n = await recomputeAllSummaries(client, new Date(), (done, total) => {
      if (done === total || Date.now() - last > 1000) {
        last = Date.now();
        process.stdout.write(`\r${done}/${total} cases`);
      }
    });
    let months = 0;
    for (const u of await client.unit.findMany({ select: { id: true } })) {
      for (const rs of [await activeRuleSet(client, u.id), getCatalogue().ruleSet]) months += await rebuildAllStatsMonths(client, rs, new Date(), u.id);
    }
    console.log(`\nsummaries up to date for ${n} cases in ${describeTarget(target)}; ${months} monthly statistics rollups rebuilt`);
  } finally {
    await closeDb(client);
  }
}
main().catch((e) => {
  console.error(e instanceof Error ? e.message : e);
  process.exit(1);
});
