import { analyzeResuscitation } from '@/lib/rules/resuscitation';
import { MMHG_PER_KPA } from '@/lib/domain/channel';
import type { CaseEventKind } from '@/lib/domain/caseRecord';
import { ASA_MEANING, DEPTH_LABEL, bmi as bmiOf } from '@/lib/domain/caseFacts';
import { CAUTION_TEXT } from '@/lib/domain/caution';
import type { ExtremeValue } from '@/lib/domain/episode';
import { INTERVENTION_LABEL, INTERVENTION_LEVEL } from '@/lib/domain/intervention';
import { formatDate } from '@/lib/_shared/time';
import { DEFAULT_MAX_HOLD_S } from '@/lib/rules/coverage';
import { coSignatureNeeded } from './coSignature';
import { drugInfo, drugTotals } from './drugTotals';
import { clockAt, formatDateTime } from './format';
import { ABRUPT_APNEA_HINT, CASE_LEVEL_LABEL, CASE_LEVEL_MEANING, CONFIRM_INTERVENTIONS_REQUEST, ruleLabel } from './labels';
import { findDataGaps, samplingInterval } from './monitoring';
import { renderNoteText } from './noteText';
import type { CaseNote, ChannelUse, DepthId, EpisodeLine, InterventionLine, NoteInput, ResuscitationSection, TimePoint, TimedValue } from './types';

/**
 * Compose the case note of one case version: structured sections from the CaseRecord, its
 * Analysis (whatever rule set produced it) and the facts the database holds beside them, plus the
 * plain text rendered from those sections (`renderNoteText`). Pure; times are shown in `timeZone`.
 * Assumes a validated record and the analysis of that same record.
 *
 * @example
 * composeNote({ record, analysis: analyzeCase(record, PLATEAU_DEFAULT_V1), facts, timeZone: 'Europe/Dublin' }).drugs.totals[0]
 * //=> { drug: 'propofol', label: 'Propofol', total: 120, unit: 'mg', perKg: { value: 1.463414634, unit: 'mg/kg' }, … }
 */
