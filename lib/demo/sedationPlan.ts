/**
 * Regimen, planned depth, timeline and dose schedule of one demo case. Seconds from case start
 * (monitoring start). Doses follow common adult endoscopy practice in broad strokes only:
 * propofol bolus 0.5–1 mg/kg then 10–30 mg every 1–3 min; midazolam 1–2 mg then 0.5–1 mg;
 * fentanyl 25–100 mcg; ketamine 0.5–1 mg/kg then 10–20 mg. Invented for the demo.
 */
import type { DoseEntry } from '@/lib/domain/caseRecord';
import type { Rng } from './random';
import type { PlannedDepth, Regimen } from './types';
import { formularyDrug, procedureType, type ProcedureId } from './unit';

/** Regimen weights by procedure (invented; see docs/demo.md). */
export const REGIMEN_WEIGHTS: Record<ProcedureId, readonly (readonly [Regimen, number])[]> = {
  gastroscopy: [['propofol', 55], ['propofol_fentanyl', 10], ['midazolam_fentanyl', 31], ['ketamine', 4]],
  colonoscopy: [['propofol', 42], ['propofol_fentanyl', 30], ['midazolam_fentanyl', 25], ['ketamine', 3]],
  ercp: [['propofol', 30], ['propofol_fentanyl', 60], ['midazolam_fentanyl', 8], ['ketamine', 2]],
  eus: [['propofol', 55], ['propofol_fentanyl', 35], ['midazolam_fentanyl', 10], ['ketamine', 0]],
  bronchoscopy: [['propofol', 15], ['propofol_fentanyl', 15], ['midazolam_fentanyl', 62], ['ketamine', 8]],
};

export function chooseRegimen(rng: Rng, procedureId: ProcedureId): Regimen {
  return rng.weighted(REGIMEN_WEIGHTS[procedureId]);
}

export function chooseDepth(rng: Rng, regimen: Regimen, procedureId: ProcedureId): PlannedDepth {
  if (regimen === 'midazolam_fentanyl') return procedureId === 'gastroscopy' && rng.bernoulli(0.35) ? 'minimal' : 'moderate';
  if (regimen === 'ketamine') return rng.bernoulli(0.5) ? 'deep' : 'moderate';
  const deepP = procedureId === 'ercp' || procedureId === 'eus' ? 0.9 : 0.65;
  return rng.bernoulli(deepP) ? 'deep' : 'moderate';
}

export interface CaseTimeline {
  /** First sedative or opioid dose. */
  sedationStart: number;
  procedureStart: number;
  procedureEnd: number;
  sedationEnd: number;
  /** Patient leaves the room; the monitor series ends here. */
  recoveryStart: number;
}

export interface SedationPlan {
  timeline: CaseTimeline;
  doses: DoseEntry[];
}

export interface PlanSedationOptions {
  regimen: Regimen;
  depth: PlannedDepth;
  weightKg: number;
  ageYears: number;
  procedureId: ProcedureId;
}

function dose(t: number, drug: string, amount: number): DoseEntry {
  const f = formularyDrug(drug);
  return { t, drug, amount, unit: f.unit, route: f.route, drugClass: f.drugClass };
}

const roundTo = (x: number, step: number) => Math.round(x / step) * step;

/**
 * Plan the case: who gets what when, and the procedure's times. The monitor starts at 0;
 * the first dose comes 150–300 s later so the baseline window (rules.md §3) is full.
 */
