import { openPdf } from '@/lib/_shared/pdfDocument';
import { formatClock } from '@/lib/_shared/time';
import {
  formatBmi,
  formatChannelValue,
  formatCm,
  formatDoseAmount,
  formatDuration,
  formatKg,
  formatNumber,
  formatPerKg,
  formatPercent,
  formatScore,
} from './format';
import { timeRows } from './noteText';
import { CHANNEL_LABEL } from './labels';
import type { CaseNote, ChartData, ChartSeries, EpisodeLine } from './types';

/**
 * The case note as a PDF (pdfkit, vector drawing, one embedded TrueType font — never the 14
 * built-in AFM fonts): a header with the unit name, the case facts, a trend chart of the sedation
 * period (EtCO2, RR and SpO2 lines, episodes shaded by rule, dose markers), the times, drugs,
 * monitoring and physiology, the episode table, case level, recovery, the nurse's note,
 * signatures and version, the rule set and the caution line, and "Page n of m" on every page.
 * Pure apart from pdfkit: the caller reads the font file and passes its bytes in.
 */

export interface RenderNotePdfOptions {
  pageSize: 'A4' | 'LETTER';
  /** TTF bytes of the body font (e.g. DejaVuSans.ttf). */
  font: Uint8Array;
  /** TTF bytes of the bold font (e.g. DejaVuSans-Bold.ttf); the body font when absent. */
  fontBold?: Uint8Array;
}

const MARGIN = 40;
const FOOTER_H = 22;
const BODY = 8.5;
const SMALL = 7;
const INK = '#111111';
const MUTED = '#555555';
const RULE_LINE = '#999999';
const GRID = '#dddddd';

/** Line colours of the chart, distinguishable in grey print too (different darkness). */
const SERIES_STYLE: Record<'etco2' | 'rr' | 'spo2', { color: string; label: string }> = {
  etco2: { color: '#1b5e20', label: 'EtCO2' },
  rr: { color: '#0d47a1', label: 'RR' },
  spo2: { color: '#b71c1c', label: 'SpO2' },
};
/** Episode shading, one colour per rule in order of first appearance. */
const SHADES = ['#e53935', '#fb8c00', '#8e24aa', '#1e88e5', '#43a047', '#6d4c41', '#00897b', '#c0ca33', '#5e35b1'];

type Doc = PDFKit.PDFDocument;

interface Ctx {
  doc: Doc;
  note: CaseNote;
  left: number;
  width: number;
  /** Last y content may reach on a page. */
  bottom: number;
}

function body(ctx: Ctx, size = BODY, color = INK): Doc {
  return ctx.doc.font('body').fontSize(size).fillColor(color);
}

function bold(ctx: Ctx, size = BODY, color = INK): Doc {
  return ctx.doc.font('bold').fontSize(size).fillColor(color);
}

/** Start a new page when fewer than `h` points are left. */
function ensureSpace(ctx: Ctx, h: number): void {
  if (ctx.doc.y + h > ctx.bottom) {
    ctx.doc.addPage();
    ctx.doc.x = ctx.left;
    ctx.doc.y = MARGIN;
  }
}

function heading(ctx: Ctx, title: string): void {
  ensureSpace(ctx, 40);
  const { doc } = ctx;
  doc.y += 6;
  bold(ctx, 10).text(title, ctx.left, doc.y, { width: ctx.width });
  const y = doc.y + 1;
  doc.moveTo(ctx.left, y).lineTo(ctx.left + ctx.width, y).lineWidth(0.5).strokeColor(RULE_LINE).stroke();
  doc.y = y + 3;
}

function line(ctx: Ctx, text: string, opts: { size?: number; color?: string; indent?: number; bold?: boolean } = {}): void {
  const size = opts.size ?? BODY;
  const indent = opts.indent ?? 0;
  (opts.bold === true ? bold : body)(ctx, size, opts.color ?? INK);
  const h = ctx.doc.heightOfString(text, { width: ctx.width - indent });
  ensureSpace(ctx, h);
  ctx.doc.text(text, ctx.left + indent, ctx.doc.y, { width: ctx.width - indent });
}