export function composeNote(input: NoteInput): CaseNote {
  const { record, analysis, facts, timeZone } = input;
  const maxHoldS = input.maxHoldS ?? DEFAULT_MAX_HOLD_S;
  const startMs = Date.parse(record.case.start);
  const at = (t: number): TimePoint => ({ t, clock: clockAt(startMs, t, timeZone) });
  const event = (kind: CaseEventKind): TimePoint | null => {
    let best: number | null = null;
    for (const e of record.events) if (e.kind === kind && (best === null || e.t < best)) best = e.t;
    return best === null ? null : at(best);
  };
  const timed = (x: ExtremeValue | null, unit: TimedValue['unit']): TimedValue | null => (x === null ? null : { value: x.value, unit, at: at(x.t) });
  const depth = (d: DepthId | null) => (d === null ? null : { id: d, label: DEPTH_LABEL[d] ?? d });

  const weightKg = facts.weightKg ?? record.case.weightKg ?? null;
  const heightCm = facts.heightCm ?? record.case.heightCm ?? null;
  const summary = analysis.summary;
  const co2Unit = record.case.etco2Unit;
  const sed = summary.sedationTime;
  const dischargeT = facts.dischargeT ?? event('discharge')?.t ?? null;

  const interventionLine = (i: { t: number; kind: InterventionLine['kind']; note?: string }): InterventionLine => ({
    at: at(i.t),
    kind: i.kind,
    label: INTERVENTION_LABEL[i.kind],
    level: INTERVENTION_LEVEL[i.kind],
    ...(i.note !== undefined ? { note: i.note } : {}),
  });
  const notes = new Map(record.interventions.map((i) => [`${i.t}\u0000${i.kind}`, i.note]));

  const episodes: EpisodeLine[] = analysis.episodes.map((e, idx) => ({
    n: idx + 1,
    rule: e.rule,
    label: ruleLabel(e.rule),
    start: at(e.start),
    end: at(e.end),
    durationS: e.durationS,
    censored: e.censored,
    censoredAt: e.censoredAt,
    extremes: e.extremes.map((x) => ({ channel: x.channel, kind: x.kind, value: x.value, unit: x.unit, at: at(x.t) })),
    lastSedativeDose:
      e.lastSedativeDose === null || e.sinceLastSedativeDoseS === null
        ? null
        : {
            at: at(e.lastSedativeDose.t),
            drug: e.lastSedativeDose.drug,
            label: drugInfo(e.lastSedativeDose.drug, facts).label,
            amount: e.lastSedativeDose.amount,
            unit: e.lastSedativeDose.unit,
            sinceS: e.sinceLastSedativeDoseS,
          },
    interventions: e.interventions.map((i) => interventionLine({ t: i.t, kind: i.kind, note: notes.get(`${i.t}\u0000${i.kind}`) })),
    responseS: e.responseS,
    level: e.level,
    onsetAbrupt: e.onsetAbrupt,
    abruptOnsetHint: e.onsetAbrupt === true ? ABRUPT_APNEA_HINT : null,
  }));

  const channels: ChannelUse[] = record.series
    .filter((s) => s.t.length > 0)
    .map((s) => ({
      channel: s.channel,
      source: s.source,
      unit: s.unit,
      samples: s.t.length,
      intervalS: samplingInterval(s),
      first: at(s.t[0]),
      last: at(s.t[s.t.length - 1]),
    }));
  const monitored = new Set(record.series.filter((s) => s.source === 'monitor' && s.t.length > 0).map((s) => s.channel));

  const major = summary.majorPhysiology;
  const note: Omit<CaseNote, 'text'> = {
    format: 'plateau-note/1',
    version: facts.version,
    unitName: facts.unitName,
    timeZone,
    caseStartIso: new Date(startMs).toISOString(),
    patientAndRisk: {
      name: facts.patient.name,
      mrn: facts.patient.mrn,
      birthDate: facts.patient.birthDate,
      ageYears: facts.patient.ageYears ?? record.case.ageYears ?? null,
      sex: facts.patient.sex ?? record.case.sex ?? null,
      asa:
        facts.asaClass === null
          ? null
          : {
              class: facts.asaClass,
              emergency: facts.asaEmergency,
              label: `ASA ${facts.asaClass}${facts.asaEmergency ? 'E' : ''}`,
              meaning: ASA_MEANING[facts.asaClass],
            },
      weightKg,
      heightCm,
      bmi: facts.bmi ?? bmiOf(weightKg, heightCm),
      stopBang: facts.stopBang,
      airwayClass: facts.airwayClass,
    },
    procedure: {
      label: facts.procedureLabel,
      date: formatDate(new Date(startMs), timeZone),
      room: facts.room,
      proceduralist: facts.proceduralist,
      nurse: facts.nurse,
      plannedDepth: depth(facts.plannedDepth ?? record.case.plannedDepth ?? null),
      reachedDepth: depth(facts.reachedDepth),
    },
    times: {
      caseStart: at(0),
      sedationStart: event('sedation_start'),
      procedureStart: event('procedure_start'),
      procedureEnd: event('procedure_end'),
      recoveryStart: event('recovery_start'),
      sedationEnd: event('sedation_end'),
      discharge: dischargeT === null ? null : at(dischargeT),
      sedation: sed === null ? null : { start: at(sed.start), end: at(sed.end), durationS: sed.end - sed.start, startFrom: sed.startFrom, endFrom: sed.endFrom },
    },
    drugs: {
      doses: [...record.doses]
        .sort((a, b) => a.t - b.t)
        .map((d) => {
          const info = drugInfo(d.drug, facts, d.drugClass);
          return { at: at(d.t), drug: d.drug, label: info.label, drugClass: info.drugClass, amount: d.amount, unit: d.unit, route: d.route };
        }),
      totals: drugTotals(record.doses, weightKg, facts),
      weightKg,
    },
    monitoring: {
      channels,
      capnographyCoveragePct: summary.capnographyCoveragePct,
      maxHoldS,
      gaps: sed === null ? [] : findDataGaps(record, sed.start, sed.end, maxHoldS).map((g) => ({ channel: g.channel, start: at(g.start), end: at(g.end), durationS: g.end - g.start })),
      notMonitored: (['etco2', 'spo2'] as const).filter((c) => !monitored.has(c)),
    },
    physiology: {
      etco2Unit: co2Unit,
      baseline: { etco2: analysis.baseline.etco2, spo2: analysis.baseline.spo2, rr: analysis.baseline.rr },
      lowestSpo2: timed(summary.lowestSpo2, '%'),
      highestEtco2: timed(summary.highestEtco2, co2Unit),
      lowestEtco2: timed(summary.lowestEtco2, co2Unit),
      lowestRr: timed(summary.lowestRr, '/min'),
    },
    episodes,
    spotFindings: analysis.spotFindings.map((f) => ({ rule: f.rule, label: ruleLabel(f.rule), channel: f.channel, value: f.value, unit: f.unit, at: at(f.t) })),
    skipped: analysis.skipped,
    interventions: [...record.interventions].sort((a, b) => a.t - b.t).map(interventionLine),
    caseLevel: {
      level: analysis.caseLevel,
      label: CASE_LEVEL_LABEL[analysis.caseLevel],
      meaning: CASE_LEVEL_MEANING[analysis.caseLevel],
      majorPhysiology: major,
      confirmRequest: major ? CONFIRM_INTERVENTIONS_REQUEST : null,
      coSignatureNeeded: coSignatureNeeded(analysis),
    },
    recovery: {
      scores: [...facts.recoveryScores].sort((a, b) => a.t - b.t).map((s) => ({ at: at(s.t), total: s.total, items: { ...(s.items ?? {}) } })),
      discharge: dischargeT === null ? null : at(dischargeT),
    },
    resuscitation: resuscitationSection(record, at),
    freeText: facts.freeText !== null && facts.freeText.trim() !== '' ? facts.freeText : null,
    signatures: facts.signatures.map((s) => ({ by: s.by, role: s.role, at: s.at, atLocal: formatDateTime(s.at, timeZone), kind: s.kind, reason: s.reason ?? null })),
    ruleSet: { id: analysis.ruleSet.id, version: analysis.ruleSet.version },
    caution: CAUTION_TEXT,
  };
  return { ...note, text: renderNoteText(note) };
}

