/**
 * One fictional demo case: assessment, sedation, monitor series, events, interventions,
 * manual vitals, recovery, and a status decided by the reference "now".
 */
import type { CaseEventEntry, CaseRecord, SampleSeries } from '@/lib/domain/caseRecord';
import { assessVisit } from './assessment';
import type { DemoPatient } from './patient';
import type { Rng } from './random';
import { manualVitals, recoveryCourse } from './recovery';
import { planRespiratoryEvents } from './respiratoryEvents';
import { chooseDepth, chooseRegimen, planSedation } from './sedationPlan';
import { drawBaselines, synthesizeSignals } from './signals';
import type { DemoCase, DemoCaseStatus, InjectedEvent, Regimen } from './types';
import type { ProcedureId } from './unit';

export interface DemoCaseParams {
  /** Stable key, e.g. 'demo-0001'. */
  key: string;
  /** Scheduled start, ISO 8601 UTC; the monitor starts here and all times count from it. */
  start: string;
  patient: DemoPatient;
  procedureId: ProcedureId;
  roomId: string;
  proceduralistId: string;
  nurseUsername: string;
  /**
   * Reference "now", ISO 8601 UTC. Before the start: `draft` (facts, no data). Until the note is
   * signed (after discharge): `in_progress`, data up to now. Later, or when omitted: `signed`.
   */
  now?: string;
  /** Force the regimen (tests and scenarios); otherwise drawn by procedure. */
  regimen?: Regimen;
}

/**
 * Generate one case. Each part draws from its own fork of `rng` (assessment, plan, events,
 * signals, recovery), so the same rng key gives the same case whatever else was generated.
 * The age is taken on the start's UTC date.
 * @example generateDemoCase(createRng(1).fork('case:demo-0001'), params).record.series.length //=> 4
 */