interface Column {
  title: string;
  width: number;
}

/** A table whose rows wrap inside their cells and break across pages (header repeated). */
function table(ctx: Ctx, columns: Column[], rows: string[][]): void {
  const { doc } = ctx;
  const total = columns.reduce((s, c) => s + c.width, 0);
  const widths = columns.map((c) => (c.width / total) * ctx.width);
  const pad = 2;
  const drawHeader = () => {
    bold(ctx, SMALL);
    const h = Math.max(...columns.map((c, i) => doc.heightOfString(c.title, { width: widths[i] - 2 * pad }))) + 2 * pad;
    ensureSpace(ctx, h + 14);
    const y = doc.y;
    doc.rect(ctx.left, y, ctx.width, h).fillColor('#eeeeee').fill();
    let x = ctx.left;
    bold(ctx, SMALL);
    columns.forEach((c, i) => {
      doc.text(c.title, x + pad, y + pad, { width: widths[i] - 2 * pad });
      x += widths[i];
    });
    doc.y = y + h;
  };
  drawHeader();
  for (const row of rows) {
    body(ctx, SMALL);
    const h = Math.max(...row.map((cell, i) => doc.heightOfString(cell, { width: widths[i] - 2 * pad }))) + 2 * pad;
    if (doc.y + h > ctx.bottom) {
      doc.addPage();
      doc.y = MARGIN;
      drawHeader();
      body(ctx, SMALL);
    }
    const y = doc.y;
    let x = ctx.left;
    row.forEach((cell, i) => {
      doc.text(cell, x + pad, y + pad, { width: widths[i] - 2 * pad });
      x += widths[i];
    });
    doc.moveTo(ctx.left, y + h).lineTo(ctx.left + ctx.width, y + h).lineWidth(0.3).strokeColor(GRID).stroke();
    doc.y = y + h;
  }
  doc.x = ctx.left;
  doc.y += 3;
}

/** Label / value pairs in two columns. */
function facts(ctx: Ctx, leftPairs: [string, string][], rightPairs: [string, string][]): void {
  const { doc } = ctx;
  const colW = ctx.width / 2;
  const labelW = 70;
  const top = doc.y;
  const draw = (pairs: [string, string][], x0: number): number => {
    let y = top;
    for (const [label, value] of pairs) {
      bold(ctx, SMALL, MUTED).text(label, x0, y, { width: labelW });
      body(ctx, BODY).text(value, x0 + labelW, y, { width: colW - labelW - 6 });
      y = Math.max(doc.y, y + 10);
    }
    return y;
  };
  const yl = draw(leftPairs, ctx.left);
  const yr = draw(rightPairs, ctx.left + colW);
  doc.x = ctx.left;
  doc.y = Math.max(yl, yr) + 4;
}

function niceStep(spanS: number, maxTicks: number): number {
  for (const m of [1, 2, 5, 10, 15, 20, 30, 60, 120]) if (spanS / (m * 60) <= maxTicks) return m * 60;
  return 240 * 60;
}

function chartWindow(chart: ChartData): { start: number; end: number } | null {
  if (chart.window !== undefined && chart.window.end > chart.window.start) return chart.window;
  let start = Infinity;
  let end = -Infinity;
  for (const s of chart.series) {
    if (s.t.length === 0) continue;
    start = Math.min(start, s.t[0]);
    end = Math.max(end, s.t[s.t.length - 1]);
  }
  return end > start ? { start, end } : null;
}

function valueRange(s: ChartSeries | undefined, floor: number, ceilMin: number, step: number, low?: number): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of s?.v ?? []) {
    if (v === null) continue;
    lo = Math.min(lo, v);
    hi = Math.max(hi, v);
  }
  const top = Math.max(ceilMin, Math.ceil(hi / step) * step);
  const bottom = low === undefined ? floor : Math.min(low, Math.floor(lo / step) * step);
  return [Number.isFinite(bottom) ? bottom : floor, Number.isFinite(top) ? top : ceilMin];
}

