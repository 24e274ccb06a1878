/**
 * The indicator report as a PDF (pdfkit, vector drawing, one embedded TrueType font — never the
 * built-in AFM fonts): a title page with the period, scope, versions and contents; one page per
 * indicator with its table (this period, previous period, a year earlier, differences), its
 * control or run chart over the chart window and its definition beneath; a page of methods,
 * suppression and de-identification rules; "Page n of m" and the version on every page.
 * Pure apart from pdfkit: the caller reads the font files and passes their bytes in. It prints
 * only what the (already de-identified) report object holds.
 */
import { openPdf } from '@/lib/_shared/pdfDocument';
import type { IndicatorReport, IndicatorResult, IndicatorChart } from './report';
import { differenceUnit, formatCount, formatNumber, unitLabel } from './format';
import { formatPeriod } from './period';
import { suppressionText } from './suppression';

export interface RenderReportPdfOptions {
  /** TTF bytes of the body font (e.g. DejaVuSans.ttf). */
  font: Uint8Array;
  /** TTF bytes of the bold font; the body font when absent. */
  fontBold?: Uint8Array;
  pageSize?: 'A4' | 'LETTER';
}

const MARGIN = 48;
const FOOTER_H = 26;
const INK = '#111111';
const MUTED = '#555555';
const LINE = '#999999';
const GRID = '#dddddd';
const SERIES = '#0d47a1';
const SIGNAL = '#c62828';

type Doc = PDFKit.PDFDocument;

interface Ctx {
  doc: Doc;
  left: number;
  width: number;
  bottom: number;
}

function body(ctx: Ctx, size = 9, color = INK): Doc {
  return ctx.doc.font('body').fontSize(size).fillColor(color);
}

function bold(ctx: Ctx, size = 9, color = INK): Doc {
  return ctx.doc.font('bold').fontSize(size).fillColor(color);
}

function ensureSpace(ctx: Ctx, h: number): void {
  if (ctx.doc.y + h > ctx.bottom) {
    ctx.doc.addPage();
    ctx.doc.x = ctx.left;
    ctx.doc.y = MARGIN;
  }
}

function para(ctx: Ctx, text: string, opts: { size?: number; color?: string; bold?: boolean; gap?: number } = {}): void {
  const size = opts.size ?? 9;
  const d = opts.bold ? bold(ctx, size, opts.color) : body(ctx, size, opts.color);
  ensureSpace(ctx, d.heightOfString(text, { width: ctx.width }) + 2);
  d.text(text, ctx.left, ctx.doc.y, { width: ctx.width });
  ctx.doc.y += opts.gap ?? 2;
}

function labelled(ctx: Ctx, label: string, text: string): void {
  const d = body(ctx, 8.5);
  const all = `${label} ${text}`;
  ensureSpace(ctx, d.heightOfString(all, { width: ctx.width }) + 2);
  bold(ctx, 8.5).text(`${label} `, ctx.left, ctx.doc.y, { width: ctx.width, continued: true });
  body(ctx, 8.5).text(text);
  ctx.doc.y += 2;
}

function isoDay(day: string): Date {
  return new Date(`${day}T12:00:00Z`);
}

function statusLine(r: IndicatorReport): string {
  return r.issue ? `Issued version ${r.issue.version} · issued ${r.issue.issuedOn} by ${r.issue.issuedBy}` : 'DRAFT — not issued: the numbers may still change';
}