const BAND_WORDS: Record<string, string> = { good: 'above the ideal', minimum: 'at or above the minimum', below_minimum: 'below the minimum', no_data: 'no EtCO2' };

/** The resuscitation section: compression time, per-minute EtCO2, flags and the timeline (lib/rules/resuscitation). */
function resuscitationSection(record: NoteInput['record'], at: (t: number) => TimePoint): ResuscitationSection | null {
  const r = analyzeResuscitation(record);
  if (!r) return null;
  const unit = record.case.etco2Unit;
  const show = (mmHg: number | null) => (mmHg === null ? null : unit === 'kPa' ? Math.round((mmHg / MMHG_PER_KPA) * 100) / 100 : mmHg);
  return {
    rules: r.rules,
    compressionS: r.compressionS,
    periods: r.periods.map((p) => ({ start: at(p.start), end: p.end === null ? null : at(p.end), endedBy: p.endedBy })),
    minutes: r.minutes.map((m) => ({ minute: m.minute, median: show(m.medianMmHg), unit, band: BAND_WORDS[m.band] ?? m.band })),
    fatigueFlags: r.fatigueFlags.map((f) => ({ at: at(f.t), minute: f.minute })),
    possibleRoscFlags: r.possibleRoscFlags.map((f) => ({ at: at(f.t) })),
    timeline: r.timeline.map((x) => ({ at: at(x.t), label: x.label, ...(x.note ? { note: x.note } : {}) })),
  };
}
