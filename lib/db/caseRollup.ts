/**
 * What statistics need from a case's entries, computed set-based for many cases at once: the
 * drug names and intervention kinds of its non-voided entries, and the longest stretch of
 * sedation without a manual BP or HR reading (lib/db/statsRows builds the rows from them).
 */
import { asDate, chunkRows, placeholders, type Sql } from './sql';

/** Separates the items of a packed list (never part of a drug name, a kind or a number). */
export const SEP = '\u001f';

export interface CaseRollup {
  caseId: string;
  /** Drug names of the non-voided doses, in time order. */
  drugs: string[];
  /** Kinds of the non-voided interventions, in time order. */
  interventions: string[];
  /** Longest gap (s) between manual BP/HR readings during sedation; null without a sedation time. */
  longestVitalsGapS: number | null;
}

const CHUNK = 500;

/**
 * Computes the rollups of cases from their entries, four set-based queries per 500 cases.
 * Sedation runs from the earliest `sedation_start` to the earliest `sedation_end` (else
 * `recovery_start`).
 */
export async function computeRollups(q: Sql, caseIds: readonly string[]): Promise<Map<string, CaseRollup>> {
  const out = new Map<string, CaseRollup>();
  for (const id of caseIds) out.set(id, { caseId: id, drugs: [], interventions: [], longestVitalsGapS: null });
  for (const ids of chunkRows(caseIds, 1, CHUNK)) {
    const list = placeholders(ids.length);
    const [doses, ivs, events, vitals] = await Promise.all([
      q.all<{ caseId: string; drug: string }>(`SELECT "caseId", "drug" FROM "Dose" WHERE "caseId" IN (${list}) AND "voidedAt" IS NULL ORDER BY "caseId", "at", "id"`, ids),
      q.all<{ caseId: string; kind: string }>(`SELECT "caseId", "kind" FROM "Intervention" WHERE "caseId" IN (${list}) AND "voidedAt" IS NULL ORDER BY "caseId", "at", "id"`, ids),
      q.all<{ caseId: string; kind: string; at: unknown }>(
        `SELECT "caseId", "kind", "at" FROM "CaseEvent" WHERE "caseId" IN (${list}) AND "voidedAt" IS NULL AND "kind" IN ('sedation_start', 'sedation_end', 'recovery_start')`,
        ids,
      ),
      q.all<{ caseId: string; at: unknown }>(`SELECT "caseId", "at" FROM "ManualVital" WHERE "caseId" IN (${list}) AND "voidedAt" IS NULL AND ("sbp" IS NOT NULL OR "hr" IS NOT NULL)`, ids),
    ]);
    for (const d of doses) out.get(d.caseId)!.drugs.push(d.drug);
    for (const x of ivs) out.get(x.caseId)!.interventions.push(x.kind);
    const sed = new Map<string, { start: number | null; end: number | null; recovery: number | null }>();
    for (const e of events) {
      const s = sed.get(e.caseId) ?? { start: null, end: null, recovery: null };
      const ms = asDate(e.at).getTime();
      const key = e.kind === 'sedation_start' ? 'start' : e.kind === 'sedation_end' ? 'end' : 'recovery';
      s[key] = s[key] === null ? ms : Math.min(s[key]!, ms);
      sed.set(e.caseId, s);
    }
    const readings = new Map<string, number[]>();
    for (const v of vitals) {
      const l = readings.get(v.caseId) ?? [];
      l.push(asDate(v.at).getTime());
      readings.set(v.caseId, l);
    }
    for (const id of ids) {
      const s = sed.get(id);
      const end = s ? (s.end ?? s.recovery) : null;
      if (s && s.start !== null && end !== null) out.get(id)!.longestVitalsGapS = longestGap(s.start, end, readings.get(id) ?? []);
    }
  }
  return out;
}

/** Longest stretch of [start, end] (epoch ms) without a reading, in seconds. */
export function longestGap(start: number, end: number, readings: number[]): number {
  const times = readings.filter((t) => t >= start && t <= end).sort((a, b) => a - b);
  let prev = start;
  let worst = 0;
  for (const t of times) {
    worst = Math.max(worst, t - prev);
    prev = t;
  }
  worst = Math.max(worst, end - prev);
  return worst / 1000;
}

/** Unpacks a SEP-separated list ('' is the empty list). */
export function unpack(s: string | null): string[] {
  return s ? s.split(SEP) : [];
}