/** Draws the title page; returns the y of each contents line (indicators, then methods) for the page numbers. */
function titlePage(ctx: Ctx, r: IndicatorReport): number[] {
  const { doc } = ctx;
  doc.y = MARGIN + 60;
  body(ctx, 11, MUTED).text('Plateau · procedural sedation', ctx.left, doc.y, { width: ctx.width });
  doc.y += 6;
  bold(ctx, 24).text('Sedation safety indicators', ctx.left, doc.y, { width: ctx.width });
  doc.y += 4;
  bold(ctx, 16).text(formatPeriod(r.period), ctx.left, doc.y, { width: ctx.width });
  doc.y += 4;
  body(ctx, 12).text(r.scope.label, ctx.left, doc.y, { width: ctx.width });
  if (r.scope.units.length > 1) body(ctx, 9, MUTED).text(r.scope.units.map((u) => u.name).join(' · '), ctx.left, doc.y, { width: ctx.width });
  doc.y += 14;
  bold(ctx, 11, r.issue ? INK : SIGNAL).text(statusLine(r), ctx.left, doc.y, { width: ctx.width });
  doc.y += 14;
  const facts: [string, string][] = [
    ['Period', `${r.period.label} (${r.period.start} to ${r.period.end})`],
    ['Signed cases in the period', formatCount(r.cases)],
    ['Indicator catalogue', `version ${r.catalogueVersion}`],
    ['Rule set', `${r.ruleSet.id} version ${r.ruleSet.version}`],
    ['Intervals', `${Math.round(r.confidence * 100)} % Wilson score (proportions); Newcombe hybrid score for differences`],
    ['Small counts', `counts from 1 to ${r.minCell - 1} are shown as "< ${r.minCell}"; see Methods`],
    ['Charts', `last ${r.chartPeriods} ${r.period.kind}s; p chart with 3-sigma limits, or run chart for times`],
    ['Generated on', r.generatedOn],
  ];
  for (const [k, v] of facts) labelled(ctx, `${k}:`, v);
  doc.y += 12;
  bold(ctx, 12).text('Contents', ctx.left, doc.y, { width: ctx.width });
  doc.y += 4;
  const ys: number[] = [];
  for (const title of [...r.indicators.map((i) => i.definition.title), 'Methods, suppression and de-identification']) {
    ys.push(doc.y);
    body(ctx, 9).text(title, ctx.left, doc.y, { width: ctx.width - 60, lineBreak: false });
    doc.y = ys[ys.length - 1] + 13;
  }
  doc.y += 9;
  para(ctx, 'This report is de-identified: it holds counts, rates and definitions only — no patient names, record numbers, birth dates or times of care.', { size: 8.5, color: MUTED });
  return ys;
}

function table(ctx: Ctx, ind: IndicatorResult, r: IndicatorReport): void {
  const { doc } = ctx;
  const q = ind.definition.kind === 'quantile';
  const unit = unitLabel(ind.definition.unit);
  const cols = q
    ? [
        { h: 'Period', w: 0.3 },
        { h: 'n (cases)', w: 0.14 },
        { h: `${ind.definition.p === 0.5 ? 'Median' : '90th percentile'} (s)`, w: 0.18 },
        { h: '', w: 0.08 },
        { h: 'This period minus row (s)', w: 0.3 },
      ]
    : [
        { h: 'Period', w: 0.24 },
        { h: 'Numerator', w: 0.11 },
        { h: 'Denominator', w: 0.12 },
        { h: `Rate (${unit})`, w: 0.15 },
        { h: '95 % CI', w: 0.13 },
        { h: `This period minus row (${differenceUnit(ind.definition.unit)}, 95 % CI)`, w: 0.25 },
      ];
  const cellRow = (label: string, c: IndicatorResult['current'], diff: string) =>
    q ? [label, c.display.denominator, c.display.value, '', diff] : [label, c.display.numerator, c.display.denominator, c.display.value, c.display.interval, diff];
  const lines = [
    cellRow(`This period ${ind.current.period.label}`, ind.current, '—'),
    cellRow(`Previous ${r.previousPeriod.label}`, ind.previous.cell, ind.previous.display),
    cellRow(`Year earlier ${r.yearEarlierPeriod.label}`, ind.yearEarlier.cell, ind.yearEarlier.display),
  ];
  ensureSpace(ctx, 80);
  let y = doc.y;
  let x = ctx.left;
  const headH = 22;
  for (const c of cols) {
    bold(ctx, 7.5, MUTED).text(c.h, x + 2, y, { width: c.w * ctx.width - 4 });
    x += c.w * ctx.width;
  }
  y += headH;
  doc.moveTo(ctx.left, y - 3).lineTo(ctx.left + ctx.width, y - 3).lineWidth(0.5).strokeColor(LINE).stroke();
  for (const line of lines) {
    x = ctx.left;
    line.forEach((text, i) => {
      body(ctx, 8.5).text(text, x + 2, y, { width: cols[i].w * ctx.width - 4, lineBreak: false });
      x += cols[i].w * ctx.width;
    });
    y += 14;
    doc.moveTo(ctx.left, y - 3).lineTo(ctx.left + ctx.width, y - 3).lineWidth(0.3).strokeColor(GRID).stroke();
  }
  doc.y = y + 2;
  const notes = [ind.current, ind.previous.cell, ind.yearEarlier.cell].map((c) => c.suppressed).filter((s, i, a): s is NonNullable<typeof s> => s !== null && a.indexOf(s) === i);
  for (const s of notes) para(ctx, `Suppressed: ${suppressionText(s, r.minCell, ind.definition.kind)}.`, { size: 7.5, color: MUTED });
}

