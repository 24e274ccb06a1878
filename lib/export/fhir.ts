import type {
  Bundle,
  BundleEntry,
  CodeableConcept,
  Coding,
  DocumentReference,
  Encounter,
  FhirResource,
  MedicationAdministration,
  Observation,
  ObservationComponent,
  Patient,
  Procedure,
  Quantity,
  Reference,
} from 'fhir/r4';
import type { Channel, SampleUnit } from '@/lib/domain/channel';
import type { SampleSeries } from '@/lib/domain/caseRecord';
import type { DoseUnit } from '@/lib/domain/drug';
import { medianInterval } from '@/lib/rules/coverage';
import { CHANNEL_LABEL } from '@/lib/note/labels';
import type { CaseNote, NoteInput } from '@/lib/note/types';
import { encodeSampledData, toSampledGrid } from './sampledData';

/**
 * One FHIR R4 Bundle (type `collection`) per case version: Patient, Encounter, a Procedure for the
 * clinical procedure and one for the sedation, an Observation with SampledData per monitor series
 * (EtCO2, RR, SpO2, HR), an Observation per manual reading, a MedicationAdministration per dose,
 * an Observation per respiratory episode (Plateau's own rule codes, with the rule set id and
 * version), a case-summary Observation, and the note text as a DocumentReference. Pure.
 * docs/note.md maps it resource by resource.
 */

export const LOINC = 'http://loinc.org';
export const UCUM = 'http://unitsofmeasure.org';
/** Plateau's own code systems (URNs: no web page stands behind them). */
export const PLATEAU_RULE_SYSTEM = 'urn:plateau:rule';
export const PLATEAU_RULE_SET_SYSTEM = 'urn:plateau:rule-set';
export const PLATEAU_LEVEL_SYSTEM = 'urn:plateau:level';
export const PLATEAU_INTERVENTION_SYSTEM = 'urn:plateau:intervention';
export const PLATEAU_FIELD_SYSTEM = 'urn:plateau:note-field';
export const PLATEAU_CASE_SYSTEM = 'urn:plateau:case';

/**
 * LOINC codes of the channels (references.md; 9279-1, 8867-4 and 2708-6 are the codes fixed by the
 * FHIR R4 vital-signs profiles; 19891-1 and 59408-5 from memory). SpO2 carries both 59408-5 (by
 * pulse oximetry) and 2708-6 (the vital-signs profile's code), as US Core does.
 */
export const CHANNEL_LOINC: Record<'etco2' | 'rr' | 'spo2' | 'hr', Coding[]> = {
  etco2: [{ system: LOINC, code: '19891-1', display: 'Carbon dioxide [Partial pressure] in Exhaled gas --at end expiration' }],
  rr: [{ system: LOINC, code: '9279-1', display: 'Respiratory rate' }],
  spo2: [
    { system: LOINC, code: '59408-5', display: 'Oxygen saturation in Arterial blood by Pulse oximetry' },
    { system: LOINC, code: '2708-6', display: 'Oxygen saturation in Arterial blood' },
  ],
  hr: [{ system: LOINC, code: '8867-4', display: 'Heart rate' }],
};

/** UCUM codes of Plateau's sample units. */
export const SAMPLE_UNIT_UCUM: Record<SampleUnit, string> = { mmHg: 'mm[Hg]', kPa: 'kPa', '%': '%', '/min': '/min' };
/** UCUM codes of dose units ("units" as an annotated unity: the kind of unit is not recorded). */
export const DOSE_UNIT_UCUM: Record<DoseUnit, string> = { mg: 'mg', mcg: 'ug', g: 'g', mL: 'mL', units: '{units}' };

export interface FhirIds {
  /** Base of the fullUrls, e.g. "https://plateau.example.org/fhir"; references are relative to it. */
  baseUrl: string;
  patient: string;
  encounter: string;
  /** The case id; every other resource id is derived from it (keep it ≤ 40 characters). */
  case: string;
  /** Identifier system of the MRN; default "urn:plateau:mrn". */
  mrnSystem?: string;
}

