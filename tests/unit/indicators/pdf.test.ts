/**
 * The report PDF, checked from outside with poppler-utils (Debian package; .ci/run installs it):
 * pdftoppm renders every page (grey PGM at 40 dpi, parsed here) and pdftotext reads the text
 * back. DejaVu Sans comes from the npm package dejavu-fonts-ttf, else Debian's fonts-dejavu-core.
 */
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import { createRequire } from 'node:module';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildIndicatorReport, type IndicatorReport } from '@/lib/indicators/report';
import { getCatalogue } from '@/lib/indicators/catalogue';
import { parsePeriod, periodsEndingWith } from '@/lib/indicators/period';
import { renderReportPdf } from '@/lib/indicators/pdf';
import { row, rows, SCOPE } from './_rows';

const require = createRequire(import.meta.url);

function fontFile(name: string): Uint8Array {
  for (const c of [() => require.resolve(`dejavu-fonts-ttf/ttf/${name}`), () => `/usr/share/fonts/truetype/dejavu/${name}`]) {
    try {
      const p = c();
      if (fs.existsSync(p)) return new Uint8Array(fs.readFileSync(p));
    } catch {
      // next place
    }
  }
  throw new Error(`font ${name} not found: npm install (dejavu-fonts-ttf) or apt-get install fonts-dejavu-core`);
}

function tool(name: string): string {
  for (const dir of ['/usr/bin', '/usr/local/bin']) if (fs.existsSync(path.join(dir, name))) return path.join(dir, name);
  throw new Error(`${name} is missing: apt-get install poppler-utils`);
}

/** Share of pixels darker than 200 of 255, per page (binary PGM P5 from pdftoppm -gray). */
function inkPerPage(pdf: string, dir: string): number[] {
  const prefix = path.join(dir, 'page');
  execFileSync(tool('pdftoppm'), ['-r', '40', '-gray', pdf, prefix]);
  return fs
    .readdirSync(dir)
    .filter((f) => f.startsWith('page-') && f.endsWith('.pgm'))
    .sort()
    .map((f) => {
      const buf = fs.readFileSync(path.join(dir, f));
      const header = /^P5\s+(\d+)\s+(\d+)\s+255\s/.exec(buf.subarray(0, 40).toString('latin1'))!;
      const pixels = buf.subarray(header[0].length);
      let dark = 0;
      for (const p of pixels) if (p < 200) dark++;
      return dark / (Number(header[1]) * Number(header[2]));
    });
}

const SEP = parsePeriod('2026-09')!;
let dir = '';
let report: IndicatorReport;
let file = '';
let bytes: Uint8Array;

beforeAll(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'plateau-ind-pdf-'));
  const data = periodsEndingWith(SEP, 24).flatMap((m, i) => [
    ...rows(60, 6 + (i % 3), { date: `${m.label}-08` }, { interventions: ['bag_mask'], episodes: { hypoxemia: 1, apnea: 1 } }),
    ...[12, 15, 20, 9, 30, 41].map((s) => row({ date: `${m.label}-09`, episodes: { apnea: 1 }, firstApneaResponseS: s })),
  ]);
  report = buildIndicatorReport({ catalogue: getCatalogue(1), period: SEP, scope: SCOPE, rows: data, generatedOn: '2026-12-01' });
  report = { ...report, issue: { reportKey: '2026-09/unit-a', version: 2, issuedOn: '2026-12-01', issuedBy: 'Safety Officer' } };
  bytes = await renderReportPdf(report, { font: fontFile('DejaVuSans.ttf'), fontBold: fontFile('DejaVuSans-Bold.ttf') });
  file = path.join(dir, 'report.pdf');
  fs.writeFileSync(file, bytes);
});
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('the indicator report as PDF', () => {
  it('is a PDF with the embedded TrueType font and none of the built-in AFM fonts', () => {
    expect(new TextDecoder().decode(bytes.slice(0, 5))).toBe('%PDF-');
    const latin1 = Buffer.from(bytes).toString('latin1');
    expect(latin1).toMatch(/\/FontFile2/);
    expect(latin1).toMatch(/DejaVuSans/);
    expect(latin1).not.toMatch(/\/BaseFont \/Helvetica/);
  });

  it('has a title page, one page per indicator and a methods page, each with ink (pdftoppm)', () => {
    const ink = inkPerPage(file, dir);
    expect(ink).toHaveLength(1 + report.indicators.length + 1);
    for (const share of ink) expect(share).toBeGreaterThan(0.004);
  });

  it('prints every indicator with its table rows, definition, version and "Page n of m" (pdftotext)', () => {
    const text = execFileSync(tool('pdftotext'), ['-layout', file, '-'], { encoding: 'utf8' });
    const pages = text.split('\f').filter((p) => p.trim());
    expect(pages).toHaveLength(15);
    pages.forEach((p, i) => expect(p).toContain(`Page ${i + 1} of 15`));
    expect(pages[0]).toContain('Sedation safety indicators');
    expect(pages[0]).toContain('September 2026');
    expect(pages[0]).toContain('Issued version 2');
    report.indicators.forEach((ind, i) => {
      const page = pages[i + 1].replace(/\s+/g, ' ');
      expect(page, ind.id).toContain(ind.definition.title);
      expect(page).toContain('Definition');
      expect(page).toMatch(/This period 2026-09/);
      expect(page).toMatch(/Previous 2026-08/);
      expect(page).toMatch(/Year earlier 2025-09/);
      expect(page).toContain(`indicator ${ind.id}, catalogue version 1, rule set plateau-default version 1`);
    });
    const ppv = report.indicators.find((i) => i.id === 'positive_pressure_ventilation')!;
    const ppvPage = pages[1 + report.indicators.indexOf(ppv)];
    const line = ppvPage.split('\n').find((l) => l.includes('This period 2026-09'))!;
    expect(line.replace(/\s+/g, ' ')).toContain(`${ppv.current.display.numerator} ${ppv.current.display.denominator} ${ppv.current.display.value} ${ppv.current.display.interval}`);
    expect(pages[14]).toContain('Small-count suppression');
    expect(pages[14]).toContain('De-identification');
  });
});