/** The chart without the periods before the first one with cases (nothing to draw there). */
function trimmed(c: IndicatorChart, ind: IndicatorResult): IndicatorChart {
  const first = ind.series.findIndex((s) => s.denominator !== 0);
  return first <= 0 ? c : { ...c, points: c.points.slice(first) };
}

function chart(ctx: Ctx, full: IndicatorChart, ind: IndicatorResult): void {
  const { doc } = ctx;
  const c = trimmed(full, ind);
  const h = 170;
  ensureSpace(ctx, h + 50);
  const top = doc.y + 6;
  const left = ctx.left + 34;
  const width = ctx.width - 40;
  const bottom = top + h;
  const values = c.points.flatMap((p) => [p.value, p.ucl]).filter((v): v is number => v !== null && Number.isFinite(v));
  if (c.centre !== null) values.push(c.centre);
  let max = values.length ? Math.max(...values) : 1;
  if (ind.definition.unit === 'percent') max = Math.min(100, Math.max(max, 10));
  max = max <= 0 ? 1 : max * 1.1;
  const yOf = (v: number) => bottom - (Math.min(v, max) / max) * h;
  const step = c.points.length > 1 ? width / (c.points.length - 1) : 0;
  const xOf = (i: number) => left + (c.points.length > 1 ? i * step : width / 2);

  // frame, grid and axis labels
  doc.rect(left, top, width, h).lineWidth(0.5).strokeColor(LINE).stroke();
  for (const f of [0.25, 0.5, 0.75]) {
    doc.moveTo(left, yOf(max * f)).lineTo(left + width, yOf(max * f)).lineWidth(0.3).strokeColor(GRID).stroke();
  }
  for (const f of [0, 0.5, 1]) {
    const v = max * f;
    body(ctx, 6.5, MUTED).text(formatNumber(v, ind.definition.unit), ctx.left - 4, yOf(v) - 3, { width: 36, align: 'right', lineBreak: false });
  }
  const every = Math.max(1, Math.ceil(c.points.length / 12));
  c.points.forEach((p, i) => {
    const last = i === c.points.length - 1;
    if (i % every !== 0 && !last) return;
    if (!last && c.points.length - 1 - i < every && (c.points.length - 1) % every !== 0) return;
    body(ctx, 6, MUTED).text(p.short, xOf(i) - 16, bottom + 3, { width: 32, align: 'center', lineBreak: false });
  });

  // limits (stepped, per point) and centre line
  const limit = (key: 'lcl' | 'ucl') => {
    let started = false;
    c.points.forEach((p, i) => {
      const v = p[key];
      if (v === null) {
        started = false;
        return;
      }
      const x0 = xOf(i) - step / 2;
      const x1 = xOf(i) + step / 2;
      if (!started) doc.moveTo(Math.max(left, x0), yOf(v));
      else doc.lineTo(Math.max(left, x0), yOf(v));
      doc.lineTo(Math.min(left + width, x1), yOf(v));
      started = true;
    });
    doc.lineWidth(0.6).strokeColor(MUTED).dash(2, { space: 2 }).stroke().undash();
  };
  if (c.kind === 'p' && c.centre !== null) {
    limit('ucl');
    limit('lcl');
  }
  if (c.centre !== null) doc.moveTo(left, yOf(c.centre)).lineTo(left + width, yOf(c.centre)).lineWidth(0.8).strokeColor('#2e7d32').stroke();

  // the series: segments between consecutive shown points
  let prev: [number, number] | null = null;
  c.points.forEach((p, i) => {
    if (p.value === null) {
      prev = null;
      return;
    }
    const pt: [number, number] = [xOf(i), yOf(p.value)];
    if (prev) doc.moveTo(prev[0], prev[1]).lineTo(pt[0], pt[1]).lineWidth(1).strokeColor(SERIES).stroke();
    prev = pt;
  });
  c.points.forEach((p, i) => {
    if (p.value === null) return;
    const signal = p.signals.length > 0;
    doc.circle(xOf(i), yOf(p.value), signal ? 3.2 : 2).fillColor(signal ? SIGNAL : SERIES).fill();
  });
  doc.y = bottom + 14;
  const legend =
    c.kind === 'p'
      ? `p chart: dots = rate per period (${unitLabel(ind.definition.unit)}); green line = centre line${c.centre !== null ? ` ${formatNumber(c.centre, ind.definition.unit)}` : ''}; dashed = 3-sigma limits; red dots = special-cause signal (outside the limits, or in a run of 8 on one side). Suppressed periods and periods without cases are left out.`
      : `Run chart: dots = ${ind.definition.p === 0.5 ? 'median' : '90th percentile'} per period (s); green line = median of the plotted values${c.centre !== null ? ` ${formatNumber(c.centre, 'seconds')} s` : ''}; red dots = run of 8 on one side. Suppressed periods are left out.`;
  para(ctx, legend, { size: 7, color: MUTED });
  if (c.withheld) para(ctx, `Note: ${c.withheld}.`, { size: 7, color: MUTED });
}

