import type { AldreteItem, CaseNote, EpisodeLine, InterventionLine, TimedValue, TimePoint } from './types';
import {
  formatBmi,
  formatChannelValue,
  formatCm,
  formatDoseAmount,
  formatDuration,
  formatInterval,
  formatKg,
  formatNumber,
  formatPerKg,
  formatPercent,
  formatScore,
} from './format';
import { CHANNEL_LABEL } from './labels';

const ALDRETE_ORDER: AldreteItem[] = ['activity', 'respiration', 'circulation', 'consciousness', 'oxygenation'];
const SIGNATURE_VERB = { signed: 'Signed', amended: 'Amended', cosigned: 'Co-signed' } as const;
const CENSORED_TEXT = {
  start: 'duration at least this: data began during the episode',
  end: 'duration at least this: data stopped during the episode',
  both: 'duration at least this: data began and stopped during the episode',
} as const;
const SEDATION_FROM = {
  sedation_start: 'sedation start',
  first_sedative_dose: 'first sedative dose',
  sedation_end: 'sedation end',
  recovery_start: 'recovery start',
  procedure_end: 'procedure end',
  end_of_monitoring: 'end of monitoring',
} as const;

/** The case's time markers in the order the note and the PDF list them. */
export function timeRows(t: CaseNote['times']): [string, TimePoint | null][] {
  return [
    ['Case start', t.caseStart],
    ['Sedation start', t.sedationStart],
    ['Procedure start', t.procedureStart],
    ['Procedure end', t.procedureEnd],
    ['Recovery start', t.recoveryStart],
    ['Sedation end', t.sedationEnd],
    ['Discharge', t.discharge],
  ];
}

function intervention(i: InterventionLine): string {
  return `${i.label} ${i.at.clock} (${i.level})${i.note !== undefined ? ` — ${i.note}` : ''}`;
}

function timedValue(label: string, x: TimedValue | null): string {
  return x === null ? `${label}: no reading` : `${label} ${formatChannelValue(x.value, x.unit)} at ${x.at.clock}`;
}

/** Key of what an episode's text shows besides its rule; episodes that share it are written once. */
function sameFacts(e: EpisodeLine): string {
  return JSON.stringify([e.start, e.end, e.durationS, e.censoredAt, e.extremes, e.onsetAbrupt, e.abruptOnsetHint, e.lastSedativeDose, e.interventions, e.responseS, e.level]);
}

/**
 * Adjacent episodes with the same span and facts (e.g. hypoxemia, prolonged and severe hypoxemia
 * over one desaturation) are written as one item naming every rule.
 */
export function groupEpisodes(episodes: EpisodeLine[]): EpisodeLine[][] {
  const groups: EpisodeLine[][] = [];
  for (const e of episodes) {
    const last = groups[groups.length - 1];
    if (last !== undefined && sameFacts(last[0]) === sameFacts(e)) last.push(e);
    else groups.push([e]);
  }
  return groups;
}

function episodeLines(group: EpisodeLine[]): string[] {
  const e = group[0];
  const n = group.length === 1 ? `${e.n}` : `${e.n}–${group[group.length - 1].n}`;
  const labels = group.map((x, i) => (i === 0 ? x.label : x.label.charAt(0).toLowerCase() + x.label.slice(1))).join(', ');
  const lines = [`${n}. ${labels} ${e.start.clock}–${e.end.clock}, ${formatDuration(e.durationS)}${e.censoredAt !== null ? ` (${CENSORED_TEXT[e.censoredAt]})` : ''}`];
  if (e.extremes.length > 0) {
    const parts = e.extremes.map((x) => `${x.kind} ${CHANNEL_LABEL[x.channel]} ${formatChannelValue(x.value, x.unit)} at ${x.at.clock}`);
    const joined = parts.join('; ');
    lines.push(`   ${joined.charAt(0).toUpperCase()}${joined.slice(1)}`);
  }
  if (e.abruptOnsetHint !== null) lines.push(`   Abrupt onset: ${e.abruptOnsetHint}.`);
  if (e.lastSedativeDose !== null) {
    const d = e.lastSedativeDose;
    lines.push(`   Last sedative dose ${d.label} ${formatDoseAmount(d.amount, d.unit)} at ${d.at.clock}, ${formatDuration(d.sinceS)} before onset`);
  }
  lines.push(e.interventions.length === 0 ? '   Interventions: none recorded' : `   Interventions: ${e.interventions.map(intervention).join('; ')}`);
  if (e.responseS !== null) lines.push(`   First intervention ${formatDuration(e.responseS)} after onset`);
  lines.push(`   Level: ${e.level}`);
  return lines;
}