/** The trend chart: three strips sharing one time axis. Returns nothing; advances doc.y. */
function drawChart(ctx: Ctx, chart: ChartData): void {
  const { doc, note } = ctx;
  const win = chartWindow(chart);
  const stripH = 58;
  const gap = 6;
  const doseRows = 3;
  const doseBand = doseRows * 8 + 4;
  const ruleOrder: string[] = [];
  for (const e of chart.episodes) if (!ruleOrder.includes(e.rule)) ruleOrder.push(e.rule);
  const laneH = 7;
  const lanesH = ruleOrder.length === 0 ? 0 : ruleOrder.length * laneH + 4;
  const totalH = doseBand + 3 * stripH + 2 * gap + 16 + lanesH;
  ensureSpace(ctx, totalH + 16);
  bold(ctx, 10).text(`Trend ${win === null ? '' : `${clock(note, win.start)}–${clock(note, win.end)}`} (${note.timeZone})`, ctx.left, doc.y, { width: ctx.width });
  doc.y += 2;
  if (win === null) {
    line(ctx, 'No monitor data to chart', { color: MUTED });
    return;
  }
  const axisW = 74;
  const x0 = ctx.left + axisW;
  const x1 = ctx.left + ctx.width - 4;
  const span = win.end - win.start;
  const xOf = (t: number) => x0 + ((t - win.start) / span) * (x1 - x0);
  const top = doc.y + doseBand;
  const byChannel = (c: ChartSeries['channel']) => chart.series.find((s) => s.channel === c);
  const kpa = chart.etco2Unit === 'kPa';
  const strips = [
    { channel: 'etco2' as const, range: valueRange(byChannel('etco2'), 0, kpa ? 8 : 60, kpa ? 1 : 10), unit: chart.etco2Unit },
    { channel: 'rr' as const, range: valueRange(byChannel('rr'), 0, 30, 10), unit: '/min' },
    { channel: 'spo2' as const, range: valueRange(byChannel('spo2'), 80, 100, 5, 80), unit: '%' },
  ];
  const stripTop = (i: number) => top + i * (stripH + gap);
  const bottomY = stripTop(2) + stripH;

  // episode shading, behind everything
  const shade = (rule: string) => SHADES[ruleOrder.indexOf(rule) % SHADES.length];
  for (const e of chart.episodes) {
    const a = Math.max(x0, xOf(e.start));
    const b = Math.min(x1, xOf(e.end));
    if (b <= a) continue;
    doc.save();
    doc.rect(a, top, Math.max(b - a, 0.6), bottomY - top).fillOpacity(0.12).fillColor(shade(e.rule)).fill();
    doc.restore();
  }

  // strips: frame, grid, y labels, line
  const maxHold = chart.maxHoldS ?? 30;
  strips.forEach((st, i) => {
    const y0 = stripTop(i);
    const [lo, hi] = st.range;
    const yOf = (v: number) => y0 + stripH - ((v - lo) / (hi - lo)) * stripH;
    doc.rect(x0, y0, x1 - x0, stripH).lineWidth(0.5).strokeColor(RULE_LINE).stroke();
    for (const v of [lo, (lo + hi) / 2, hi]) {
      const y = yOf(v);
      doc.moveTo(x0, y).lineTo(x1, y).lineWidth(0.3).strokeColor(GRID).stroke();
      body(ctx, 6, MUTED).text(formatNumber(v, kpa && st.channel === 'etco2' ? 1 : 0), ctx.left, y - 3, { width: axisW - 3, align: 'right', lineBreak: false });
    }
    const style = SERIES_STYLE[st.channel];
    const name = `${style.label} ${st.unit}`;
    bold(ctx, 6.5, style.color);
    doc.save();
    doc.rect(x0 + 1, y0 + 1, doc.widthOfString(name) + 4, 8).fillColor('#ffffff').fillOpacity(0.85).fill();
    doc.restore();
    bold(ctx, 6.5, style.color).text(name, x0 + 3, y0 + 2, { lineBreak: false });
    const s = byChannel(st.channel);
    if (s === undefined) {
      body(ctx, 7, MUTED).text('not monitored', x0 + 3, y0 + stripH / 2 - 3, { lineBreak: false });
      return;
    }
    doc.save();
    doc.rect(x0, y0, x1 - x0, stripH).clip();
    let open = false;
    let prevT = -Infinity;
    for (let k = 0; k < s.t.length; k++) {
      const t = s.t[k];
      const v = s.v[k];
      if (t < win.start - maxHold || t > win.end + maxHold) {
        open = false;
        continue;
      }
      if (v === null) {
        open = false;
        continue;
      }
      const x = xOf(t);
      const y = yOf(Math.min(hi, Math.max(lo, v)));
      if (open && t - prevT <= maxHold) doc.lineTo(x, y);
      else doc.moveTo(x, y);
      open = true;
      prevT = t;
    }
    doc.lineWidth(0.8).strokeColor(style.color).stroke();
    doc.restore();
  });

  // dose markers: a dashed line through the strips and a label in the band above
  const rowEnds = new Array<number>(doseRows).fill(-Infinity);
  for (const d of chart.doses) {
    if (d.t < win.start || d.t > win.end) continue;
    const x = xOf(d.t);
    doc.save();
    doc.moveTo(x, top).lineTo(x, bottomY).lineWidth(0.4).dash(1.5, { space: 1.5 }).strokeColor('#444444').stroke();
    doc.restore();
    doc.save();
    doc.polygon([x - 2.2, top - 4], [x + 2.2, top - 4], [x, top]).fillColor('#444444').fill();
    doc.restore();
    body(ctx, 5.8, INK);
    const label = d.label;
    const w = doc.widthOfString(label);
    let row = rowEnds.findIndex((end) => end < x - 1);
    if (row < 0) row = rowEnds.indexOf(Math.min(...rowEnds));
    const lx = Math.min(x - 1, x1 - w);
    rowEnds[row] = lx + w + 3;
    doc.text(label, lx, top - 6 - (row + 1) * 8 + 1, { lineBreak: false });
  }

  // time axis
  const step = niceStep(span, 9);
  const firstTick = Math.ceil((win.start + Date.parse(note.caseStartIso) / 1000) / step) * step - Date.parse(note.caseStartIso) / 1000;
  for (let t = firstTick; t <= win.end; t += step) {
    const x = xOf(t);
    doc.moveTo(x, bottomY).lineTo(x, bottomY + 3).lineWidth(0.5).strokeColor(RULE_LINE).stroke();
    const label = formatClock(new Date(Date.parse(note.caseStartIso) + t * 1000), note.timeZone);
    body(ctx, 6.5, MUTED);
    doc.text(label, x - 15, bottomY + 4, { width: 30, align: 'center', lineBreak: false });
  }

  // episode lanes under the time axis: one row per rule, a bar per episode
  const laneTop = bottomY + 15;
  ruleOrder.forEach((rule, r) => {
    const y = laneTop + r * laneH;
    const label = chart.episodes.find((e) => e.rule === rule)?.label ?? rule;
    body(ctx, 5.8, INK).text(label, ctx.left, y, { width: axisW - 4, align: 'right', lineBreak: false, height: laneH, ellipsis: true });
    doc.moveTo(x0, y + laneH / 2).lineTo(x1, y + laneH / 2).lineWidth(0.2).strokeColor(GRID).stroke();
    for (const e of chart.episodes) {
      if (e.rule !== rule) continue;
      const a = Math.max(x0, xOf(e.start));
      const b = Math.min(x1, xOf(e.end));
      if (b <= a) continue;
      doc.rect(a, y + 1, Math.max(b - a, 1), laneH - 2).fillColor(shade(rule)).fill();
    }
  });
  doc.x = ctx.left;
  doc.y = laneTop + lanesH;
}

