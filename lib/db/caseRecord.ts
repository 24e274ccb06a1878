import type { PrismaClient } from './generated/client';
import type { CaseRecord, CaseEventKind, SampleSeries } from '@/lib/domain/caseRecord';
import type { Channel } from '@/lib/domain/channel';
import type { DoseUnit, DrugClass } from '@/lib/domain/drug';
import type { InterventionKind } from '@/lib/domain/intervention';
import { ageInYears } from '@/lib/_shared/time';
import { waveformSeriesForCase } from './waveform';
import { sqlOf } from './client';
import { loadCaseRows, type CaseRows } from './caseRows';
import { asBool } from './sql';

const UNIT_OF: Record<string, SampleSeries['unit']> = { etco2: 'mmHg', inspco2: 'mmHg', spo2: '%', rr: '/min', hr: '/min' };

/**
 * Loads a stored case as the engine's CaseRecord — the same shape a `plateau-case/1` file
 * gives. Voided entries are left out; times become seconds from the case clock (Case.startAt).
 * `rows`: the case's rows when the caller has just read them (the case sheet), else read here.
 */
export async function loadCaseRecord(client: PrismaClient, caseId: string, rows?: CaseRows): Promise<CaseRecord | null> {
  const q = sqlOf(client);
  const all = rows ?? (await loadCaseRows(q, caseId));
  if (!all) return null;
  const live = <T extends { voidedAt: Date | null }>(xs: T[]) => xs.filter((x) => x.voidedAt === null);
  const c = { ...all.case, doses: live(all.doses), interventions: live(all.interventions), events: live(all.events), vitals: live(all.vitals) };
  const startMs = c.startAt.getTime();
  const sec = (d: Date) => (d.getTime() - startMs) / 1000;
  // Samples are the bulk of a case (3,600 a channel an hour): read them raw, in index order.
  const samples = await q.all<{ channel: string; atMs: number; value: number; source: string; probeOff: unknown }>(
    'SELECT "channel", "atMs", "value", "source", "probeOff" FROM "Sample" WHERE "caseId" = ? ORDER BY "channel", "source", "atMs"',
    [caseId],
  );
  const series: SampleSeries[] = [];
  let cur: SampleSeries | null = null;
  for (const r of samples) {
    if (!cur || cur.channel !== r.channel || cur.source !== r.source) {
      cur = { channel: r.channel as Channel, unit: UNIT_OF[r.channel] ?? '/min', source: r.source as 'monitor' | 'manual', t: [], v: [] };
      series.push(cur);
    }
    cur.t.push((r.atMs - startMs) / 1000);
    cur.v.push(r.value);
    if (asBool(r.probeOff)) {
      cur.probeOff ??= new Array(cur.t.length - 1).fill(false);
      cur.probeOff.push(true);
    } else if (cur.probeOff) cur.probeOff.push(false);
  }
  // Manual readings typed at the bedside become manual (spot) series, one per channel.
  const manual: Partial<Record<Channel, SampleSeries>> = {};
  for (const v of c.vitals) {
    for (const ch of ['hr', 'spo2', 'rr', 'etco2'] as const) {
      const val = v[ch];
      if (val === null || val === undefined) continue;
      const s = (manual[ch] ??= { channel: ch, unit: UNIT_OF[ch], source: 'manual', t: [], v: [] });
      const t = sec(v.at);
      if (s.t.length && t <= s.t[s.t.length - 1]) continue; // two readings in one instant: keep the first
      s.t.push(t);
      s.v.push(val);
    }
  }
  series.push(...Object.values(manual));
  // A case with only a raw CO2 waveform still gets episodes: its per-breath trends stand in.
  if (!series.some((x) => x.channel === 'etco2' && x.source === 'monitor')) {
    for (const w of await waveformSeriesForCase(client, caseId)) if (!series.some((x) => x.channel === w.channel && x.source === 'monitor')) series.push(w);
  }
  return {
    case: {
      start: c.startAt.toISOString(),
      weightKg: c.weightKg,
      heightCm: c.heightCm,
      etco2Unit: c.etco2Unit === 'kPa' ? 'kPa' : 'mmHg',
      ageYears: ageInYears(c.patient.birthDate, c.startAt),
      sex: (['female', 'male', 'other', 'unknown'] as const).find((x) => x === c.patient.sex) ?? 'unknown',
      asaClass: c.asaClass ? `${c.asaClass}${c.asaEmergency ? 'E' : ''}` : null,
      plannedDepth: (['minimal', 'moderate', 'deep', 'general'] as const).find((x) => x === c.plannedDepth) ?? null,
      procedure: c.procedureType,
    },
    series,
    doses: c.doses.map((d) => ({ t: sec(d.at), drug: d.drug, amount: d.amount, unit: d.unit as DoseUnit, route: d.route, drugClass: d.drugClass as DrugClass })),
    interventions: c.interventions.map((i) => ({ t: sec(i.at), kind: i.kind as InterventionKind, ...(i.note ? { note: i.note } : {}) })),
    events: c.events.map((e) => ({ t: sec(e.at), kind: e.kind as CaseEventKind, ...(e.note ? { note: e.note } : {}) })),
  };
}
