/**
 * Volume generator for the scale benchmark (docs/scale.md): signed cases of a large system —
 * many units, a year — with the facts, entries, summaries and rollups statistics read, and full
 * 1 Hz traces for a small subset (so the tables the statistics must NOT read are not empty).
 * Written through the Sql port, so the same data lands in SQLite or PostgreSQL. Invented data,
 * for measurement only; deterministic for a seed.
 */
import { PLATEAU_DEFAULT_V1 } from '@/lib/rules';
import { rebuildStatsMonth } from '@/lib/db/statsMonths';
import { mulberry32 as random } from './syntheticCase';
import type { Sql, SqlValue } from '@/lib/db/sql';

export const RULES = PLATEAU_DEFAULT_V1.rules.map((r) => r.id);
const RULE_P: Record<string, number> = { apnea: 0.22, prolonged_apnea: 0.015, hypoventilation: 0.08, low_etco2: 0.01, bradypnea: 0.06, hypoxemia: 0.1, severe_hypoxemia: 0.03, prolonged_hypoxemia: 0.01, critical_hypoxemia: 0.002 };
const PROCEDURES = ['gastroscopy', 'colonoscopy', 'ercp', 'eus', 'bronchoscopy'];
const DRUGS = [['propofol'], ['propofol', 'fentanyl'], ['midazolam', 'fentanyl'], ['ketamine'], ['propofol', 'ketamine']];
const KINDS = ['stimulation', 'jaw_thrust', 'oxygen_increase', 'chin_lift', 'bag_mask'];
const EVENTS = ['sedation_start', 'procedure_start', 'procedure_end', 'recovery_start', 'sedation_end', 'discharge'];

export interface VolumeShape {
  units: number;
  roomsPerUnit: number;
  proceduralistsPerUnit: number;
  nursesPerUnit: number;
  /** The last month of the year the cases fall in (YYYY-MM). */
  lastMonth: string;
  /** One case in this many gets 30 minutes of 1 Hz EtCO2, RR, SpO2 and HR samples. */
  tracedEvery: number;
}

export const DEFAULT_SHAPE: VolumeShape = { units: 24, roomsPerUnit: 6, proceduralistsPerUnit: 12, nursesPerUnit: 20, lastMonth: '2029-12', tracedEvery: 500 };


const unitId = (u: number) => `unit-${String(u).padStart(2, '0')}`;
const pad = (n: number) => String(n).padStart(2, '0');

function monthOf(lastMonth: string, back: number): string {
  const [y, m] = lastMonth.split('-').map(Number);
  const t = y * 12 + (m - 1) - back;
  return `${Math.floor(t / 12)}-${pad((t % 12) + 1)}`;
}

/** The site, units, rooms, staff and patients; call once on an empty migrated database. */
export async function writeVolumeFrame(q: Sql, shape: VolumeShape = DEFAULT_SHAPE, patients = 60_000): Promise<void> {
  const now = new Date('2030-01-01T00:00:00Z');
  const rnd = random(7);
  await q.tx(async (t) => {
    await t.insertMany('Site', ['id', 'name', 'createdAt'], [['site-vol', 'Volume bench group (invented)', now]]);
    const units: SqlValue[][] = [];
    const rooms: SqlValue[][] = [];
    const users: SqlValue[][] = [];
    const prs: SqlValue[][] = [];
    for (let u = 0; u < shape.units; u++) {
      units.push([unitId(u), 'site-vol', `Bench unit ${u + 1}`, 'UTC', now]);
      for (let r = 0; r < shape.roomsPerUnit; r++) rooms.push([`${unitId(u)}-room-${r}`, unitId(u), `Room ${r + 1}`, r, now]);
      for (let r = 0; r < shape.nursesPerUnit; r++) users.push([`${unitId(u)}-nurse-${r}`, `${unitId(u)}.nurse.${r}`, `Nurse ${u + 1}.${r + 1}`, 'nurse', 'x', unitId(u), now]);
      for (let r = 0; r < shape.proceduralistsPerUnit; r++) prs.push([`${unitId(u)}-dr-${r}`, unitId(u), `Dr ${u + 1}.${r + 1}`, now]);
    }
    await t.insertMany('Unit', ['id', 'siteId', 'name', 'timeZone', 'createdAt'], units);
    await t.insertMany('Room', ['id', 'unitId', 'name', 'sortOrder', 'createdAt'], rooms);
    await t.insertMany('User', ['id', 'username', 'displayName', 'role', 'passwordHash', 'unitId', 'createdAt'], users);
    await t.insertMany('Proceduralist', ['id', 'unitId', 'name', 'createdAt'], prs);
    const pats: SqlValue[][] = [];
    for (let i = 0; i < patients; i++) pats.push([`pat-${i}`, 'site-vol', `V-${i}`, 'Bench', 'Patient', `${1930 + Math.floor(rnd() * 75)}-0${1 + Math.floor(rnd() * 9)}-15`, rnd() < 0.5 ? 'female' : 'male', now]);
    await t.insertMany('Patient', ['id', 'siteId', 'mrn', 'familyName', 'givenName', 'birthDate', 'sex', 'createdAt'], pats);
  });
}