export function planSedation(rng: Rng, o: PlanSedationOptions): SedationPlan {
  const doses: DoseEntry[] = [];
  const elderly = o.ageYears >= 75;
  const dosingKg = Math.min(o.weightKg, 100);
  const sedationStart = rng.int(150, 300);
  let mainT = sedationStart;
  let inductionS: number;

  switch (o.regimen) {
    case 'propofol':
    case 'propofol_fentanyl': {
      if (o.regimen === 'propofol_fentanyl') {
        const fent = elderly ? 25 : rng.weighted([[25, 3], [50, 5], [75, o.procedureId === 'ercp' ? 2 : 0.5], [100, o.procedureId === 'ercp' ? 1 : 0]] as const);
        doses.push(dose(sedationStart, 'fentanyl', fent));
        mainT = sedationStart + rng.int(30, 90);
      }
      const perKg = o.depth === 'deep' ? rng.uniform(0.5, 1.0) : rng.uniform(0.4, 0.7);
      let bolus = perKg * dosingKg * (elderly ? 0.7 : 1) * (o.regimen === 'propofol_fentanyl' ? 0.85 : 1);
      bolus = Math.min(100, Math.max(20, roundTo(bolus, 10)));
      // Now and then a bolus "far above usual", so the charting caution has something to show.
      if (rng.bernoulli(0.015)) bolus = rng.pick([120, 130, 150]);
      doses.push(dose(mainT, 'propofol', bolus));
      inductionS = rng.int(60, 150);
      break;
    }
    case 'midazolam_fentanyl': {
      const fent = elderly || o.depth === 'minimal' ? rng.pick([25, 50]) : rng.weighted([[50, 5], [75, 2], [100, 1]] as const);
      doses.push(dose(sedationStart, 'fentanyl', fent));
      mainT = sedationStart + rng.int(30, 90);
      const mid = elderly || o.depth === 'minimal' ? 1 : rng.weighted([[1, 3], [1.5, 2], [2, 3]] as const);
      doses.push(dose(mainT, 'midazolam', mid));
      inductionS = rng.int(120, 240);
      break;
    }
    case 'ketamine': {
      if (rng.bernoulli(0.25)) doses.push(dose(sedationStart, 'glycopyrrolate', 200));
      if (rng.bernoulli(0.6)) {
        doses.push(dose(sedationStart, 'midazolam', 1));
        mainT = sedationStart + rng.int(45, 90);
      }
      const ket = Math.min(100, Math.max(20, roundTo(rng.uniform(0.5, 1.0) * dosingKg * (elderly ? 0.7 : 1), 5)));
      doses.push(dose(mainT, 'ketamine', ket));
      inductionS = rng.int(90, 180);
      break;
    }
  }

  const proc = procedureType(o.procedureId).typicalMin;
  const procMin = Math.min(proc.max, Math.max(proc.min, proc.median * Math.exp(rng.normal(0, 0.3))));
  const procedureStart = mainT + inductionS;
  const procedureEnd = procedureStart + Math.round(procMin * 60);
  const sedationEnd = procedureEnd + rng.int(0, 30);
  const recoveryStart = sedationEnd + rng.int(90, 210);

  // Top-ups while the scope is in.
  const lastTopUp = procedureEnd - 60;
  if (o.regimen === 'propofol' || o.regimen === 'propofol_fentanyl') {
    const amounts = o.depth === 'deep' ? ([[10, 1], [20, 4], [30, 3]] as const) : ([[10, 3], [20, 2]] as const);
    for (let t = mainT + rng.int(60, 150); t < lastTopUp; t += rng.int(60, 180)) {
      doses.push(dose(t, 'propofol', rng.weighted(amounts)));
    }
    if (o.regimen === 'propofol_fentanyl' && procedureEnd - procedureStart > 1800 && rng.bernoulli(0.5)) {
      doses.push(dose(procedureStart + rng.int(900, 1500), 'fentanyl', 25));
    }
  } else if (o.regimen === 'midazolam_fentanyl') {
    const maxMid = elderly || o.depth === 'minimal' ? 3 : 5;
    let totalMid = doses.filter((d) => d.drug === 'midazolam').reduce((s, d) => s + d.amount, 0);
    for (let t = mainT + rng.int(240, 480); t < procedureEnd - 120; t += rng.int(240, 600)) {
      const step = elderly ? 0.5 : 1;
      if (totalMid + step > maxMid || !rng.bernoulli(0.7)) continue;
      totalMid += step;
      doses.push(dose(t, 'midazolam', step));
    }
    let totalFent = doses.filter((d) => d.drug === 'fentanyl').reduce((s, d) => s + d.amount, 0);
    for (let t = sedationStart + rng.int(600, 900); t < procedureEnd - 180; t += rng.int(600, 900)) {
      if (totalFent + 25 > 200 || !rng.bernoulli(0.5)) continue;
      totalFent += 25;
      doses.push(dose(t, 'fentanyl', 25));
    }
  } else {
    for (let t = mainT + rng.int(300, 480); t < lastTopUp; t += rng.int(300, 480)) {
      doses.push(dose(t, 'ketamine', rng.pick([10, 15, 20])));
    }
  }
  doses.sort((a, b) => a.t - b.t || a.drug.localeCompare(b.drug));
  return { timeline: { sedationStart, procedureStart, procedureEnd, sedationEnd, recoveryStart }, doses };
}