function clock(note: CaseNote, t: number): string {
  return formatClock(new Date(Date.parse(note.caseStartIso) + Math.round(t * 1000)), note.timeZone);
}

function episodeRow(e: EpisodeLine): string[] {
  return [
    String(e.n),
    e.label,
    `${e.start.clock}–${e.end.clock}`,
    `${formatDuration(e.durationS)}${e.censoredAt !== null ? ' (at least)' : ''}`,
    e.extremes.map((x) => `${x.kind} ${CHANNEL_LABEL[x.channel]} ${formatChannelValue(x.value, x.unit)}`).join('; '),
    e.interventions.length === 0 ? 'none' : e.interventions.map((i) => `${i.label} ${i.at.clock}`).join('; '),
    e.responseS === null ? '—' : formatDuration(e.responseS),
    e.level,
  ];
}

/**
 * Render a composed note and its chart data to PDF bytes.
 *
 * @example
 * const pdf = await renderNotePdf(note, chartDataFromCase(record, analysis, facts), { pageSize: 'A4', font, fontBold })
 * new TextDecoder().decode(pdf.slice(0, 5)) //=> "%PDF-"
 */
export async function renderNotePdf(note: CaseNote, chart: ChartData, options: RenderNotePdfOptions): Promise<Uint8Array> {
  const stamp = note.signatures.length > 0 ? new Date(note.signatures[note.signatures.length - 1].at) : new Date(note.caseStartIso);
  const { doc, finish } = openPdf({
    size: options.pageSize,
    margin: MARGIN,
    font: options.font,
    fontBold: options.fontBold,
    info: { Title: `Sedation note — ${note.patientAndRisk.name} — version ${note.version}`, Subject: 'Procedural sedation case note', Author: note.unitName },
    stamp,
  });

  const ctx: Ctx = { doc, note, left: MARGIN, width: doc.page.width - 2 * MARGIN, bottom: doc.page.height - MARGIN - FOOTER_H };
  const p = note.patientAndRisk;
  const pr = note.procedure;
  const t = note.times;

  // header
  bold(ctx, 15).text(note.unitName, MARGIN, MARGIN, { width: ctx.width * 0.6 });
  const headerBottom = doc.y;
  body(ctx, 9, MUTED).text(`Sedation note · version ${note.version}`, MARGIN + ctx.width * 0.6, MARGIN + 2, { width: ctx.width * 0.4, align: 'right' });
  body(ctx, 8, MUTED).text(`${pr.date} · times in ${note.timeZone}`, MARGIN + ctx.width * 0.6, doc.y, { width: ctx.width * 0.4, align: 'right' });
  doc.y = Math.max(headerBottom, doc.y) + 3;
  doc.moveTo(MARGIN, doc.y).lineTo(MARGIN + ctx.width, doc.y).lineWidth(1).strokeColor(INK).stroke();
  doc.y += 6;

  const measures = [p.weightKg === null ? 'weight not recorded' : formatKg(p.weightKg), p.heightCm === null ? 'height not recorded' : formatCm(p.heightCm), ...(p.bmi === null ? [] : [`BMI ${formatBmi(p.bmi)}`])].join(', ');
  facts(
    ctx,
    [
      ['Patient', p.name],
      ['MRN', p.mrn],
      ['Born / age / sex', [p.birthDate ?? 'not recorded', p.ageYears === null ? null : `${formatNumber(p.ageYears, 0)} years`, p.sex].filter((x) => x !== null).join(', ')],
      ['ASA', p.asa === null ? 'not recorded' : `${p.asa.label}: ${p.asa.meaning}`],
      ['Body', measures],
      ['STOP-Bang', p.stopBang === null ? 'not recorded' : `${formatScore(p.stopBang.score)} (${p.stopBang.band} risk)`],
      ['Airway', p.airwayClass ?? 'not recorded'],
    ],
    [
      ['Procedure', pr.label ?? 'not recorded'],
      ['Room', pr.room ?? 'not recorded'],
      ['Proceduralist', pr.proceduralist ?? 'not recorded'],
      ['Sedation nurse', pr.nurse ?? 'not recorded'],
      ['Depth', `planned ${pr.plannedDepth?.label.toLowerCase() ?? 'not recorded'}; reached ${pr.reachedDepth?.label.toLowerCase() ?? 'not recorded'}`],
      ['Sedation time', t.sedation === null ? 'not known' : `${formatDuration(t.sedation.durationS)} (${t.sedation.start.clock}–${t.sedation.end.clock})`],
      ['Case level', `${note.caseLevel.label}${note.caseLevel.majorPhysiology ? ' · major physiology' : ''}${note.caseLevel.coSignatureNeeded ? ' · co-signature required' : ''}`],
    ],
  );

  drawChart(ctx, chart);

  heading(ctx, 'Times');
  line(
    ctx,
    timeRows(t)
      .filter((r) => r[1] !== null)
      .map(([label, tp]) => `${label} ${tp?.clock}`)
      .join(' · '),
  );

  heading(ctx, 'Drugs');
  if (note.drugs.doses.length === 0) line(ctx, 'No drug recorded');
  else table(ctx, [{ title: 'Time', width: 1 }, { title: 'Drug', width: 2 }, { title: 'Dose', width: 1.2 }, { title: 'Route', width: 0.8 }], note.drugs.doses.map((d) => [d.at.clock, d.label, formatDoseAmount(d.amount, d.unit), d.route]));
  for (const x of note.drugs.totals) {
    line(ctx, `Total ${x.label} ${formatDoseAmount(x.total, x.unit)}${x.perKg === null ? '' : ` (${formatPerKg(x.perKg.value, x.perKg.unit)})`} in ${formatNumber(x.doseCount, 0)} dose${x.doseCount === 1 ? '' : 's'}`);
  }
  if (note.drugs.totals.length > 0) line(ctx, note.drugs.weightKg === null ? 'No weight recorded: no per-kg doses' : `Per-kg doses for ${formatKg(note.drugs.weightKg)}`, { color: MUTED, size: SMALL });

  heading(ctx, 'Monitoring and physiology');
  const m = note.monitoring;
  line(
    ctx,
    m.channels
      .map((c) => `${CHANNEL_LABEL[c.channel]} ${c.source === 'monitor' ? 'monitor' : `manual (${formatNumber(c.samples, 0)})`}`)
      .concat(m.notMonitored.map((c) => `${CHANNEL_LABEL[c]} not monitored`))
      .join(' · '),
  );
  line(ctx, m.capnographyCoveragePct === null ? 'Capnography coverage not known (no sedation time)' : `Capnography coverage ${formatPercent(m.capnographyCoveragePct)} of the sedation time`);
  if (m.gaps.length === 0) line(ctx, `No EtCO2 or SpO2 gap longer than ${formatDuration(m.maxHoldS)} during the sedation time`);
  for (const g of m.gaps) line(ctx, `${CHANNEL_LABEL[g.channel]} data gap ${g.start.clock}–${g.end.clock}, ${formatDuration(g.durationS)}`);
  const ph = note.physiology;
  const b = ph.baseline;
  line(ctx, `Baseline EtCO2 ${b.etco2 === null ? 'not known' : formatChannelValue(b.etco2, ph.etco2Unit)}, SpO2 ${b.spo2 === null ? 'not known' : formatChannelValue(b.spo2, '%')}, RR ${b.rr === null ? 'not known' : formatChannelValue(b.rr, '/min')}`);
  const tv = (label: string, x: CaseNote['physiology']['lowestSpo2']) => (x === null ? `${label}: no reading` : `${label} ${formatChannelValue(x.value, x.unit)} at ${x.at.clock}`);
  line(ctx, [tv('Lowest SpO2', ph.lowestSpo2), tv('Highest EtCO2', ph.highestEtco2), tv('Lowest EtCO2', ph.lowestEtco2), tv('Lowest RR', ph.lowestRr)].join(' · '));

  heading(ctx, `Respiratory episodes (rule set ${note.ruleSet.id} version ${note.ruleSet.version})`);
  if (note.episodes.length === 0) line(ctx, 'No respiratory episode');
  else {
    table(
      ctx,
      [
        { title: '#', width: 0.35 },
        { title: 'Rule', width: 1.5 },
        { title: 'Time', width: 1.6 },
        { title: 'Duration', width: 1 },
        { title: 'Extreme', width: 1.9 },
        { title: 'Interventions', width: 2.4 },
        { title: 'First response', width: 0.9 },
        { title: 'Level', width: 0.9 },
      ],
      note.episodes.map(episodeRow),
    );
    const abrupt = note.episodes.filter((e) => e.abruptOnsetHint !== null);
    if (abrupt.length > 0) line(ctx, `Abrupt onset (episode ${abrupt.map((e) => e.n).join(', ')}): ${abrupt[0].abruptOnsetHint}.`, { size: SMALL });
  }
  for (const f of note.spotFindings) line(ctx, `Spot reading ${CHANNEL_LABEL[f.channel]} ${formatChannelValue(f.value, f.unit)} at ${f.at.clock} (${f.label})`);
  for (const s of note.skipped) line(ctx, `Not evaluated: ${s.rule}${s.dropped === 'term' ? ' (one term)' : ''}, ${s.reason}`, { color: MUTED });

  heading(ctx, 'Interventions and case level');
  if (note.interventions.length === 0) line(ctx, 'No intervention recorded');
  for (const i of note.interventions) line(ctx, `${i.at.clock} ${i.label} (${i.level})${i.note !== undefined ? ` — ${i.note}` : ''}`);
  line(ctx, `Case level ${note.caseLevel.label.toLowerCase()}: ${note.caseLevel.meaning}`);
  if (note.caseLevel.confirmRequest !== null) line(ctx, note.caseLevel.confirmRequest, { bold: true });
  if (note.caseLevel.coSignatureNeeded) line(ctx, 'Co-signature required');

  heading(ctx, 'Recovery');
  if (note.recovery.scores.length === 0) line(ctx, 'No recovery score recorded');
  for (const s of note.recovery.scores) {
    const items = (['activity', 'respiration', 'circulation', 'consciousness', 'oxygenation'] as const)
      .filter((k) => s.items[k] !== undefined)
      .map((k) => `${k} ${formatScore(s.items[k] as number)}`);
    line(ctx, `${s.at.clock} Aldrete ${formatScore(s.total)}${items.length > 0 ? ` (${items.join(', ')})` : ''}`);
  }
  line(ctx, note.recovery.discharge === null ? 'Discharge not recorded' : `Discharge ${note.recovery.discharge.clock}`);

  if (note.freeText !== null) {
    heading(ctx, "Nurse's note");
    line(ctx, note.freeText);
  }

  heading(ctx, `Signatures · version ${note.version}`);
  if (note.signatures.length === 0) line(ctx, 'Not signed');
  const verb = { signed: 'Signed', amended: 'Amended', cosigned: 'Co-signed' } as const;
  for (const s of note.signatures) line(ctx, `${verb[s.kind]} by ${s.by} (${s.role}), ${s.atLocal}${s.reason !== null ? `; reason: ${s.reason}` : ''}`);

  doc.y += 6;
  line(ctx, `Rule set ${note.ruleSet.id} version ${note.ruleSet.version}. ${note.caution}`, { size: SMALL, color: MUTED });

  // footer on every page: who, version, page n of m
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const bottomMargin = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    const y = doc.page.height - MARGIN - 10;
    doc.moveTo(MARGIN, y - 4).lineTo(MARGIN + ctx.width, y - 4).lineWidth(0.5).strokeColor(RULE_LINE).stroke();
    body(ctx, SMALL, MUTED).text(`${p.name} · MRN ${p.mrn} · ${pr.date} · note version ${note.version}`, MARGIN, y, { width: ctx.width * 0.7, lineBreak: false });
    body(ctx, SMALL, MUTED).text(`Page ${i - range.start + 1} of ${range.count}`, MARGIN + ctx.width * 0.7, y, { width: ctx.width * 0.3, align: 'right', lineBreak: false });
    doc.page.margins.bottom = bottomMargin;
  }
  return finish();
}
