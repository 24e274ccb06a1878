/**
 * Which respiratory events a demo case gets, when, and what the nurse did about them.
 * Rates are invented for the demo (docs/demo.md gives them), not taken from clinical data.
 * Everything is in seconds from case start; `end` is exclusive.
 */
import type { DoseEntry, InterventionEntry } from '@/lib/domain/caseRecord';
import type { InterventionKind } from '@/lib/domain/intervention';
import { asaNumber } from './assessment';
import type { Rng } from './random';
import type { CaseTimeline } from './sedationPlan';
import type { DemoAssessment, InjectedEvent, Regimen } from './types';
import { formularyDrug } from './unit';

/** Per-case probability of at least one apnea, before the patient's risk multiplier. */
export const APNEA_BASE_P: Record<Regimen, number> = { propofol: 0.21, propofol_fentanyl: 0.24, midazolam_fentanyl: 0.06, ketamine: 0.04 };
export const HYPOVENTILATION_BASE_P: Record<Regimen, number> = { propofol: 0.04, propofol_fentanyl: 0.08, midazolam_fentanyl: 0.11, ketamine: 0.03 };
export const BRADYPNEA_BASE_P: Record<Regimen, number> = { propofol: 0.03, propofol_fentanyl: 0.07, midazolam_fentanyl: 0.09, ketamine: 0.02 };
/** Share of apneas that are prolonged (60–110 s); the rest last 10–40 s. */
export const PROLONGED_APNEA_SHARE = 0.05;
export const STANDALONE_DESATURATION_P = 0.015;
export const LINE_DISCONNECTION_P = 0.025;
export const PROBE_OFF_P = 0.06;

/** An injected event with the shape parameters the signal synthesis needs. */
export interface SignalEvent extends InjectedEvent {
  /** Seconds of lead-in before `start` (apnea: EtCO2 decline; desaturation: fall from baseline to 90 %). */
  leadS?: number;
  /** Seconds of recovery after `end`. */
  tailS?: number;
  /** Hypoventilation: RR during the plateau; bradypnea: EtCO2 rise. */
  aux?: number;
}

export interface EventPlan {
  events: SignalEvent[];
  interventions: InterventionEntry[];
  /** Doses after the plan: top-ups withheld around events removed, reversal doses added. */
  doses: DoseEntry[];
  /** The timeline, shortened when the procedure was stopped early. */
  timeline: CaseTimeline;
}

export interface PlanEventsOptions {
  regimen: Regimen;
  assessment: DemoAssessment;
  timeline: CaseTimeline;
  doses: DoseEntry[];
  /** SpO2 on room air before sedation (worse baseline, faster desaturation). */
  spo2Air: number;
}

/** The patient's multiplier on event probabilities: obesity, STOP-Bang, age, ASA, depth, airway. */
export function riskMultiplier(a: DemoAssessment): number {
  let r = a.bmi > 35 ? 1.5 : a.bmi > 30 ? 1.15 : 1;
  r *= a.stopBang.risk === 'high' ? 1.35 : a.stopBang.risk === 'intermediate' ? 1.1 : 1;
  if (a.ageYears >= 70) r *= 1.2;
  if (asaNumber(a.asaClass) >= 3) r *= 1.15;
  r *= a.plannedDepth === 'deep' ? 1.15 : a.plannedDepth === 'moderate' ? 0.9 : 0.5;
  if (a.mallampati === 'III' || a.mallampati === 'IV') r *= 1.1;
  return r;
}

interface Window {
  a: number;
  b: number;
}

interface Placed {
  event: SignalEvent;
  window: Window;
  interventions: InterventionEntry[];
  reversal: DoseEntry[];
  /** Index of the dose the event followed, kept when top-ups are withheld. */
  anchor: number | null;
  withholds: boolean;
}

const clamp01 = (x: number) => Math.min(1, Math.max(0, x));