function indicatorPage(ctx: Ctx, ind: IndicatorResult, r: IndicatorReport): void {
  const d = ind.definition;
  para(ctx, d.title, { size: 14, bold: true, gap: 2 });
  para(ctx, `${unitLabel(d.unit)} · ${d.higherIsBetter ? 'higher is better' : 'lower is better'} · ${formatPeriod(r.period)} · ${r.scope.label}`, { size: 8.5, color: MUTED, gap: 8 });
  table(ctx, ind, r);
  ctx.doc.y += 4;
  chart(ctx, ind.chart, ind);
  ctx.doc.y += 4;
  if (ind.excluded.length > 0) {
    para(ctx, `Left out of the denominator in ${r.period.label}: ${ind.excluded.map((e) => `${e.reason}: ${formatCount(e.count)}`).join('; ')}.`, { size: 8, color: MUTED, gap: 6 });
  }
  para(ctx, 'Definition', { size: 10, bold: true });
  para(ctx, d.definition, { size: 8.5, gap: 4 });
  labelled(ctx, d.kind === 'proportion' ? 'Numerator:' : 'Statistic:', d.numerator);
  labelled(ctx, 'Denominator:', d.denominator);
  labelled(ctx, 'Inclusion:', d.inclusion.join('; '));
  labelled(ctx, 'Sources:', d.sources.join('; '));
  labelled(ctx, 'Versions:', `indicator ${d.id}, catalogue version ${r.catalogueVersion}, rule set ${r.ruleSet.id} version ${r.ruleSet.version}`);
}

function methodsPage(ctx: Ctx, r: IndicatorReport): void {
  para(ctx, 'Methods, suppression and de-identification', { size: 14, bold: true, gap: 8 });
  const sections: [string, string[]][] = [
    [
      'Counting',
      [
        'Every indicator counts cases, not episodes: signed (completed) cases whose scheduled date lies in the period, in the units of the scope. Episodes, levels and capnography coverage come from the stored per-case analysis of the rule set named on the title page.',
        'Rates are cases with the event divided by the cases meeting every inclusion criterion, shown per 100 or per 1,000 cases or as a percentage.',
      ],
    ],
    [
      'Intervals and comparisons',
      [
        `${Math.round(r.confidence * 100)} % Wilson score interval for each rate (Newcombe 1998, Stat Med 17:857-872, method 3).`,
        'Differences from the previous period and from the same period a year earlier: this period minus the other, with the Newcombe hybrid score interval (Newcombe 1998, Stat Med 17:873-890, method 10). Times: difference of the two statistics, without an interval.',
        'Times are quantiles of the type 7 definition (Hyndman & Fan 1996).',
      ],
    ],
    [
      'Charts',
      [
        `p chart over the last ${r.chartPeriods} ${r.period.kind}s: centre p̄ = Σ cases with the event / Σ cases, limits p̄ ± 3√(p̄(1 − p̄)/n) for each period (Montgomery, Introduction to Statistical Quality Control). Signals: a point outside its limits, or a run of 8 or more points on one side of the centre line.`,
        'Times use a run chart: the centre line is the median of the plotted values, and the run rule applies.',
      ],
    ],
    [
      'Small-count suppression',
      [
        `A count of cases with the event from 1 to ${r.minCell - 1} is shown as "< ${r.minCell}"; a count of cases without the event from 1 to ${r.minCell - 1} is shown as a bound ("> n − ${r.minCell}"); a denominator below ${r.minCell} withholds the numerator. The rate, interval and differences of such a cell are withheld too. Zeros are shown.`,
        'Denominators of rates are shown (they are activity counts). For times, n is itself a count of cases with an event and is suppressed the same way.',
        'Complementary suppression: a chart centre line and its limits are withheld when, with the published denominators, they would reveal a small total of suppressed counts; suppressed periods take no part in the chart signals; exclusion counts are published only for monitoring and documentation criteria, never for event criteria.',
      ],
    ],
    [
      'De-identification',
      [
        'The report is built from counts only. It carries no patient names, record numbers, birth dates or times of care; its only dates are the period bounds and the day it was generated or issued. Inside Plateau, an issued version keeps opaque random references to the counted cases, which only a sedation lead can resolve; they are not printed in any export.',
      ],
    ],
    [
      'Versions',
      [
        'An issued version is frozen: its numbers are stored as issued and never recomputed. A re-run after late documentation is issued as a new version, which lists its differences from the previous one. A change to an indicator definition is a new catalogue version.',
        statusLine(r) + '.',
      ],
    ],
  ];
  for (const [h, ps] of sections) {
    para(ctx, h, { size: 10, bold: true, gap: 2 });
    for (const p of ps) para(ctx, p, { size: 8.5, gap: 4 });
    ctx.doc.y += 4;
  }
}

