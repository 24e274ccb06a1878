// Fills an empty database with the fictional demo unit (lib/demo). Refuses a database that
// already has a unit or users. Demo passwords: PLATEAU_DEMO_PASSWORD for every account, else
// a random one per account; they are written to the data folder (PLATEAU_DATA_DIR, else beside
// the SQLite file, else ./data) in demo-accounts.json (git-ignored, like the database) so
// `npm run demo` can print them at every start.
// PLATEAU_DEMO_CASES sets the number of past cases (default 400).
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { generateDemoUnit } from '../lib/demo';
import { DEMO_FORMULARY, DEMO_PROCEDURALISTS, DEMO_PROCEDURES, DEMO_ROOMS, DEMO_STAFF, DEMO_UNIT } from '../lib/demo/unit';
import { hashPassword } from '../lib/server/password';
import { applyMigrations } from '../lib/db/schemaEngine';
import { dataDir, databaseTarget, describeTarget } from '../lib/db/target';
import { isEmpty, writeSeed } from '../lib/db/seed';
import { recomputeAllSummaries } from '../lib/db/summaries';
import { rebuildAllStatsMonths } from '../lib/db/statsMonths';
import { activeRuleSet } from '../lib/db/summaries';
import { getCatalogue } from '../lib/indicators/catalogue';
import { closeDb, openDb, sqlOf } from '../lib/db/client';
import { importWaveformCsv } from '../lib/db/waveform';
import { generateCapnogram } from '../lib/capnogram';

const ROLE_MAP: Record<string, string> = { nurse: 'nurse', lead: 'lead', safety_officer: 'safety', admin: 'admin' };

async function main() {
  const target = databaseTarget();
  const file = describeTarget(target);
  await applyMigrations(target);
  const client = openDb(target);
  const q = sqlOf(client);
  if (!(await isEmpty(q))) {
    console.log(`database ${file} already has data: not seeding`);
    await closeDb(client);
    return;
  }
  const now = new Date();
  const cases = Number(process.env.PLATEAU_DEMO_CASES ?? 400);
  const t0 = performance.now();
  const demo = generateDemoUnit({ seed: 20260301, now: now.toISOString(), months: 6, cases: Number.isFinite(cases) && cases >= 0 ? cases : 400 });
  const fixed = process.env.PLATEAU_DEMO_PASSWORD;
  const accounts = DEMO_STAFF.map((s) => ({ username: s.username, displayName: s.displayName, role: ROLE_MAP[s.role] ?? 'nurse', password: fixed || `demo-${randomBytes(5).toString('hex')}` }));
  const users = await Promise.all(accounts.map(async (a) => ({ id: `user-${a.username}`, username: a.username, displayName: a.displayName, role: a.role, passwordHash: await hashPassword(a.password) })));
  const counts = await writeSeed(q, {
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
  const waveCase = await seedWaveform(client, now);
  const summarised = await recomputeAllSummaries(client, now);
  // The statistics rollups the app keeps as cases are signed (lib/db/statsMonths).
  for (const rs of [await activeRuleSet(client, DEMO_UNIT.id), getCatalogue().ruleSet]) await rebuildAllStatsMonths(client, rs, now);
  await closeDb(client);
  fs.mkdirSync(dataDir(), { recursive: true });
  fs.writeFileSync(path.join(dataDir(), 'demo-accounts.json'), JSON.stringify(accounts, null, 2) + '\n', { mode: 0o600 });
  if (waveCase) console.log(`raw CO2 waveform (50 Hz, 10 min) stored for case ${waveCase}`);
  console.log(`seeded ${file}: ${counts.cases} cases, ${counts.samples.toLocaleString('en-GB')} samples, ${summarised} summaries in ${((performance.now() - t0) / 1000).toFixed(1)} s`);
}
/**
 * One of today's open cases gets ten minutes of raw CO2 at 50 Hz from the synthetic capnogram
 * generator — normal breaths, a slow obstructive upstroke, a 25 s pause, then rebreathing — so
 * the waveform viewer has something to show.
 */
async function seedWaveform(client: ReturnType<typeof openDb>, now: Date): Promise<string | null> {
  const c = await client.case.findFirst({ where: { status: { not: 'signed' } }, orderBy: { startAt: 'asc' }, select: { id: true } });
  if (!c) return null;
  const rateHz = 50;
  const { segment } = generateCapnogram({
    rateHz,
    seed: 7,
    noiseSd: 0.4,
    drift: { amp: 1, periodS: 120 },
    cardiogenic: { amp: 1.5, hrPerMin: 78 },
    jitter: { period: 0.06, etco2: 0.8 },
    stretches: [{ durationS: 180 }, { durationS: 120, riseTimeS: 0.9 }, { durationS: 25, flat: true }, { durationS: 120 }, { durationS: 155, inspired: 5 }],
  });
  const lines = ['time_s,co2_mmHg'];
  for (let i = 0; i < segment.v.length; i++) lines.push(`${(i / rateHz).toFixed(2)},${Number(segment.v[i]).toFixed(2)}`);
  await importWaveformCsv(client, { caseId: c.id, fileName: 'demo-capnogram.csv', text: lines.join('\n'), rateHz, unit: 'mmHg', clockOffsetS: 60 }, { id: 'user-nurse.ada', role: 'nurse', origin: 'demo seed' }, now);
  return c.id;
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