export function planRespiratoryEvents(rng: Rng, o: PlanEventsOptions): EventPlan {
  const { regimen, assessment: a } = o;
  let timeline = { ...o.timeline };
  const r = riskMultiplier(a);
  const lo = timeline.sedationStart + 15;
  const hi = Math.min(timeline.procedureEnd + 60, timeline.recoveryStart - 20);
  const placed: Placed[] = [];
  const doses = o.doses;
  const hasDrug = (drug: string) => doses.some((d) => d.drug === drug);
  const propofolBased = regimen === 'propofol' || regimen === 'propofol_fentanyl';
  const depressants = doses.map((d, i) => [d, i] as const).filter(([d]) => d.drugClass === 'sedative' || d.drugClass === 'opioid');

  const fits = (w: Window) => w.a >= lo && w.b <= hi && placed.every((p) => w.b <= p.window.a || w.a >= p.window.b);

  /** Try a few candidate starts; return the first that fits. */
  const tryPlace = <C extends { window: Window }>(make: () => C): C | null => {
    for (let i = 0; i < 12; i++) {
      const c = make();
      if (fits(c.window)) return c;
    }
    return null;
  };

  const anchorFor = (lagMin: number, lagMax: number): { t: number; index: number } => {
    let choices: (readonly [number, number])[];
    if (propofolBased) {
      const prop = depressants.filter(([d]) => d.drug === 'propofol');
      choices = prop.map(([, i], k) => [i, k === 0 ? 5 : 1] as const);
    } else {
      choices = depressants.filter(([d]) => d.drug !== 'fentanyl' || regimen === 'midazolam_fentanyl').map(([, i], k) => [i, k < 2 ? 3 : 1] as const);
    }
    const index = rng.weighted(choices);
    return { t: doses[index].t + rng.int(lagMin, lagMax), index };
  };

  const add = (c: { event: SignalEvent; window: Window; anchor: number | null }, withholds: boolean) => {
    const p: Placed = { ...c, interventions: [], reversal: [], withholds };
    placed.push(p);
    return p;
  };

  const intervene = (p: Placed, t: number, kind: InterventionKind) => {
    p.interventions.push({ t: Math.round(t), kind });
    if (kind === 'naloxone') p.reversal.push(reversalDose(Math.round(t) + 1, 'naloxone', 100));
    if (kind === 'flumazenil') p.reversal.push(reversalDose(Math.round(t) + 1, 'flumazenil', 0.2));
  };
  const has = (p: Placed, kind: InterventionKind) => p.interventions.some((i) => i.kind === kind);

  // Desaturation following an apnea (or standing alone): SpO2 < 90 % from `start` to `end`.
  const desaturation = (onset: number, prolonged: boolean, standalone: boolean): SignalEvent => {
    let nadir: number;
    let belowS: number;
    if (standalone) {
      nadir = rng.uniform(86, 89.3);
      belowS = rng.int(15, 35);
    } else if (prolonged) {
      nadir = rng.bernoulli(0.8) ? rng.uniform(80, 88) : rng.uniform(66, 79);
      belowS = rng.int(40, 100);
    } else {
      nadir = rng.weighted([[1, 0.8], [2, 0.18], [3, 0.02]] as const) === 1 ? rng.uniform(86, 89.3) : rng.bernoulli(0.9) ? rng.uniform(80, 85.9) : rng.uniform(70, 79);
      if (nadir < 80 && nadir >= 79) nadir = 79;
      belowS = rng.int(15, 45);
    }
    nadir = Math.round(nadir);
    return { kind: 'desaturation', start: onset, end: onset + belowS, value: nadir, leadS: rng.int(8, 15), tailS: rng.int(15, 35) };
  };

  // 1. Apneas.
  const apneaP = clamp01(APNEA_BASE_P[regimen] * r);
  const apneaCount = rng.bernoulli(Math.min(0.7, apneaP)) ? 1 + (rng.bernoulli(0.25) ? 1 : 0) + (rng.bernoulli(0.08) ? 1 : 0) : 0;
  for (let k = 0; k < apneaCount; k++) {
    const prolonged = rng.bernoulli(PROLONGED_APNEA_SHARE);
    const dur = prolonged ? rng.int(60, 110) : rng.int(10, 40);
    // Most apneas fade in over 12–18 s of shallower breaths; some stop at once (obstruction).
    // Gradual ones keep the last EtCO2 ≥ 25 mmHg more than 5 s before the first < 5 (rules.md §5).
    const abrupt = rng.bernoulli(0.15);
    const leadS = abrupt ? rng.int(2, 3) : rng.int(12, 18);
    const tailS = rng.int(25, 45);
    const wantsDesat = rng.bernoulli(
      prolonged ? 0.85 : dur >= 20 ? clamp01(0.22 + 0.01 * (dur - 20) + (a.bmi > 35 ? 0.15 : 0) + (o.spo2Air < 96 ? 0.1 : 0) + (asaNumber(a.asaClass) >= 3 ? 0.05 : 0)) : 0.04,
    );
    const lag = rng.int(30, 60);
    const c = tryPlace(() => {
      const anchor = anchorFor(30, 120);
      const s = anchor.t;
      const event: SignalEvent = { kind: 'apnea', start: s, end: s + dur, onsetAbrupt: abrupt, leadS, tailS };
      const desat = wantsDesat ? desaturation(s + lag, prolonged, false) : null;
      const b = Math.max(s + dur + tailS, desat ? desat.end + (desat.tailS ?? 0) : 0) + 10;
      return { event, window: { a: s - leadS - 5, b }, anchor: anchor.index, desat };
    });
    if (!c) continue;
    const p = add(c, true);
    const s = c.event.start;
    const desat = c.desat;
    if (prolonged) {
      intervene(p, s + rng.int(5, 20), 'jaw_thrust');
      intervene(p, s + rng.int(15, 35), 'oxygen_increase');
      if (rng.bernoulli(0.45)) {
        const tb = s + rng.int(35, 55);
        intervene(p, tb, 'bag_mask');
        // Ventilation by mask brings CO2 back on the capnogram soon after.
        c.event.end = Math.min(c.event.end, Math.max(s + 60, tb + rng.int(10, 20)));
      }
      if (hasDrug('fentanyl') && !propofolBased && rng.bernoulli(0.35)) intervene(p, s + rng.int(40, 90), 'naloxone');
      if (hasDrug('midazolam') && rng.bernoulli(0.25)) intervene(p, s + rng.int(45, 95), 'flumazenil');
      if (rng.bernoulli(0.08)) intervene(p, s + rng.int(60, dur + 30), 'procedure_stopped');
    } else if (rng.bernoulli(dur >= 20 ? 0.85 : 0.45)) {
      const first = rng.int(5, Math.max(5, Math.min(40, dur - 1)));
      const kind = rng.weighted([['stimulation', 45], ['chin_lift', 30], ['jaw_thrust', 25]] as const);
      intervene(p, s + first, kind);
      if (dur - first > 15 && kind !== 'jaw_thrust' && rng.bernoulli(0.5)) intervene(p, s + first + rng.int(8, 15), 'jaw_thrust');
      if (propofolBased && rng.bernoulli(0.25)) intervene(p, s + rng.int(3, 15), 'sedation_paused');
    }
    if (desat) {
      const sub = add({ event: desat, window: { a: desat.start, b: desat.start }, anchor: null }, false);
      // The desaturation shares the apnea's window; its interventions are charted with it.
      const recentO2 = p.interventions.some((i) => i.kind === 'oxygen_increase');
      if (!recentO2 && rng.bernoulli(0.85)) intervene(sub, desat.start - rng.int(0, 10) + rng.int(0, 15), 'oxygen_increase');
      const nadir = desat.value ?? 90;
      if (nadir < 85 && !has(p, 'jaw_thrust')) intervene(sub, desat.start + rng.int(3, 12), 'jaw_thrust');
      if (nadir < 85 && rng.bernoulli(a.bmi > 35 ? 0.3 : 0.15)) intervene(sub, desat.start + rng.int(5, 20), 'nasal_airway');
      if (nadir < 75 && !has(p, 'bag_mask') && rng.bernoulli(0.7)) intervene(sub, desat.start + rng.int(5, 20), 'bag_mask');
      if (nadir < 75 && !has(p, 'procedure_stopped') && rng.bernoulli(0.3)) intervene(sub, desat.start + rng.int(10, 30), 'procedure_stopped');
    }
  }

  // 2. Hypoventilation: EtCO2 ≥ 50 mmHg plateau, mostly after opioid and benzodiazepine doses.
  if (rng.bernoulli(clamp01(HYPOVENTILATION_BASE_P[regimen] * r))) {
    const dur = rng.int(35, 150);
    const leadS = rng.int(20, 40);
    const tailS = rng.int(20, 40);
    const c = tryPlace(() => {
      const anchor = anchorFor(60, 300);
      const s = anchor.t;
      const event: SignalEvent = { kind: 'hypoventilation', start: s, end: s + dur, value: Math.round(rng.uniform(51, 62)), leadS, tailS, aux: rng.int(8, 11) };
      return { event, window: { a: s - leadS - 5, b: s + dur + tailS + 10 }, anchor: anchor.index };
    });
    if (c) {
      const p = add(c, true);
      if (rng.bernoulli(0.5)) intervene(p, c.event.start + rng.int(10, 40), 'stimulation');
      if (rng.bernoulli(0.2)) intervene(p, c.event.start + rng.int(5, 30), 'sedation_paused');
      if (hasDrug('fentanyl') && rng.bernoulli(0.04)) intervene(p, c.event.start + rng.int(30, 90), 'naloxone');
    }
  }

  // 3. Bradypnea: RR 3–7 /min for 35–120 s, EtCO2 a little up.
  if (rng.bernoulli(clamp01(BRADYPNEA_BASE_P[regimen] * r))) {
    const dur = rng.int(35, 120);
    const c = tryPlace(() => {
      const anchor = anchorFor(60, 300);
      const s = anchor.t;
      const event: SignalEvent = { kind: 'bradypnea', start: s, end: s + dur, value: rng.int(4, 7), leadS: 10, tailS: 10, aux: rng.uniform(3, 8) };
      return { event, window: { a: s - 15, b: s + dur + 20 }, anchor: anchor.index };
    });
    if (c) {
      const p = add(c, false);
      if (rng.bernoulli(0.4)) intervene(p, c.event.start + rng.int(10, 30), 'stimulation');
      if (hasDrug('fentanyl') && rng.bernoulli(0.03)) intervene(p, c.event.start + rng.int(30, 90), 'naloxone');
    }
  }

  // 4. Desaturation without apnea (shallow breathing, obstruction without loss of capnogram).
  if (rng.bernoulli(clamp01(STANDALONE_DESATURATION_P * r))) {
    const c = tryPlace(() => {
      const anchor = anchorFor(60, 400);
      const event = desaturation(anchor.t, false, true);
      return { event, window: { a: event.start - (event.leadS ?? 0) - 10, b: event.end + (event.tailS ?? 0) + 10 }, anchor: anchor.index };
    });
    if (c) {
      const p = add(c, true);
      if (rng.bernoulli(0.8)) intervene(p, c.event.start + rng.int(3, 20), 'oxygen_increase');
      if (rng.bernoulli(0.3)) intervene(p, c.event.start + rng.int(5, 25), 'chin_lift');
    }
  }

  // 5. Artefacts: sampling-line disconnection (EtCO2 38 → 0 within 2 s, SpO2 fine) and probe off.
  if (rng.bernoulli(LINE_DISCONNECTION_P)) {
    const dur = rng.int(8, 45);
    const c = tryPlace(() => {
      const s = rng.int(lo + 30, Math.max(lo + 31, hi - dur - 30));
      const event: SignalEvent = { kind: 'line_disconnection', start: s, end: s + dur, onsetAbrupt: true };
      return { event, window: { a: s - 5, b: s + dur + 5 }, anchor: null };
    });
    if (c) add(c, false);
  }
  if (rng.bernoulli(PROBE_OFF_P)) {
    const dur = rng.int(10, 60);
    const mode: 'zero' | 'gap' = rng.bernoulli(0.5) ? 'zero' : 'gap';
    const c = tryPlace(() => {
      const s = rng.int(lo + 10, Math.max(lo + 11, hi - dur - 10));
      const event: SignalEvent = { kind: 'probe_off', start: s, end: s + dur, mode };
      return { event, window: { a: s - 5, b: s + dur + 5 }, anchor: null };
    });
    if (c) add(c, false);
  }

  // Procedure stopped early: the scope comes out, no more sedation, later events never happen.
  let kept = placed;
  let outDoses = doses.slice();
  const stops = placed.flatMap((p) => p.interventions.filter((i) => i.kind === 'procedure_stopped'));
  const stop = stops.length ? Math.min(...stops.map((i) => i.t)) : null;
  if (stop !== null && stop > timeline.procedureStart + 30 && stop < timeline.procedureEnd) {
    const owner = placed.find((p) => p.interventions.some((i) => i.t === stop && i.kind === 'procedure_stopped'));
    kept = placed.filter((p) => p.event.start <= stop || p === owner);
    const windowEnd = Math.max(...kept.map((p) => p.window.b));
    const procedureEnd = stop + rng.int(30, 90);
    const sedationEnd = Math.min(timeline.sedationEnd, stop);
    const recoveryStart = Math.max(windowEnd + 10, procedureEnd + 30, Math.min(procedureEnd + rng.int(180, 360), timeline.recoveryStart));
    timeline = { ...timeline, procedureEnd, sedationEnd, recoveryStart };
    outDoses = outDoses.filter((d) => d.t <= stop || d.drugClass === 'reversal');
  } else if (stop !== null) {
    // Too early or too late to matter: chart it as a pause instead.
    for (const p of placed) for (const i of p.interventions) if (i.kind === 'procedure_stopped') i.kind = 'sedation_paused';
  }

  // Top-ups are withheld for a while around an event (never the doses the events followed).
  const anchors = new Set(kept.map((p) => p.anchor).filter((i): i is number => i !== null));
  const withheld = kept.filter((p) => p.withholds).map((p) => ({ a: p.event.start - 10, b: p.event.end + 90 }));
  const firstT = new Map<string, number>();
  for (const d of doses) if (!firstT.has(d.drug)) firstT.set(d.drug, d.t);
  outDoses = outDoses.filter((d) => {
    const i = doses.indexOf(d);
    if (anchors.has(i) || firstT.get(d.drug) === d.t || d.drugClass === 'reversal') return true;
    return !withheld.some((w) => d.t >= w.a && d.t <= w.b);
  });
  for (const p of kept) outDoses.push(...p.reversal);
  outDoses.sort((x, y) => x.t - y.t || x.drug.localeCompare(y.drug));

  const interventions = kept.flatMap((p) => p.interventions).sort((x, y) => x.t - y.t || x.kind.localeCompare(y.kind));
  const events = kept.map((p) => p.event).sort((x, y) => x.start - y.start || x.kind.localeCompare(y.kind));
  return { events, interventions, doses: outDoses, timeline };
}

function reversalDose(t: number, drug: 'naloxone' | 'flumazenil', amount: number): DoseEntry {
  const f = formularyDrug(drug);
  return { t, drug, amount, unit: f.unit, route: f.route, drugClass: f.drugClass };
}
