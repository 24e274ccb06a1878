import type { DoseUnit } from './drug';

export interface DoseLike {
  drug: string;
  amount: number;
  unit: DoseUnit | string;
  voided?: boolean;
}

export interface DrugTotal {
  drug: string;
  unit: 'mg' | 'mcg' | string;
  total: number;
  doses: number;
  /** Total per kg body weight in the same unit (mg/kg or mcg/kg); null without a weight. */
  perKg: number | null;
}

const TO_MG: Record<string, number> = { g: 1000, mg: 1, mcg: 0.001 };

/**
 * Running totals per drug, in the drug's charting unit (mg or mcg), and per kg.
 * Doses recorded in g, mg or mcg are added in the unit of the drug's first dose; voided doses
 * are left out.
 * @example drugTotals([{ drug: 'propofol', amount: 40, unit: 'mg' }, { drug: 'propofol', amount: 20, unit: 'mg' }], 80)
 * //=> [{ drug: 'propofol', unit: 'mg', total: 60, doses: 2, perKg: 0.75 }]
 */
export function drugTotals(doses: readonly DoseLike[], weightKg: number | null | undefined): DrugTotal[] {
  const byDrug = new Map<string, DrugTotal>();
  for (const d of doses) {
    if (d.voided) continue;
    let t = byDrug.get(d.drug);
    if (!t) byDrug.set(d.drug, (t = { drug: d.drug, unit: d.unit === 'g' ? 'mg' : d.unit, total: 0, doses: 0, perKg: null }));
    const from = TO_MG[d.unit];
    const to = TO_MG[t.unit];
    t.total += from !== undefined && to !== undefined ? (d.amount * from) / to : d.unit === t.unit ? d.amount : 0;
    t.doses += 1;
  }
  const out = [...byDrug.values()];
  for (const t of out) {
    t.total = round(t.total, 3);
    t.perKg = weightKg && weightKg > 0 ? round(t.total / weightKg, 3) : null;
  }
  return out;
}

/**
 * True when a single dose is far above the unit's usual (a per-unit setting): shown, never enforced.
 * @example doseCaution(150, { cautionAbove: 100 }) //=> true
 */
export function doseCaution(amount: number, drug: { cautionAbove?: number | null }): boolean {
  return drug.cautionAbove != null && amount > drug.cautionAbove;
}

/**
 * When the last manual BP/HR reading is older than the reminder interval during moderate or
 * deep sedation (common practice; ASA 2018 moderate-sedation guideline, 5-minute wording from
 * memory). Returns the seconds overdue, or null when no reminder is due.
 * @example vitalsOverdue({ nowS: 700, lastReadingS: 300, sedationStartS: 100, sedationEndS: null, depth: 'moderate', intervalMin: 5 }) //=> 100
 */
export function vitalsOverdue(p: { nowS: number; lastReadingS: number | null; sedationStartS: number | null; sedationEndS: number | null; depth: string; intervalMin: number }): number | null {
  if (p.sedationStartS === null || p.sedationEndS !== null) return null;
  if (p.depth !== 'moderate' && p.depth !== 'deep' && p.depth !== 'general') return null;
  const since = p.lastReadingS === null || p.lastReadingS < p.sedationStartS ? p.sedationStartS : p.lastReadingS;
  const overdue = p.nowS - since - p.intervalMin * 60;
  return overdue > 0 ? overdue : null;
}

function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}