export interface CaseToFhirInput extends NoteInput {
  note: CaseNote;
  ids: FhirIds;
  /** Bundle.timestamp (ISO instant); default the last signature, else the case start. */
  generatedAt?: string;
}

/**
 * A FHIR id from any string: characters outside [A-Za-z0-9-.] become "-", cut to 64.
 * @example fhirId('case_12/3') //=> "case-12-3"
 */
export function fhirId(s: string): string {
  return s.replace(/[^A-Za-z0-9\-.]/g, '-').slice(0, 64);
}

function quantity(value: number, unit: string, code: string): Quantity {
  return { value, unit, system: UCUM, code };
}

function seconds(value: number): Quantity {
  return quantity(value, 's', 's');
}

function field(code: string, text: string): CodeableConcept {
  return { coding: [{ system: PLATEAU_FIELD_SYSTEM, code }], text };
}

/**
 * The case as one FHIR R4 collection Bundle.
 *
 * @example
 * caseToFhirBundle({ record, analysis, facts, timeZone, note, ids }).entry?.map((e) => e.resource?.resourceType)
 * //=> ['Patient', 'Encounter', 'Procedure', 'Procedure', 'Observation', …, 'MedicationAdministration', …, 'DocumentReference']
 */
export function caseToFhirBundle(input: CaseToFhirInput): Bundle {
  const { record, note, ids } = input;
  const startMs = Date.parse(record.case.start);
  const iso = (t: number) => new Date(startMs + Math.round(t * 1000)).toISOString();
  const base = ids.baseUrl.replace(/\/+$/, '');
  const entries: BundleEntry[] = [];
  const add = (resource: FhirResource & { id?: string }): Reference => {
    const ref = `${resource.resourceType}/${resource.id}`;
    entries.push({ fullUrl: `${base}/${ref}`, resource });
    return { reference: ref };
  };
  const caseKey = fhirId(ids.case);
  const rid = (suffix: string) => fhirId(`${caseKey}-${suffix}`);

  const p = note.patientAndRisk;
  const patientRef = add({
    resourceType: 'Patient',
    id: fhirId(ids.patient),
    identifier: [
      {
        use: 'usual',
        type: { coding: [{ system: 'http://terminology.hl7.org/CodeSystem/v2-0203', code: 'MR', display: 'Medical record number' }] },
        system: ids.mrnSystem ?? 'urn:plateau:mrn',
        value: p.mrn,
      },
    ],
    name: [{ text: p.name }],
    ...(p.sex !== null ? { gender: p.sex } : {}),
    ...(p.birthDate !== null ? { birthDate: p.birthDate } : {}),
  } satisfies Patient);
  const subject = { ...patientRef, display: p.name };

  const t = note.times;
  const encounterRef = add({
    resourceType: 'Encounter',
    id: fhirId(ids.encounter),
    identifier: [{ system: PLATEAU_CASE_SYSTEM, value: ids.case }],
    status: t.discharge !== null ? 'finished' : 'in-progress',
    class: { system: 'http://terminology.hl7.org/CodeSystem/v3-ActCode', code: 'AMB', display: 'ambulatory' },
    type: [{ text: 'Procedural sedation' }],
    subject,
    period: { start: iso(0), ...(t.discharge !== null ? { end: iso(t.discharge.t) } : {}) },
    ...(note.procedure.nurse !== null ? { participant: [{ type: [{ text: 'Sedation nurse' }], individual: { display: note.procedure.nurse } }] } : {}),
    ...(note.procedure.room !== null ? { location: [{ location: { display: note.procedure.room } }] } : {}),
    serviceProvider: { display: note.unitName },
  } satisfies Encounter);

  add({
    resourceType: 'Procedure',
    id: rid('procedure'),
    status: t.procedureEnd !== null ? 'completed' : 'in-progress',
    code: { text: note.procedure.label ?? 'Procedure' },
    subject,
    encounter: encounterRef,
    ...(t.procedureStart !== null ? { performedPeriod: { start: iso(t.procedureStart.t), ...(t.procedureEnd !== null ? { end: iso(t.procedureEnd.t) } : {}) } } : {}),
    ...(note.procedure.proceduralist !== null ? { performer: [{ function: { text: 'Proceduralist' }, actor: { display: note.procedure.proceduralist } }] } : {}),
  } satisfies Procedure);

  const depth = note.procedure.reachedDepth ?? note.procedure.plannedDepth;
  const sedationProcedureRef = add({
    resourceType: 'Procedure',
    id: rid('sedation'),
    status: t.sedation !== null ? 'completed' : 'in-progress',
    code: { text: `Procedural sedation${depth !== null ? ` (${depth.label.toLowerCase()})` : ''}` },
    subject,
    encounter: encounterRef,
    ...(t.sedation !== null ? { performedPeriod: { start: iso(t.sedation.start.t), end: iso(t.sedation.end.t) } } : {}),
    ...(note.procedure.nurse !== null ? { performer: [{ function: { text: 'Sedation nurse' }, actor: { display: note.procedure.nurse } }] } : {}),
    ...(note.procedure.plannedDepth !== null || note.procedure.reachedDepth !== null
      ? {
          note: [
            {
              text: `Planned depth ${note.procedure.plannedDepth?.label.toLowerCase() ?? 'not recorded'}; reached ${note.procedure.reachedDepth?.label.toLowerCase() ?? 'not recorded'}`,
            },
          ],
        }
      : {}),
  } satisfies Procedure);

  const vitalSigns: CodeableConcept[] = [
    { coding: [{ system: 'http://terminology.hl7.org/CodeSystem/observation-category', code: 'vital-signs', display: 'Vital Signs' }] },
  ];
  const seriesRefs: Partial<Record<Channel, Reference>> = {};
  const exported = new Set<string>();
  record.series.forEach((s: SampleSeries, si) => {
    if (s.channel !== 'etco2' && s.channel !== 'rr' && s.channel !== 'spo2' && s.channel !== 'hr') return;
    if (s.t.length === 0) return;
    const code: CodeableConcept = { coding: CHANNEL_LOINC[s.channel], text: CHANNEL_LABEL[s.channel] };
    const values = s.v.map((x, i) => (s.channel === 'spo2' && (x === 0 || s.probeOff?.[i] === true) ? null : x));
    if (s.source === 'monitor') {
      const key = `monitor-${s.channel}`;
      if (exported.has(key)) return;
      exported.add(key);
      const periodS = s.t.length > 1 ? Math.max(0.001, Math.round(medianInterval(s.t) * 1000) / 1000) : 1;
      const grid = toSampledGrid(s.t, values, periodS);
      seriesRefs[s.channel] = add({
        resourceType: 'Observation',
        id: rid(s.channel),
        status: 'final',
        category: vitalSigns,
        code,
        subject,
        encounter: encounterRef,
        effectivePeriod: { start: iso(grid.originT), end: iso(grid.originT + (grid.values.length - 1) * periodS) },
        device: { display: 'Patient monitor' },
        valueSampledData: {
          origin: quantity(0, s.unit, SAMPLE_UNIT_UCUM[s.unit]),
          period: Math.round(periodS * 1000 * 1000) / 1000,
          dimensions: 1,
          data: encodeSampledData(grid.values),
        },
      } satisfies Observation);
    } else {
      s.t.forEach((ti, i) => {
        const v = values[i];
        add({
          resourceType: 'Observation',
          id: rid(`${s.channel}-manual-${si}-${i + 1}`),
          status: 'final',
          category: vitalSigns,
          code,
          subject,
          encounter: encounterRef,
          effectiveDateTime: iso(ti),
          ...(v === null ? { dataAbsentReason: { text: 'probe off' } } : { valueQuantity: quantity(v, s.unit, SAMPLE_UNIT_UCUM[s.unit]) }),
        } satisfies Observation);
      });
    }
  });

  note.drugs.doses.forEach((d, i) => {
    add({
      resourceType: 'MedicationAdministration',
      id: rid(`dose-${i + 1}`),
      status: 'completed',
      medicationCodeableConcept: { text: d.label },
      subject,
      context: encounterRef,
      partOf: [sedationProcedureRef],
      effectiveDateTime: iso(d.at.t),
      dosage: { route: { text: d.route }, dose: quantity(d.amount, d.unit, DOSE_UNIT_UCUM[d.unit]) },
    } satisfies MedicationAdministration);
  });

  const ruleSet = note.ruleSet;
  const method: CodeableConcept = {
    coding: [{ system: PLATEAU_RULE_SET_SYSTEM, code: ruleSet.id, version: String(ruleSet.version) }],
    text: `Plateau rule set ${ruleSet.id} version ${ruleSet.version}`,
  };
  const levelConcept = (level: string): CodeableConcept => ({ coding: [{ system: PLATEAU_LEVEL_SYSTEM, code: level }], text: level });
  const episodeCategory: CodeableConcept[] = [{ coding: [{ system: PLATEAU_FIELD_SYSTEM, code: 'respiratory-episode', display: 'Respiratory episode' }] }];
  note.episodes.forEach((e) => {
    const components: ObservationComponent[] = e.extremes.map((x) => {
      const channelCode = x.channel === 'inspco2' ? undefined : CHANNEL_LOINC[x.channel];
      return {
        code: { ...(channelCode !== undefined ? { coding: channelCode } : {}), text: `${x.kind} ${CHANNEL_LABEL[x.channel]}` },
        valueQuantity: quantity(x.value, x.unit, SAMPLE_UNIT_UCUM[x.unit]),
      };
    });
    components.push({ code: field('level', 'Level'), valueCodeableConcept: levelConcept(e.level) });
    components.push({ code: field('censored', 'Censored'), valueBoolean: e.censored });
    if (e.responseS !== null) components.push({ code: field('response-time', 'Time to first intervention'), valueQuantity: seconds(e.responseS) });
    for (const iv of e.interventions) {
      components.push({
        code: field('intervention', 'Intervention'),
        valueCodeableConcept: { coding: [{ system: PLATEAU_INTERVENTION_SYSTEM, code: iv.kind, display: iv.label }], text: `${iv.label} at ${iso(iv.at.t)}` },
      });
    }
    if (e.onsetAbrupt !== null) components.push({ code: field('abrupt-onset', 'Abrupt onset'), valueBoolean: e.onsetAbrupt });
    const derivedFrom = [...new Set(e.extremes.map((x) => x.channel))].map((c) => seriesRefs[c]).filter((r): r is Reference => r !== undefined);
    add({
      resourceType: 'Observation',
      id: rid(`episode-${e.n}`),
      status: 'final',
      category: episodeCategory,
      code: { coding: [{ system: PLATEAU_RULE_SYSTEM, version: `${ruleSet.id}@${ruleSet.version}`, code: e.rule, display: e.label }], text: e.label },
      subject,
      encounter: encounterRef,
      effectivePeriod: { start: iso(e.start.t), end: iso(e.end.t) },
      valueQuantity: seconds(e.durationS),
      method,
      ...(derivedFrom.length > 0 ? { derivedFrom } : {}),
      ...(e.abruptOnsetHint !== null ? { note: [{ text: `Abrupt onset: ${e.abruptOnsetHint}.` }] } : {}),
      component: components,
    } satisfies Observation);
  });

  const cl = note.caseLevel;
  const summaryComponents: ObservationComponent[] = [
    { code: field('major-physiology', 'Major physiology'), valueBoolean: cl.majorPhysiology },
    { code: field('co-signature-needed', 'Co-signature needed'), valueBoolean: cl.coSignatureNeeded },
    { code: field('episode-count', 'Respiratory episodes'), valueInteger: note.episodes.length },
  ];
  if (note.monitoring.capnographyCoveragePct !== null) {
    summaryComponents.push({ code: field('capnography-coverage', 'Capnography coverage of the sedation time'), valueQuantity: quantity(note.monitoring.capnographyCoveragePct, '%', '%') });
  }
  if (t.sedation !== null) summaryComponents.push({ code: field('sedation-time', 'Sedation time'), valueQuantity: seconds(t.sedation.durationS) });
  add({
    resourceType: 'Observation',
    id: rid('summary'),
    status: 'final',
    code: { coding: [{ system: PLATEAU_FIELD_SYSTEM, code: 'case-level', display: 'Case level' }], text: 'Sedation case level' },
    subject,
    encounter: encounterRef,
    ...(t.sedation !== null ? { effectivePeriod: { start: iso(t.sedation.start.t), end: iso(t.sedation.end.t) } } : { effectiveDateTime: iso(0) }),
    valueCodeableConcept: levelConcept(cl.level),
    method,
    ...(cl.confirmRequest !== null ? { note: [{ text: cl.confirmRequest }] } : {}),
    component: summaryComponents,
  } satisfies Observation);

  const lastSignature = note.signatures[note.signatures.length - 1];
  const signedAt = lastSignature?.at;
  add({
    resourceType: 'DocumentReference',
    id: rid(`note-v${note.version}`),
    identifier: [{ system: PLATEAU_CASE_SYSTEM, value: `${ids.case}/note/${note.version}` }],
    status: 'current',
    docStatus: note.signatures.length === 0 ? 'preliminary' : note.signatures.some((s) => s.kind === 'amended') ? 'amended' : 'final',
    type: { text: 'Procedural sedation note' },
    subject,
    ...(signedAt !== undefined ? { date: new Date(signedAt).toISOString() } : {}),
    ...(note.signatures.length > 0 ? { author: [...new Set(note.signatures.map((s) => s.by))].map((by) => ({ display: by })) } : {}),
    description: `Sedation note version ${note.version}`,
    ...(note.version > 1 ? { relatesTo: [{ code: 'replaces', target: { reference: `DocumentReference/${rid(`note-v${note.version - 1}`)}` } }] } : {}),
    content: [
      {
        attachment: {
          contentType: 'text/plain; charset=utf-8',
          language: 'en',
          data: base64Utf8(note.text),
          title: `Sedation note — ${p.name} — version ${note.version}`,
          ...(signedAt !== undefined ? { creation: new Date(signedAt).toISOString() } : {}),
        },
      },
    ],
    context: {
      encounter: [encounterRef],
      ...(t.sedation !== null ? { period: { start: iso(t.sedation.start.t), end: iso(t.sedation.end.t) } } : {}),
      related: [sedationProcedureRef],
    },
  } satisfies DocumentReference);

  const timestamp = input.generatedAt ?? (signedAt !== undefined ? new Date(signedAt).toISOString() : iso(0));
  return {
    resourceType: 'Bundle',
    id: rid(`bundle-v${note.version}`),
    identifier: { system: PLATEAU_CASE_SYSTEM, value: `${ids.case}/bundle/${note.version}` },
    type: 'collection',
    timestamp,
    entry: entries,
  };
}

/** Base64 of a string's UTF-8 bytes, without Node's Buffer (pure and portable). */
export function base64Utf8(text: string): string {
  const bytes = new TextEncoder().encode(text);
  let binary = '';
  const chunk = 0x8000;
  for (let i = 0; i < bytes.length; i += chunk) binary += String.fromCharCode(...bytes.subarray(i, i + chunk));
  return btoa(binary);
}