/**
 * The note as plain text, one fact a line, drawn only from the structured note through the
 * formatting functions of `format.ts` (so every number in it is a field of the note).
 *
 * @example
 * renderNoteText(note).split('\n')[0]
 * //=> "Sedation note — Endoscopy Unit"
 */
export function renderNoteText(note: Omit<CaseNote, 'text'>): string {
  const out: string[] = [];
  const section = (title: string) => out.push('', title.toUpperCase());
  const p = note.patientAndRisk;
  const pr = note.procedure;

  out.push(`Sedation note — ${note.unitName}`);
  out.push(`Version ${note.version}; ${pr.date}; times in ${note.timeZone}`);

  section('Patient and risk');
  const who = [`${p.name}`, `MRN ${p.mrn}`];
  if (p.birthDate !== null) who.push(`born ${p.birthDate}`);
  if (p.ageYears !== null) who.push(`${formatNumber(p.ageYears, 0)} years`);
  if (p.sex !== null) who.push(p.sex);
  out.push(who.join(', '));
  out.push(p.asa === null ? 'ASA class not recorded' : `${p.asa.label}: ${p.asa.meaning}${p.asa.emergency ? ' (emergency)' : ''}`);
  out.push(
    [
      p.weightKg === null ? 'weight not recorded' : `weight ${formatKg(p.weightKg)}`,
      p.heightCm === null ? 'height not recorded' : `height ${formatCm(p.heightCm)}`,
      ...(p.bmi === null ? [] : [`BMI ${formatBmi(p.bmi)}`]),
    ]
      .join(', ')
      .replace(/^./, (c) => c.toUpperCase()),
  );
  out.push(p.stopBang === null ? 'STOP-Bang not recorded' : `STOP-Bang ${formatScore(p.stopBang.score)} (${p.stopBang.band} risk)`);
  out.push(p.airwayClass === null ? 'Airway class not recorded' : `Airway ${p.airwayClass}`);

  section('Procedure');
  out.push(`${pr.label ?? 'Procedure not recorded'}${pr.room !== null ? `; ${pr.room}` : ''}`);
  out.push(`Proceduralist ${pr.proceduralist ?? 'not recorded'}; sedation nurse ${pr.nurse ?? 'not recorded'}`);
  out.push(`Planned depth ${pr.plannedDepth?.label.toLowerCase() ?? 'not recorded'}; reached ${pr.reachedDepth?.label.toLowerCase() ?? 'not recorded'}`);

  section('Times');
  const t = note.times;
  for (const [label, tp] of timeRows(t)) if (tp !== null) out.push(`${label} ${tp.clock}`);
  out.push(
    t.sedation === null
      ? 'Sedation time not known (no sedation start and no sedative dose)'
      : `Sedation time ${formatDuration(t.sedation.durationS)} (${t.sedation.start.clock} ${SEDATION_FROM[t.sedation.startFrom]} to ${t.sedation.end.clock} ${SEDATION_FROM[t.sedation.endFrom]})`,
  );

  section('Drugs');
  const d = note.drugs;
  if (d.doses.length === 0) out.push('No drug recorded');
  for (const x of d.doses) out.push(`${x.at.clock} ${x.label} ${formatDoseAmount(x.amount, x.unit)} ${x.route}`);
  for (const x of d.totals) {
    const perKg = x.perKg === null ? '' : ` (${formatPerKg(x.perKg.value, x.perKg.unit)})`;
    out.push(`Total ${x.label} ${formatDoseAmount(x.total, x.unit)}${perKg} in ${formatNumber(x.doseCount, 0)} dose${x.doseCount === 1 ? '' : 's'}`);
  }
  if (d.totals.length > 0) out.push(d.weightKg === null ? 'No weight recorded: no per-kg doses' : `Per-kg doses for ${formatKg(d.weightKg)}`);

  section('Monitoring');
  const m = note.monitoring;
  for (const c of m.channels) {
    const how = c.source === 'monitor' ? `monitor, ${formatNumber(c.samples, 0)} samples${c.intervalS !== null ? ` every ${formatInterval(c.intervalS)}` : ''}` : `manual, ${formatNumber(c.samples, 0)} reading${c.samples === 1 ? '' : 's'}`;
    out.push(`${CHANNEL_LABEL[c.channel]} ${how}, ${c.first.clock}–${c.last.clock}`);
  }
  for (const c of m.notMonitored) out.push(`${CHANNEL_LABEL[c]} not monitored`);
  out.push(m.capnographyCoveragePct === null ? 'Capnography coverage not known (no sedation time)' : `Capnography coverage ${formatPercent(m.capnographyCoveragePct)} of the sedation time`);
  if (m.gaps.length === 0) {
    if (t.sedation !== null) out.push(`No EtCO2 or SpO2 gap longer than ${formatDuration(m.maxHoldS)} during the sedation time`);
  } else {
    for (const g of m.gaps) out.push(`${CHANNEL_LABEL[g.channel]} data gap ${g.start.clock}–${g.end.clock}, ${formatDuration(g.durationS)}`);
  }

  section('Physiology');
  const ph = note.physiology;
  const b = ph.baseline;
  out.push(
    `Baseline EtCO2 ${b.etco2 === null ? 'not known' : formatChannelValue(b.etco2, ph.etco2Unit)}, SpO2 ${b.spo2 === null ? 'not known' : formatChannelValue(b.spo2, '%')}, RR ${b.rr === null ? 'not known' : formatChannelValue(b.rr, '/min')}`,
  );
  out.push(timedValue('Lowest SpO2', ph.lowestSpo2));
  out.push(timedValue('Highest EtCO2', ph.highestEtco2));
  out.push(timedValue('Lowest EtCO2', ph.lowestEtco2));
  out.push(timedValue('Lowest RR', ph.lowestRr));

  section('Respiratory episodes');
  out.push(`Detected by rule set ${note.ruleSet.id} version ${note.ruleSet.version}`);
  if (note.episodes.length === 0) out.push('No respiratory episode');
  for (const group of groupEpisodes(note.episodes)) out.push(...episodeLines(group));
  for (const f of note.spotFindings) out.push(`Spot reading ${CHANNEL_LABEL[f.channel]} ${formatChannelValue(f.value, f.unit)} at ${f.at.clock} (${f.label})`);
  for (const s of note.skipped) out.push(`Not evaluated: ${s.rule}${s.dropped === 'term' ? ' (one term)' : ''}, ${s.reason}`);

  section('Interventions');
  if (note.interventions.length === 0) out.push('No intervention recorded');
  for (const i of note.interventions) out.push(`${i.at.clock} ${i.label} (${i.level})${i.note !== undefined ? ` — ${i.note}` : ''}`);

  section('Case level');
  const cl = note.caseLevel;
  out.push(`${cl.label}: ${cl.meaning}`);
  if (cl.confirmRequest !== null) out.push(cl.confirmRequest);
  if (cl.coSignatureNeeded) out.push('Co-signature required');

  if (note.resuscitation !== null) {
    const z = note.resuscitation;
    section('Resuscitation');
    out.push(`Compression time ${formatDuration(z.compressionS)} (${z.rules.id} v${z.rules.version})`);
    for (const x of z.timeline) out.push(`${x.at.clock} ${x.label}${x.note !== undefined ? ` — ${x.note}` : ''}`);
    for (const m of z.minutes) out.push(`Minute ${formatNumber(m.minute, 0)} of compressions: median EtCO2 ${m.median === null ? 'not recorded' : formatChannelValue(m.median, m.unit)} (${m.band})`);
    for (const f of z.fatigueFlags) out.push(`${f.at.clock} EtCO2 fell over consecutive minutes: compressor fatigue possible`);
    for (const f of z.possibleRoscFlags) out.push(`${f.at.clock} Abrupt sustained rise of EtCO2: pulse check prompted`);
  }

  section('Recovery');
  const r = note.recovery;
  if (r.scores.length === 0) out.push('No recovery score recorded');
  for (const s of r.scores) {
    const items = ALDRETE_ORDER.filter((k) => s.items[k] !== undefined).map((k) => `${k} ${formatScore(s.items[k] as number)}`);
    out.push(`${s.at.clock} Aldrete ${formatScore(s.total)}${items.length > 0 ? ` (${items.join(', ')})` : ''}`);
  }
  out.push(r.discharge === null ? 'Discharge not recorded' : `Discharge ${r.discharge.clock}`);

  if (note.freeText !== null) {
    section("Nurse's note");
    out.push(...note.freeText.split(/\r?\n/));
  }

  section('Signatures');
  if (note.signatures.length === 0) out.push('Not signed');
  for (const s of note.signatures) out.push(`${SIGNATURE_VERB[s.kind]} by ${s.by} (${s.role}), ${s.atLocal}${s.reason !== null ? `; reason: ${s.reason}` : ''}`);

  out.push('', `Rule set ${note.ruleSet.id} version ${note.ruleSet.version}`, note.caution);
  return out.join('\n');
}