export function generateDemoCase(rng: Rng, params: DemoCaseParams): DemoCase {
  const startMs = Date.parse(params.start);
  if (Number.isNaN(startMs)) throw new Error(`generateDemoCase: start is not an ISO instant: ${params.start}`);
  const date = new Date(startMs).toISOString().slice(0, 10);
  const rPlan = rng.fork('plan');
  const regimen = params.regimen ?? chooseRegimen(rPlan, params.procedureId);
  const plannedDepth = chooseDepth(rPlan, regimen, params.procedureId);
  const assessment = assessVisit(rng.fork('assessment'), params.patient, { date, procedureId: params.procedureId, plannedDepth });
  const sedation = planSedation(rPlan, { regimen, depth: plannedDepth, weightKg: assessment.weightKg, ageYears: assessment.ageYears, procedureId: params.procedureId });
  const baselines = drawBaselines(rng.fork('baselines'), assessment);
  const plan = planRespiratoryEvents(rng.fork('events'), {
    regimen,
    assessment,
    timeline: sedation.timeline,
    doses: sedation.doses,
    spo2Air: baselines.spo2Air,
  });
  const tl = plan.timeline;
  const signals = synthesizeSignals(rng.fork('signals'), {
    endS: tl.recoveryStart,
    doses: plan.doses,
    weightKg: assessment.weightKg,
    ageYears: assessment.ageYears,
    timeline: tl,
    events: plan.events,
    baselines,
  });
  const rRecovery = rng.fork('recovery');
  const vitals = manualVitals(rRecovery.fork('vitals'), {
    endS: tl.recoveryStart,
    ageYears: assessment.ageYears,
    hypertension: assessment.stopBang.highBloodPressure,
    effect: signals.effect,
    propofolEffect: signals.propofolEffect,
    hr: signals.hr,
    procedureStart: tl.procedureStart,
  });
  const eventful = plan.events.some((e) => (e.kind === 'apnea' && e.end - e.start >= 60) || (e.kind === 'desaturation' && (e.value ?? 90) < 85));
  const recovery = recoveryCourse(rRecovery.fork('aldrete'), { recoveryStart: tl.recoveryStart, regimen, eventful, spo2Air: baselines.spo2Air });
  const events: CaseEventEntry[] = [
    { t: tl.sedationStart, kind: 'sedation_start' },
    { t: tl.procedureStart, kind: 'procedure_start' },
    { t: tl.procedureEnd, kind: 'procedure_end' },
    { t: tl.sedationEnd, kind: 'sedation_end' },
    { t: tl.recoveryStart, kind: 'recovery_start' },
    { t: recovery.discharge, kind: 'discharge' },
  ];
  const rDisplay = rng.fork('display');
  const etco2Unit = rDisplay.bernoulli(0.1) ? 'kPa' : 'mmHg';
  const signedAtS = recovery.discharge + rDisplay.int(300, 1800);

  const record: CaseRecord = {
    case: {
      start: new Date(startMs).toISOString(),
      weightKg: assessment.weightKg,
      heightCm: assessment.heightCm,
      etco2Unit,
      ageYears: assessment.ageYears,
      sex: assessment.sex,
      asaClass: assessment.asaClass,
      plannedDepth,
      procedure: params.procedureId,
    },
    series: signals.series,
    doses: plan.doses,
    interventions: plan.interventions,
    events,
  };
  const injected: InjectedEvent[] = plan.events.map(({ kind, start, end, value, mode, onsetAbrupt }) => {
    const e: InjectedEvent = { kind, start, end };
    if (value !== undefined) e.value = value;
    if (mode !== undefined) e.mode = mode;
    if (onsetAbrupt !== undefined) e.onsetAbrupt = onsetAbrupt;
    return e;
  });

  const full: DemoCase = {
    key: params.key,
    status: 'signed',
    patientMrn: params.patient.mrn,
    roomId: params.roomId,
    procedureId: params.procedureId,
    proceduralistId: params.proceduralistId,
    nurseUsername: params.nurseUsername,
    regimen,
    assessment,
    record,
    manualVitals: vitals,
    aldrete: recovery.aldrete,
    injected,
    signed: { by: params.nurseUsername, at: new Date(startMs + signedAtS * 1000).toISOString() },
  };
  if (params.now === undefined) return full;
  const nowMs = Date.parse(params.now);
  if (Number.isNaN(nowMs)) throw new Error(`generateDemoCase: now is not an ISO instant: ${params.now}`);
  const nowS = (nowMs - startMs) / 1000;
  const status: DemoCaseStatus = nowS < 0 ? 'draft' : nowS < signedAtS ? 'in_progress' : 'signed';
  if (status === 'signed') return full;
  return truncateCase(full, status === 'draft' ? -1 : Math.floor(nowS), status);
}

function truncateSeries(s: SampleSeries, untilS: number): SampleSeries {
  let k = 0;
  while (k < s.t.length && s.t[k] <= untilS) k++;
  const out: SampleSeries = { channel: s.channel, unit: s.unit, source: s.source, t: s.t.slice(0, k), v: s.v.slice(0, k) };
  if (s.probeOff) {
    const flags = s.probeOff.slice(0, k);
    if (flags.some(Boolean)) out.probeOff = flags;
  }
  return out;
}

/** The case as charted up to `untilS` seconds (inclusive); −1 keeps no data at all. */
function truncateCase(c: DemoCase, untilS: number, status: DemoCaseStatus): DemoCase {
  const r = c.record;
  const upTo = <T extends { t: number }>(xs: readonly T[]) => xs.filter((x) => x.t <= untilS);
  return {
    ...c,
    status,
    record: {
      case: r.case,
      series: untilS < 0 ? [] : r.series.map((s) => truncateSeries(s, untilS)),
      doses: upTo(r.doses),
      interventions: upTo(r.interventions),
      events: upTo(r.events),
    },
    manualVitals: upTo(c.manualVitals),
    aldrete: upTo(c.aldrete),
    injected: c.injected.filter((e) => e.start <= untilS).map((e) => ({ ...e, end: Math.min(e.end, untilS + 1) })),
    signed: null,
  };
}