/**
 * Adds cases `from`..`to - 1` (signed, spread over the units and the 12 months ending
 * shape.lastMonth), with doses, events, readings, interventions, a plateau-default v1 summary
 * with its rule rows; then rebuilds the monthly statistics rollups. Returns the samples written.
 */
export async function writeVolumeCases(q: Sql, from: number, to: number, shape: VolumeShape = DEFAULT_SHAPE, patients = 60_000): Promise<{ samples: number }> {
  const now = new Date('2030-01-01T00:00:00Z');
  let samples = 0;
  const BATCH = 5000;
  for (let b = from; b < to; b += BATCH) {
    const end = Math.min(to, b + BATCH);
    const rnd = random(1000 + b);
    const pick = <T>(xs: readonly T[]) => xs[Math.floor(rnd() * xs.length)];
    const rows = { cases: [] as SqlValue[][], doses: [] as SqlValue[][], evs: [] as SqlValue[][], mvs: [] as SqlValue[][], ivs: [] as SqlValue[][], sums: [] as SqlValue[][], rules: [] as SqlValue[][], samples: [] as SqlValue[][] };
    for (let i = b; i < end; i++) {
      const u = i % shape.units;
      const month = monthOf(shape.lastMonth, Math.floor(rnd() * 12));
      const day = 1 + Math.floor(rnd() * 28);
      const date = `${month}-${pad(day)}`;
      const startMs = Date.parse(`${date}T07:00:00Z`) + Math.floor(rnd() * 40) * 900_000;
      const at = (s: number) => new Date(startMs + s * 1000);
      const id = `vcase-${i}`;
      rows.cases.push([
        id, `v-${i}`, `pat-${Math.floor(rnd() * patients)}`, unitId(u), `${unitId(u)}-room-${Math.floor(rnd() * shape.roomsPerUnit)}`, pick(PROCEDURES), pick(['minimal', 'moderate', 'moderate', 'deep']), pick(['I', 'II', 'II', 'III', 'IV']), false,
        50 + rnd() * 70, 150 + rnd() * 40, rnd() < 0.4, rnd() < 0.3, rnd() < 0.1, rnd() < 0.4, rnd() < 0.2,
        `${unitId(u)}-dr-${Math.floor(rnd() * shape.proceduralistsPerUnit)}`, `${unitId(u)}-nurse-${Math.floor(rnd() * shape.nursesPerUnit)}`, 'signed', date, new Date(startMs), 'mmHg', 1, now, now,
      ]);
      const drugs = pick(DRUGS);
      drugs.forEach((d, k) => rows.doses.push([`${id}-d${k}`, id, d, d === 'fentanyl' ? 'opioid' : 'sedative', 20, d === 'fentanyl' ? 'mcg' : 'mg', 'IV', at(60 + k * 30), now]));
      rows.doses.push([`${id}-d9`, id, drugs[0], 'sedative', 20, 'mg', 'IV', at(400), now]);
      EVENTS.forEach((k, j) => rows.evs.push([`${id}-e${j}`, id, k, at(j * 300), now]));
      for (let v = 0; v < 5; v++) rows.mvs.push([`${id}-v${v}`, id, at(v * 300 + Math.floor(rnd() * 60)), 120, 70, 80, now]);
      const episodes = RULES.map((r) => (rnd() < RULE_P[r] ? 1 + Math.floor(rnd() * 2) : 0));
      const count = episodes.reduce((a, x) => a + x, 0);
      const intervened = count > 0 && rnd() < 0.7;
      if (intervened) rows.ivs.push([`${id}-i0`, id, pick(KINDS), at(500), now]);
      const level = count === 0 ? (intervened ? 'corrected' : 'none') : !intervened ? 'observed' : rnd() < 0.04 ? 'supported' : 'corrected';
      const major = episodes[1] > 0 || episodes[7] > 0 || episodes[8] > 0;
      const response = episodes[0] > 0 && intervened ? Math.round(5 + rnd() * 80) : null;
      const sid = `${id}:plateau-default:1`;
      const perRule = RULES.map((r, k) => ({ ruleId: r, episodes: episodes[k], totalDurationS: episodes[k] * 30, maxDurationS: episodes[k] ? 30 : 0, firstResponseS: episodes[k] && k === 0 ? response : null }));
      rows.sums.push([sid, id, 'plateau-default', 1, 'bench', now, level, major, count, 85 + Math.round(rnd() * 14), 100, 900, response, '{}']);
      for (const r of perRule) rows.rules.push([sid, id, r.ruleId, r.episodes, r.totalDurationS, r.maxDurationS, r.firstResponseS]);
      if (i % shape.tracedEvery === 0) {
        for (let s = 0; s < 1800; s++) {
          const ms = startMs + s * 1000;
          rows.samples.push([id, 'etco2', ms, 33 + rnd() * 6, 'monitor', false], [id, 'rr', ms, 12 + rnd() * 6, 'monitor', false], [id, 'spo2', ms, 95 + rnd() * 4, 'monitor', false], [id, 'hr', ms, 70 + rnd() * 15, 'monitor', false]);
        }
      }
    }
    await q.tx(async (t) => {
      await t.insertMany('Case', ['id', 'key', 'patientId', 'unitId', 'roomId', 'procedureType', 'plannedDepth', 'asaClass', 'asaEmergency', 'weightKg', 'heightCm', 'sbSnoring', 'sbTired', 'sbObserved', 'sbPressure', 'sbNeck', 'proceduralistId', 'nurseId', 'status', 'scheduledDate', 'startAt', 'etco2Unit', 'version', 'createdAt', 'updatedAt'], rows.cases);
      await t.insertMany('Dose', ['id', 'caseId', 'drug', 'drugClass', 'amount', 'unit', 'route', 'at', 'createdAt'], rows.doses);
      await t.insertMany('CaseEvent', ['id', 'caseId', 'kind', 'at', 'createdAt'], rows.evs);
      await t.insertMany('ManualVital', ['id', 'caseId', 'at', 'sbp', 'dbp', 'hr', 'createdAt'], rows.mvs);
      await t.insertMany('Intervention', ['id', 'caseId', 'kind', 'at', 'createdAt'], rows.ivs);
      await t.insertMany('CaseSummary', ['id', 'caseId', 'ruleSetId', 'ruleSetVersion', 'inputHash', 'computedAt', 'caseLevel', 'majorPhysiology', 'episodeCount', 'lowestSpo2', 'capnoCoveragePct', 'sedationS', 'firstApneaResponseS', 'analysisJson'], rows.sums);
      await t.insertMany('CaseSummaryRule', ['summaryId', 'caseId', 'ruleId', 'episodes', 'totalDurationS', 'maxDurationS', 'firstResponseS'], rows.rules);
      samples += await t.insertMany('Sample', ['caseId', 'channel', 'atMs', 'value', 'source', 'probeOff'], rows.samples);
    });
  }
  // The monthly statistics rollups the app rebuilds as cases are signed (lib/db/statsMonths).
  for (let u = 0; u < shape.units; u++) for (let k = 0; k < 12; k++) await rebuildStatsMonth(q, { id: 'plateau-default', version: 1 }, { unitId: unitId(u), month: monthOf(shape.lastMonth, k) }, now);
  return { samples };
}