/**
 * Renders a report to PDF bytes.
 *
 * @example
 * const pdf = await renderReportPdf(report, { font, fontBold })
 * new TextDecoder().decode(pdf.slice(0, 5)) //=> "%PDF-"
 */
export async function renderReportPdf(report: IndicatorReport, options: RenderReportPdfOptions): Promise<Uint8Array> {
  const stamp = isoDay(report.issue?.issuedOn ?? report.generatedOn);
  const { doc, finish } = openPdf({
    size: options.pageSize ?? 'A4',
    margin: MARGIN,
    font: options.font,
    fontBold: options.fontBold,
    info: { Title: `Sedation safety indicators — ${report.period.label} — ${report.scope.label}${report.issue ? ` — version ${report.issue.version}` : ' — draft'}`, Subject: 'Procedural sedation safety indicators (de-identified)' },
    stamp,
  });
  const ctx: Ctx = { doc, left: MARGIN, width: doc.page.width - 2 * MARGIN, bottom: doc.page.height - MARGIN - FOOTER_H };

  const contentsY = titlePage(ctx, report);
  const startPages: number[] = [];
  const newPage = () => {
    doc.addPage();
    doc.x = ctx.left;
    doc.y = MARGIN;
    startPages.push(doc.bufferedPageRange().count);
  };
  for (const ind of report.indicators) {
    newPage();
    indicatorPage(ctx, ind, report);
  }
  newPage();
  methodsPage(ctx, report);

  const range = doc.bufferedPageRange();
  doc.switchToPage(range.start);
  contentsY.forEach((y, i) => body(ctx, 9).text(String(startPages[i]), ctx.left + ctx.width - 60, y, { width: 60, align: 'right', lineBreak: false }));
  const scope = report.scope.label.length > 48 ? `${report.scope.label.slice(0, 47)}…` : report.scope.label;
  const footer = `Plateau safety indicators · ${report.period.label} · ${scope} · catalogue v${report.catalogueVersion} · ${report.issue ? `issued version ${report.issue.version}` : 'DRAFT'}`;
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const bottomMargin = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    const y = doc.page.height - MARGIN - 8;
    doc.moveTo(MARGIN, y - 5).lineTo(MARGIN + ctx.width, y - 5).lineWidth(0.5).strokeColor(LINE).stroke();
    body(ctx, 6.5, MUTED).text(footer, MARGIN, y, { width: ctx.width * 0.82, lineBreak: false });
    body(ctx, 6.5, MUTED).text(`Page ${i - range.start + 1} of ${range.count}`, MARGIN + ctx.width * 0.82, y, { width: ctx.width * 0.18, align: 'right', lineBreak: false });
    doc.page.margins.bottom = bottomMargin;
  }
  return finish();
}
