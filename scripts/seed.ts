// Fills an empty database with the fictional demo unit (lib/demo). Refuses a database that
// already has a unit or users. Demo passwords: PLATEAU_DEMO_PASSWORD for every account, else
// a random one per account; they are written beside the database in demo-accounts.json
// (git-ignored, like the database) so `npm run demo` can print them at every start.
// PLATEAU_DEMO_CASES sets the number of past cases (default 400).
import { randomBytes, randomUUID } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { generateDemoUnit } from '../lib/demo';
import { DEMO_FORMULARY, DEMO_PROCEDURALISTS, DEMO_PROCEDURES, DEMO_ROOMS, DEMO_STAFF, DEMO_UNIT } from '../lib/demo/unit';
import { hashPassword } from '../lib/server/password';
import { applyMigrations } from '../lib/db/schemaEngine';
import { databaseFile, openRawDatabase } from '../lib/db/sqlite';
import { isEmpty, writeSeed } from '../lib/db/seed';
import { recomputeAllSummaries } from '../lib/db/summaries';
import { openDb } from '../lib/db/client';

const ROLE_MAP: Record<string, string> = { nurse: 'nurse', lead: 'lead', safety_officer: 'safety', admin: 'admin' };

async function main() {
  const file = databaseFile();
  await applyMigrations(file);
  const raw = openRawDatabase(file);
  if (!isEmpty(raw)) {
    console.log(`database ${file} already has data: not seeding`);
    raw.close();
    return;
  }
  const now = new Date();
  const cases = Number(process.env.PLATEAU_DEMO_CASES ?? 400);
  const t0 = performance.now();
  const demo = generateDemoUnit({ seed: 20260301, now: now.toISOString(), months: 6, cases: Number.isFinite(cases) && cases >= 0 ? cases : 400 });
  const fixed = process.env.PLATEAU_DEMO_PASSWORD;
  const accounts = DEMO_STAFF.map((s) => ({ username: s.username, displayName: s.displayName, role: ROLE_MAP[s.role] ?? 'nurse', password: fixed || `demo-${randomBytes(5).toString('hex')}` }));
  const users = await Promise.all(accounts.map(async (a) => ({ id: `user-${a.username}`, username: a.username, displayName: a.displayName, role: a.role, passwordHash: await hashPassword(a.password) })));
  const counts = writeSeed(raw, {
    site: { id: 'site-kestrel', name: 'Kestrel Bay (fictional demo site)' },
    unit: { id: DEMO_UNIT.id, name: DEMO_UNIT.name, timeZone: DEMO_UNIT.timeZone, defaultRoomId: DEMO_ROOMS[0]?.id ?? null, usualProceduralistId: DEMO_PROCEDURALISTS[0]?.id ?? null },
    rooms: DEMO_ROOMS.map((r, i) => ({ id: r.id, name: r.name, sortOrder: i, location: `KB-${r.id.toUpperCase()}` })),
    procedures: DEMO_PROCEDURES.map((p) => ({ id: `proc-${p.id}`, code: p.id, label: p.label, typicalMin: p.typicalMin.median })),
    users,
    proceduralists: DEMO_PROCEDURALISTS.map((p) => ({ id: p.id, name: p.displayName, specialty: p.specialty })),
    drugs: DEMO_FORMULARY.map((d, i) => ({ id: `drug-${d.drug}`, name: d.drug, drugClass: d.drugClass, defaultUnit: d.unit, defaultRoute: d.route, usualDose: d.usualDose, cautionAbove: d.cautionAbove, concentration: d.concentration, sortOrder: i })),
    patients: demo.patients.map((p) => ({ id: `pat-${p.mrn}`, mrn: p.mrn, familyName: p.familyName, givenName: p.givenName, birthDate: p.birthDate, sex: p.sex })),
    cases: demo.cases,
    now,
  });
  raw.close();
  const client = openDb(file);
  const summarised = await recomputeAllSummaries(client, now);
  await client.$disconnect();
  fs.writeFileSync(path.join(path.dirname(file), 'demo-accounts.json'), JSON.stringify(accounts, null, 2) + '\n', { mode: 0o600 });
  console.log(`seeded ${file}: ${counts.cases} cases, ${counts.samples.toLocaleString('en-GB')} samples, ${summarised} summaries in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
  void randomUUID;
}
main().catch((e) => {
  console.error(e);
  process.exit(1);
});
