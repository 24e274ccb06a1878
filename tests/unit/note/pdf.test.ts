/**
 * The PDF is checked from outside with poppler-utils (Debian package; .ci/run installs it):
 * pdftoppm renders the pages (grey PGM at 50 dpi, parsed here), pdftotext reads the text back,
 * pdffonts lists the fonts. The fonts come from the npm package dejavu-fonts-ttf (DejaVu Sans
 * 2.37), else Debian's fonts-dejavu-core; the caller of renderNotePdf reads the file the same way.
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CaseRecord } from '@/lib/domain/caseRecord';
import { chartDataFromCase } from '@/lib/note';
import { renderNotePdf } from '@/lib/note/pdf';
import { CASE_START, composed, kpaCase, manyEpisodesCase, monitor, quietCase, runs } from '@/tests/fixtures/notes/cases';
import { fontFile, inkPerPage, pdftotext, tool } from '../../helpers/pdf';

let dir = '';
const font = fontFile('DejaVuSans.ttf');
const fontBold = fontFile('DejaVuSans-Bold.ttf');

beforeAll(() => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'plateau-pdf-'));
});
afterAll(() => {
  fs.rmSync(dir, { recursive: true, force: true });
});

async function render(record: CaseRecord, name: string, pageSize: 'A4' | 'LETTER', opts: Parameters<typeof composed>[1] = {}) {
  const c = composed(record, opts);
  const bytes = await renderNotePdf(c.note, chartDataFromCase(c.record, c.analysis, c.facts), { pageSize, font, fontBold });
  const file = path.join(dir, `${name}.pdf`);
  fs.writeFileSync(file, bytes);
  return { ...c, bytes, file };
}

describe('the case note as PDF', () => {
  it('renders the many-episode case on A4 with ink on every page and the A4 MediaBox (595.28 × 841.89 pt)', async () => {
    const { bytes, file } = await render(manyEpisodesCase(), 'many-a4', 'A4');
    expect(new TextDecoder().decode(bytes.slice(0, 5))).toBe('%PDF-');
    const latin1 = Buffer.from(bytes).toString('latin1');
    const boxes = [...latin1.matchAll(/\/MediaBox \[([^\]]+)\]/g)].map((m) => m[1].trim());
    expect(boxes.length).toBeGreaterThan(0);
    expect(new Set(boxes)).toEqual(new Set(['0 0 595.28 841.89']));
    const ink = inkPerPage(file, dir);
    expect(ink.length).toBe(boxes.length);
    for (const share of ink) expect(share).toBeGreaterThan(0.005);
    // the first page carries the chart: much more ink than a text-only page would
    expect(ink[0]).toBeGreaterThan(0.03);
  }, 30_000);

  it('renders the kPa case on US Letter (612 × 792 pt)', async () => {
    const { bytes, file } = await render(kpaCase(), 'kpa-letter', 'LETTER', { timeZone: 'America/New_York', facts: { weightKg: null } });
    const boxes = [...Buffer.from(bytes).toString('latin1').matchAll(/\/MediaBox \[([^\]]+)\]/g)].map((m) => m[1].trim());
    expect(new Set(boxes)).toEqual(new Set(['0 0 612 792']));
    for (const share of inkPerPage(file, dir)) expect(share).toBeGreaterThan(0.005);
    const text = pdftotext(file);
    expect(text).toContain('Highest EtCO2 6.9 kPa at 04:10:00');
    expect(text).toContain('Total Fentanyl 75 mcg in 2 doses');
    expect(text).toContain('No weight recorded: no per-kg doses');
  }, 30_000);

  it('reads back the case facts, the drug totals and the episode rows with pdftotext', async () => {
    const { file, note } = await render(manyEpisodesCase(), 'many-text', 'A4');
    const text = pdftotext(file);
    for (const s of ['Endoscopy Unit', 'Sedation note · version 1', 'Ada Example', '0042137', '1961-04-02, 64 years, female', 'ASA III', 'Colonoscopy', 'Dr B. Scope', 'C. Nurse', '5 (high risk)', 'Mallampati II', '82 kg, 175 cm, BMI 26.8 kg/m²']) {
      expect(text).toContain(s);
    }
    for (const t of note.drugs.totals) expect(text).toContain(`Total ${t.label}`);
    expect(text).toContain('Total Propofol 90 mg (1.1 mg/kg) in 4 doses');
    expect(text).toContain('Total Fentanyl 50 mcg (0.61 mcg/kg) in 1 dose');
    expect(text).toContain('Capnography coverage 100 % of the sedation time');
    // one table row per episode: number, rule, span, duration, extreme, …, level
    const rows: [number, string, string, string, string][] = [
      [1, 'Apnea', '09:06:40–09:07:25', '45 s', 'corrected'],
      [2, 'Hypoxemia', '09:07:10–09:07:50', '40 s', 'corrected'],
      [3, 'Hypoventilation', '09:15:00–09:16:00', '1 min', 'observed'],
      [4, 'Bradypnea', '09:18:20–09:19:00', '40 s', 'corrected'],
      [5, 'Hypoxemia', '09:20:00–09:21:10', '1 min 10 s', 'supported'],
    ];
    for (const [n, rule, span, duration, level] of rows) {
      expect(text).toMatch(new RegExp(`^\\s*${n}\\s+${rule}\\s+${span}\\s+${duration}\\s+.*${level}\\s*$`, 'm'));
    }
    expect(text).toMatch(/lowest EtCO2 0 mmHg/);
    expect(text).toMatch(/Abrupt onset \(episode 1\): may also be a disconnected or blocked sampling line/);
    expect(text).toContain('Signed by C. Nurse (nurse), 2 Mar 2026 09:55');
    expect(text).toContain('Rule set plateau-default version 1');
    expect(text).toMatch(/Page 1 of 2/);
    expect(text).toMatch(/Page 2 of 2/);
  }, 30_000);

  it('embeds DejaVu Sans and no built-in AFM font', async () => {
    const { file } = await render(quietCase(), 'fonts', 'A4');
    const out = execFileSync(tool('pdffonts'), [file], { encoding: 'utf8' });
    const rows = out.split('\n').slice(2).filter((l) => l.trim() !== '');
    expect(rows.length).toBeGreaterThan(0);
    for (const r of rows) {
      expect(r).toMatch(/DejaVuSans/);
      expect(r).toMatch(/TrueType/);
      expect(r.split(/\s+/).includes('yes')).toBe(true); // emb
    }
    expect(out).not.toMatch(/Helvetica|Times|Courier/);
  }, 30_000);

  it('breaks a long episode table across pages and numbers every page "n of m"', async () => {
    // 40 apneas of 25 s each, one every minute after a 200 s baseline
    const parts: [number, number][] = [[38, 200]];
    for (let i = 0; i < 40; i++) parts.push([0, 25], [38, 35]);
    const etco2 = runs(...parts);
    const record: CaseRecord = {
      case: { start: CASE_START, weightKg: 90, etco2Unit: 'mmHg' },
      series: [monitor('etco2', etco2), monitor('spo2', runs([97, etco2.length])), monitor('rr', runs([12, etco2.length]))],
      doses: [{ t: 150, drug: 'propofol', amount: 60, unit: 'mg', route: 'IV' }],
      interventions: [],
      events: [{ t: 140, kind: 'sedation_start' }],
    };
    const { file, note } = await render(record, 'long', 'LETTER');
    expect(note.episodes.filter((e) => e.rule === 'apnea')).toHaveLength(40);
    const text = pdftotext(file);
    const pages = text.split('\f').filter((p) => p.trim() !== '');
    expect(pages.length).toBeGreaterThanOrEqual(3);
    pages.forEach((p, i) => expect(p).toContain(`Page ${i + 1} of ${pages.length}`));
    expect(text).toMatch(/^\s*40\s+Apnea\s+/m);
    // the header row is repeated on the page the table continues on
    expect(pages.filter((p) => /Rule\s+Time\s+Duration\s+Extreme/.test(p)).length).toBeGreaterThanOrEqual(2);
    for (const share of inkPerPage(file, dir)) expect(share).toBeGreaterThan(0.005);
  }, 60_000);

  it('gives the same bytes for the same note (the dates come from the note, not the clock)', async () => {
    const a = await render(manyEpisodesCase(), 'same-1', 'A4');
    const b = await render(manyEpisodesCase(), 'same-2', 'A4');
    expect(Buffer.from(a.bytes).equals(Buffer.from(b.bytes))).toBe(true);
  }, 30_000);
});
