// Walks the audit trail's hash chain and names the first broken entry. Exit 0 when intact, 1 when not.
// npm run audit:verify [-- <sqlite file | postgresql://…>] (default: the configured database).
import { openDb, closeDb, sqlOf } from '../lib/db/client';
import { verifyAuditChain } from '../lib/db/auditVerify';
import { databaseTarget, describeTarget, asTarget } from '../lib/db/target';

async function main() {
  const target = process.argv[2] ? asTarget(process.argv[2]) : databaseTarget();
  const client = openDb(target);
  try {
    const v = await verifyAuditChain(sqlOf(client));
    if (v.ok) console.log(`audit trail intact: ${v.entries} entries in ${describeTarget(target)}`);
    else {
      console.error(`audit trail BROKEN at entry ${v.brokenSeq}: ${v.problem}`);
      process.exitCode = 1;
    }
  } finally {
    await closeDb(client);
  }
}
main().catch((e) => {
  console.error(e instanceof Error ? e.message : e);
  process.exit(2);
});
