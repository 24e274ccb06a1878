import { describe, expect, it } from 'vitest';
import { chartDataFromCase, composeNote } from '@/lib/note';
import { renderNotePdf } from '@/lib/note/pdf';
import type { CaseRecord } from '@/lib/domain/caseRecord';
import { analyzeCase, PLATEAU_DEFAULT_V1 } from '@/lib/rules';
import { CASE_START, composed, factsFor, gapsCase, manyEpisodesCase, monitor, runs } from '@/tests/fixtures/notes/cases';
import fs from 'node:fs';
import { createRequire } from 'node:module';

const require = createRequire(import.meta.url);

describe('chartDataFromCase: what the PDF chart draws', () => {
  it('draws the sedation time with two minutes either side, the episodes and labelled doses', () => {
    const { record, analysis, facts } = composed(manyEpisodesCase());
    const chart = chartDataFromCase(record, analysis, facts);
    expect(chart.window).toEqual({ start: 140 - 120, end: 1560 + 120 });
    expect(chart.series.map((s) => s.channel)).toEqual(['etco2', 'spo2', 'rr']);
    expect(chart.episodes.map((e) => [e.rule, e.label, e.start, e.end])[0]).toEqual(['apnea', 'Apnea', 400, 445]);
    expect(chart.doses.map((d) => d.label)).toEqual(['Fentanyl 50 mcg', 'Midazolam 2 mg', 'Propofol 40 mg', 'Propofol 20 mg', 'Propofol 20 mg', 'Propofol 10 mg']);
  });

  it('leaves probe-off SpO2 out of the line (null) and converts EtCO2 recorded in mmHg for a kPa case', () => {
    const record = gapsCase();
    record.case.etco2Unit = 'kPa';
    const analysis = analyzeCase(record, PLATEAU_DEFAULT_V1);
    const chart = chartDataFromCase(record, analysis, factsFor());
    const spo2 = chart.series.find((s) => s.channel === 'spo2')!;
    expect(spo2.v.filter((v) => v === null)).toHaveLength(40);
    const etco2 = chart.series.find((s) => s.channel === 'etco2')!;
    expect(etco2.unit).toBe('kPa');
    expect(etco2.v[0]).toBeCloseTo(37 / 7.50062, 4); // 1 kPa = 7.50062 mmHg (references.md)
  });
});

describe('a case with nothing recorded yet', () => {
  const record: CaseRecord = { case: { start: CASE_START, etco2Unit: 'mmHg' }, series: [], doses: [], interventions: [], events: [] };
  const analysis = analyzeCase(record, PLATEAU_DEFAULT_V1);
  const facts = factsFor({ recoveryScores: [], dischargeT: null, freeText: null, signatures: [], stopBang: null, asaClass: null, airwayClass: null });
  const note = composeNote({ record, analysis, facts, timeZone: 'Europe/Dublin' });

  it('still composes a note that says what is missing', () => {
    for (const s of [
      'Sedation time not known (no sedation start and no sedative dose)',
      'No drug recorded',
      'EtCO2 not monitored',
      'SpO2 not monitored',
      'Capnography coverage not known (no sedation time)',
      'Baseline EtCO2 not known, SpO2 not known, RR not known',
      'Lowest SpO2: no reading',
      'No respiratory episode',
      'No recovery score recorded',
      'Discharge not recorded',
      'ASA class not recorded',
      'STOP-Bang not recorded',
      'Not signed',
    ]) {
      expect(note.text).toContain(s);
    }
    expect(note.text).not.toContain("NURSE'S NOTE");
  });

  it('renders a PDF with an empty chart', async () => {
    const font = new Uint8Array(fs.readFileSync(require.resolve('dejavu-fonts-ttf/ttf/DejaVuSans.ttf')));
    const pdf = await renderNotePdf(note, chartDataFromCase(record, analysis, facts), { pageSize: 'A4', font });
    expect(new TextDecoder().decode(pdf.slice(0, 5))).toBe('%PDF-');
    expect(pdf.length).toBeGreaterThan(5000);
  });
});

describe('a short series without a sedation time', () => {
  it('draws the whole record', () => {
    const record: CaseRecord = { case: { start: CASE_START, etco2Unit: 'mmHg' }, series: [monitor('rr', runs([12, 50]))], doses: [], interventions: [], events: [] };
    const chart = chartDataFromCase(record, analyzeCase(record, PLATEAU_DEFAULT_V1), factsFor());
    expect(chart.window).toEqual({ start: 0, end: 49 });
  });
});
