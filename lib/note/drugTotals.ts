import type { DoseEntry } from '@/lib/domain/caseRecord';
import { KNOWN_DRUG_CLASS, type DoseUnit, type DrugClass } from '@/lib/domain/drug';
import type { DrugTotal, NoteFacts, PerKgUnit } from './types';

const MCG_PER: Partial<Record<DoseUnit, number>> = { mcg: 1, mg: 1000, g: 1_000_000 };
const MASS_ORDER: DoseUnit[] = ['mcg', 'mg', 'g'];

function clean(x: number): number {
  return Math.round(x * 1e9) / 1e9;
}

/** A drug's label and class: the unit's formulary first, then the dose row, then the known list. */
export function drugInfo(drug: string, facts: Pick<NoteFacts, 'drugs'>, doseClass?: DrugClass): { label: string; drugClass: DrugClass } {
  const known = facts.drugs[drug];
  if (known !== undefined) return known;
  return {
    label: drug.charAt(0).toUpperCase() + drug.slice(1),
    drugClass: doseClass ?? KNOWN_DRUG_CLASS[drug.toLowerCase()] ?? 'other',
  };
}

/**
 * Totals per drug, in order of first administration. Mass doses of one drug are added in the
 * smallest mass unit among them (mcg < mg < g); other units (mL, units) are totalled per unit.
 * The per-kg figure is given for mass totals with a weight: mcg/kg for mcg, mg/kg for mg and g.
 *
 * @example
 * drugTotals([{ t: 150, drug: 'propofol', amount: 40, unit: 'mg', route: 'IV' }, { t: 300, drug: 'propofol', amount: 20, unit: 'mg', route: 'IV' }], 80, { drugs: {} })
 * //=> [{ drug: 'propofol', label: 'Propofol', drugClass: 'sedative', doseCount: 2, total: 60, unit: 'mg', perKg: { value: 0.75, unit: 'mg/kg' } }]
 */
export function drugTotals(doses: DoseEntry[], weightKg: number | null, facts: Pick<NoteFacts, 'drugs'>): DrugTotal[] {
  const groups = new Map<string, DoseEntry[]>();
  for (const d of [...doses].sort((a, b) => a.t - b.t)) {
    const key = `${d.drug}\u0000${MCG_PER[d.unit] !== undefined ? 'mass' : d.unit}`;
    const g = groups.get(key);
    if (g === undefined) groups.set(key, [d]);
    else g.push(d);
  }
  const out: DrugTotal[] = [];
  for (const g of groups.values()) {
    const first = g[0];
    const info = drugInfo(first.drug, facts, first.drugClass);
    const mass = MCG_PER[first.unit] !== undefined;
    let unit: DoseUnit = first.unit;
    let total: number;
    if (mass) {
      unit = MASS_ORDER.find((u) => g.some((d) => d.unit === u)) ?? first.unit;
      const per = MCG_PER[unit] ?? 1;
      total = clean(g.reduce((s, d) => s + (d.amount * (MCG_PER[d.unit] ?? 1)) / per, 0));
    } else {
      total = clean(g.reduce((s, d) => s + d.amount, 0));
    }
    let perKg: DrugTotal['perKg'] = null;
    if (mass && weightKg !== null && weightKg > 0) {
      const perKgUnit: PerKgUnit = unit === 'mcg' ? 'mcg/kg' : 'mg/kg';
      const inUnit = unit === 'g' ? total * 1000 : total;
      perKg = { value: clean(inUnit / weightKg), unit: perKgUnit };
    }
    out.push({ drug: first.drug, label: info.label, drugClass: info.drugClass, doseCount: g.length, total, unit, perKg });
  }
  return out;
}
