// Walks the audit trail's hash chain and names the first broken entry. Exit 0 when intact, 1 when not.
import { databaseFile, openRawDatabase } from '../lib/db/sqlite';
import { verifyAuditChain } from '../lib/db/auditVerify';

const file = process.argv[2] ?? databaseFile();
const raw = openRawDatabase(file);
const v = verifyAuditChain(raw);
raw.close();
if (v.ok) console.log(`audit trail intact: ${v.entries} entries in ${file}`);
else {
  console.error(`audit trail BROKEN at entry ${v.brokenSeq}: ${v.problem}`);
  process.exit(1);
}
