/**
 * Safety indicators through the real built server and a real database seeded with the
 * fictional demo unit: the numbers against SQL counts written here independently of the
 * indicator code, de-identification of every export format, the freeze of an issued version,
 * the PDF rendered with poppler-utils, and who may do what.
 */
import { execFileSync } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeTestSql, onPostgres, startApp, testSql, type AppServer } from '../helpers/appServer';
import { Client } from '../helpers/client';
import { closeDb, openDb } from '@/lib/db/client';
import { asDate, type SqlValue } from '@/lib/db/sql';
import { refreshSummary } from '@/lib/db/summaries';
import { lastCompletePeriod, periodContaining, shiftPeriod, type IndicatorReport, type Period } from '@/lib/indicators';
import { localDate } from '@/lib/_shared/time';

/* eslint-disable @typescript-eslint/no-explicit-any -- JSON answers of many shapes */

let app: AppServer;
let tmp = '';

/** Like tests/helpers/client.ts, but keeps the body as bytes (PDF). */
class BinClient {
  private cookie = '';
  constructor(private base: string) {}
  async signIn(role: string) {
    const a = app.account(role);
    const r = await this.req('POST', '/api/v1/session', { username: a.username, password: a.password });
    if (r.status !== 200) throw new Error(`sign-in ${role}: ${r.status}`);
    return this;
  }
  async req(method: string, p: string, body?: unknown) {
    const headers: Record<string, string> = {};
    if (this.cookie) headers.cookie = this.cookie;
    if (body !== undefined) headers['content-type'] = 'application/json';
    const r = await fetch(this.base + p, { method, headers, body: body === undefined ? undefined : JSON.stringify(body), redirect: 'manual' });
    for (const c of r.headers.getSetCookie()) if (c.startsWith('plateau_session=')) this.cookie = c.split(';')[0];
    const bytes = new Uint8Array(await r.arrayBuffer());
    const text = new TextDecoder().decode(bytes);
    let json: any = null;
    try {
      json = JSON.parse(text);
    } catch {
      /* not JSON */
    }
    return { status: r.status, headers: r.headers, bytes, text, json };
  }
  get(p: string) {
    return this.req('GET', p);
  }
  post(p: string, body: unknown) {
    return this.req('POST', p, body);
  }
}

const as = (role: string) => new BinClient(app.url).signIn(role);

function sql<T = Record<string, unknown>>(query: string, ...params: SqlValue[]): Promise<T[]> {
  return testSql(app).all<T>(query, params);
}

function pdftotext(bytes: Uint8Array): string {
  const f = path.join(tmp, `${randomUUID()}.pdf`);
  fs.writeFileSync(f, bytes);
  return execFileSync('/usr/bin/pdftotext', ['-layout', f, '-'], { encoding: 'utf8' });
}

/** Share of dark pixels per page (pdftoppm grey PGM at 30 dpi). */
function inkPerPage(bytes: Uint8Array): number[] {
  const d = fs.mkdtempSync(path.join(tmp, 'ink-'));
  const f = path.join(d, 'r.pdf');
  fs.writeFileSync(f, bytes);
  execFileSync('/usr/bin/pdftoppm', ['-r', '30', '-gray', f, path.join(d, 'p')]);
  return fs
    .readdirSync(d)
    .filter((n) => n.endsWith('.pgm'))
    .sort()
    .map((n) => {
      const buf = fs.readFileSync(path.join(d, n));
      const h = /^P5\s+(\d+)\s+(\d+)\s+255\s/.exec(buf.subarray(0, 40).toString('latin1'))!;
      let dark = 0;
      for (const p of buf.subarray(h[0].length)) if (p < 200) dark++;
      return dark / (Number(h[1]) * Number(h[2]));
    });
}

// ── independent SQL definitions of every indicator (written from docs/indicators.md, not from the code) ──

const SUMMARY_JOIN = `LEFT JOIN "CaseSummary" s ON s."caseId" = b."id" AND s."ruleSetId" = 'plateau-default' AND s."ruleSetVersion" = 1`;
/**
 * An instant as a number that orders like it, and the gap between two such numbers in seconds
 * (to the millisecond the instants carry): SQLite in Julian days, PostgreSQL in epoch seconds.
 */
const T = (x: string) => (onPostgres ? `EXTRACT(EPOCH FROM ${x})` : `julianday(${x})`);
const GAP_S = (later: string, earlier: string) => (onPostgres ? `(${later} - ${earlier})` : `ROUND((${later} - ${earlier}) * 86400.0, 3)`);
/** Longest gap (s) between sedation start, manual BP/HR readings and sedation end (or recovery start). */
const GAP_CTE = `
WITH sed AS (
  SELECT c."id" AS "caseId",
    (SELECT MIN(${T('e."at"')}) FROM "CaseEvent" e WHERE e."caseId" = c."id" AND e."voidedAt" IS NULL AND e."kind" = 'sedation_start') AS s0,
    COALESCE((SELECT MIN(${T('e."at"')}) FROM "CaseEvent" e WHERE e."caseId" = c."id" AND e."voidedAt" IS NULL AND e."kind" = 'sedation_end'),
             (SELECT MIN(${T('e."at"')}) FROM "CaseEvent" e WHERE e."caseId" = c."id" AND e."voidedAt" IS NULL AND e."kind" = 'recovery_start')) AS s1
  FROM "Case" c),
pts AS (
  SELECT "caseId", s0 AS t FROM sed WHERE s0 IS NOT NULL AND s1 IS NOT NULL
  UNION ALL SELECT "caseId", s1 FROM sed WHERE s0 IS NOT NULL AND s1 IS NOT NULL
  UNION ALL SELECT v."caseId", ${T('v."at"')} FROM "ManualVital" v JOIN sed ON sed."caseId" = v."caseId"
    WHERE v."voidedAt" IS NULL AND (v."sbp" IS NOT NULL OR v."hr" IS NOT NULL) AND ${T('v."at"')} BETWEEN sed.s0 AND sed.s1),
gaps AS (SELECT "caseId", ${GAP_S('t', 'LAG(t) OVER (PARTITION BY "caseId" ORDER BY t)')} AS g FROM pts),
gap AS (SELECT "caseId", MAX(g) AS longest FROM gaps GROUP BY "caseId")`;

const SED = `b."plannedDepth" IN ('minimal', 'moderate', 'deep')`;
const MOD = `b."plannedDepth" IN ('moderate', 'deep')`;
const HAS_S = `s."id" IS NOT NULL`;
const CAPNO = `${SED} AND ${HAS_S} AND s."capnoCoveragePct" > 0`;
const SPO2 = `${SED} AND ${HAS_S} AND s."lowestSpo2" IS NOT NULL`;
const episodes = (rule: string) => `EXISTS (SELECT 1 FROM "CaseSummaryRule" r WHERE r."summaryId" = s."id" AND r."ruleId" = '${rule}' AND r."episodes" > 0)`;
const intervention = (...kinds: string[]) => `EXISTS (SELECT 1 FROM "Intervention" i WHERE i."caseId" = b."id" AND i."voidedAt" IS NULL AND i."kind" IN (${kinds.map((k) => `'${k}'`).join(', ')}))`;
const DOC_COMPLETE = `b."asaClass" IS NOT NULL AND b."weightKg" IS NOT NULL AND b."sbSnoring" IS NOT NULL AND b."sbTired" IS NOT NULL AND b."sbObserved" IS NOT NULL AND b."sbPressure" IS NOT NULL AND gap.longest IS NOT NULL AND gap.longest <= 330`;

const PROPORTIONS: Record<string, { den: string; num: string }> = {
  hypoxemia: { den: SPO2, num: episodes('hypoxemia') },
  severe_hypoxemia: { den: SPO2, num: episodes('severe_hypoxemia') },
  apnea: { den: CAPNO, num: episodes('apnea') },
  prolonged_apnea: { den: CAPNO, num: episodes('prolonged_apnea') },
  positive_pressure_ventilation: { den: SED, num: intervention('bag_mask', 'supraglottic_airway', 'intubation') },
  reversal_agent: { den: SED, num: intervention('naloxone', 'flumazenil') },
  level_supported_or_above: { den: `${SED} AND ${HAS_S}`, num: `s."caseLevel" IN ('supported', 'rescued')` },
  level_rescued: { den: `${SED} AND ${HAS_S}`, num: `s."caseLevel" = 'rescued'` },
  procedure_stopped: { den: SED, num: intervention('procedure_stopped') },
  capnography_90: { den: `${MOD} AND ${HAS_S} AND s."capnoCoveragePct" IS NOT NULL`, num: `s."capnoCoveragePct" >= 90` },
  documentation_complete: { den: MOD, num: DOC_COMPLETE },
};
const RESPONSE = `${CAPNO} AND ${episodes('apnea')} AND s."firstApneaResponseS" IS NOT NULL`;

async function caseIds(p: Period, where: string): Promise<string[]> {
  return (await sql<{ id: string }>(`${GAP_CTE} SELECT b."id" FROM "Case" b ${SUMMARY_JOIN} LEFT JOIN gap ON gap."caseId" = b."id" WHERE b."status" = 'signed' AND b."scheduledDate" BETWEEN ? AND ? AND (${where})`, p.start, p.end)).map((r) => r.id);
}

async function responseTimes(p: Period): Promise<number[]> {
  return (await sql<{ v: number }>(`SELECT s."firstApneaResponseS" AS "v" FROM "Case" b ${SUMMARY_JOIN} WHERE b."status" = 'signed' AND b."scheduledDate" BETWEEN ? AND ? AND ${RESPONSE}`, p.start, p.end)).map((r) => r.v);
}

/** Hyndman & Fan type 7, written here again. */
function type7(values: number[], q: number): number {
  const x = [...values].sort((a, b) => a - b);
  const h = (x.length - 1) * q;
  const lo = Math.floor(h);
  return x[lo] + (h - lo) * ((x[lo + 1] ?? x[lo]) - x[lo]);
}

/** A published cell agrees with the SQL count: equal when shown, a small count when suppressed. */
function expectCell(id: string, cell: any, den: number, num: number) {
  expect(cell.denominator, `${id} ${cell.period.label} denominator`).toBe(den);
  if (cell.suppressed === null) expect(cell.numerator, `${id} ${cell.period.label} numerator`).toBe(num);
  else if (cell.suppressed === 'small_numerator') expect(num >= 1 && num <= 4, `${id} ${cell.period.label}: ${num} is a small count`).toBe(true);
  else if (cell.suppressed === 'small_complement') expect(den - num >= 1 && den - num <= 4, `${id} complement ${den - num}`).toBe(true);
  else expect(den).toBeLessThan(5);
}

let quarter: Period;
let issuedV1: { id: string; version: number };

beforeAll(async () => {
  tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'plateau-ind-int-'));
  app = await startApp({ cases: 150 });
  const today = localDate(new Date(), 'Europe/Dublin');
  quarter = lastCompletePeriod('quarter', today);
  // the demo spans the last 6 months; make sure the quarter chosen has cases
  const n = (await sql<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "Case" WHERE "status" = 'signed' AND "scheduledDate" BETWEEN ? AND ?`, quarter.start, quarter.end))[0].n;
  if (n < 20) quarter = shiftPeriod(quarter, 1);
});
afterAll(async () => {
  await app?.stop();
  if (tmp) fs.rmSync(tmp, { recursive: true, force: true });
});

describe('the numbers against independent SQL counts', () => {
  it('a safety officer issues the last quarter; every indicator matches SQL, down to the set of counted cases', async () => {
    const safety = await as('safety');
    const issued = await safety.post('/api/v1/reports', { period: quarter.label, scope: 'all' });
    expect(issued.status, issued.text).toBe(201);
    expect(issued.json).toMatchObject({ version: 1, diff: null });
    issuedV1 = issued.json;

    const lead = await as('lead');
    const view = await lead.get(`/api/v1/reports/${issuedV1.id}`);
    expect(view.status).toBe(200);
    const report: IndicatorReport = view.json.report;
    expect(report.period.label).toBe(quarter.label);
    expect(report.cases).toBe((await sql<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "Case" WHERE "status" = 'signed' AND "scheduledDate" BETWEEN ? AND ?`, quarter.start, quarter.end))[0].n);
    const refs: Record<string, string[]> = view.json.refs;

    // resolve every reference once (as the lead would, inside Plateau)
    const caseOf = new Map<string, string>();
    for (const ref of new Set(Object.values(refs).flat())) {
      const r = await lead.get(`/api/v1/reports/${issuedV1.id}/refs/${ref}`);
      expect(r.status).toBe(200);
      caseOf.set(ref, r.json.caseId);
    }

    for (const [id, q] of Object.entries(PROPORTIONS)) {
      const ind = report.indicators.find((i) => i.id === id)!;
      const den = await caseIds(quarter, q.den);
      const num = await caseIds(quarter, `${q.den} AND ${q.num}`);
      expectCell(id, ind.current, den.length, num.length);
      expect(refs[id].map((r) => caseOf.get(r)).sort(), `${id}: the counted cases`).toEqual([...num].sort());
    }
    const times = await responseTimes(quarter);
    for (const [id, p] of [['apnea_response_median', 0.5], ['apnea_response_p90', 0.9]] as const) {
      const ind = report.indicators.find((i) => i.id === id)!;
      if (times.length >= 5) expect(ind.current.value!, id).toBeCloseTo(type7(times, p), 6);
      else expect(ind.current.suppressed).toBe('small_n');
      expect(refs[id]).toHaveLength(times.length);
    }
  });

  it('the JSON API gives the same counts month by month', async () => {
    const lead = await as('lead');
    const first = (await sql<{ d: string }>(`SELECT MIN("scheduledDate") AS "d" FROM "Case" WHERE "status" = 'signed'`))[0].d;
    const from = periodContaining('month', first).start;
    const to = lastCompletePeriod('month', localDate(new Date(), 'Europe/Dublin')).end;
    const r = await lead.get(`/api/v1/indicators?from=${from}&to=${to}&scope=all`);
    expect(r.status, r.text).toBe(200);
    expect(r.json.format).toBe('plateau-indicator-series/1');
    expect(r.json.periods.length).toBeGreaterThanOrEqual(5);
    expect(r.json.rows).toHaveLength(r.json.periods.length * r.json.indicators.length);
    let compared = 0;
    for (const ind of r.json.indicators) {
      for (const cell of ind.cells) {
        const p: Period = cell.period;
        if (ind.id in PROPORTIONS) {
          const q = PROPORTIONS[ind.id];
          expectCell(ind.id, cell, (await caseIds(p, q.den)).length, (await caseIds(p, `${q.den} AND ${q.num}`)).length);
        } else {
          const times = await responseTimes(p);
          if (cell.value !== null) expect(cell.value).toBeCloseTo(type7(times, ind.definition.p), 6);
          else expect(times.length).toBeLessThan(5);
        }
        compared++;
      }
    }
    expect(compared).toBe(r.json.rows.length);
  });
});

describe('de-identification of every export format', () => {
  it('no patient name, record number, birth date, case id or exact time of care appears in any JSON, CSV or PDF export', async () => {
    const safety = await as('safety');
    const q = `period=${quarter.label}&scope=all`;
    const exports = {
      draftJson: await safety.get(`/api/v1/reports/export?${q}&format=json`),
      draftCsv: await safety.get(`/api/v1/reports/export?${q}&format=csv`),
      draftPdf: await safety.get(`/api/v1/reports/export?${q}&format=pdf`),
      issuedJson: await safety.get(`/api/v1/reports/${issuedV1.id}/export?format=json`),
      issuedCsv: await safety.get(`/api/v1/reports/${issuedV1.id}/export?format=csv`),
      issuedPdf: await safety.get(`/api/v1/reports/${issuedV1.id}/export?format=pdf`),
      api: await safety.get(`/api/v1/indicators?from=${shiftPeriod(quarter, -1).start}&to=${quarter.end}&period=month&scope=all`),
    };
    for (const [name, r] of Object.entries(exports)) expect(r.status, `${name}: ${r.text.slice(0, 200)}`).toBe(200);
    expect(exports.draftPdf.headers.get('content-type')).toBe('application/pdf');
    expect(exports.draftCsv.headers.get('content-type')).toMatch(/text\/csv/);
    expect(exports.issuedCsv.headers.get('content-disposition')).toMatch(/attachment; filename="plateau-indicators-.*-v1\.csv"/);

    const patients = await sql<{ familyName: string; givenName: string; mrn: string; birthDate: string }>(`SELECT "familyName", "givenName", "mrn", "birthDate" FROM "Patient"`);
    const cases = (await sql<{ id: string; key: string | null; startAt: unknown }>(`SELECT "id", "key", "startAt" FROM "Case"`)).map((c) => ({ ...c, startAt: typeof c.startAt === 'string' ? c.startAt : asDate(c.startAt).toISOString() })); // SQLite: the stored text
    expect(patients.length).toBeGreaterThan(50);
    const identities = [
      ...patients.flatMap((p) => [p.familyName, p.givenName, p.mrn, p.birthDate]),
      ...cases.flatMap((c) => [c.id, ...(c.key ? [c.key] : []), c.startAt.slice(0, 16), new Date(c.startAt).toISOString().slice(0, 16)]),
    ];
    const texts: Record<string, string> = {};
    for (const [name, r] of Object.entries(exports)) {
      if (name.endsWith('Pdf')) {
        texts[`${name} (pdftotext)`] = pdftotext(r.bytes);
        texts[`${name} (raw bytes)`] = Buffer.from(r.bytes).toString('latin1');
      } else texts[name] = r.text;
    }
    for (const [name, text] of Object.entries(texts)) {
      const raw = name.endsWith('(raw bytes)');
      for (const id of identities) {
        // compressed PDF streams are random bytes: there only identifiers long enough not to occur by chance are checked
        if (raw && id.length < 8) continue;
        expect(text.includes(id), `${name} contains ${id}`).toBe(false);
      }
      if (!raw) {
        expect(text, `${name}: an ISO instant`).not.toMatch(/\d{4}-\d{2}-\d{2}T\d{2}:\d{2}/);
        expect(text, `${name}: a clock time`).not.toMatch(/\b\d{1,2}:\d{2}\b/);
        expect(text, `${name}: a case reference`).not.toMatch(/R-[0-9A-Z]{8}/);
      }
    }
  });
});

describe('an issued version is frozen', () => {
  it('late documentation does not change version 1; re-issuing makes version 2 listing the differences', async () => {
    const safety = await as('safety');
    const before = {
      json: (await safety.get(`/api/v1/reports/${issuedV1.id}/export?format=json`)).text,
      csv: (await safety.get(`/api/v1/reports/${issuedV1.id}/export?format=csv`)).text,
      view: (await safety.get(`/api/v1/reports/${issuedV1.id}`)).json.report,
    };
    const ppvBefore = (await caseIds(quarter, `${PROPORTIONS.positive_pressure_ventilation.den} AND ${PROPORTIONS.positive_pressure_ventilation.num}`)).length;

    // late documentation: six signed cases of the quarter get a bag-mask ventilation entered
    // directly in the database, and their stored summaries are recomputed
    const targets = await sql<{ id: string; at: unknown }>(
      `SELECT b."id", (SELECT MIN(e."at") FROM "CaseEvent" e WHERE e."caseId" = b."id" AND e."kind" = 'sedation_start') AS "at"
       FROM "Case" b ${SUMMARY_JOIN} WHERE b."status" = 'signed' AND b."scheduledDate" BETWEEN ? AND ? AND ${SED} AND ${HAS_S}
       AND NOT ${intervention('bag_mask', 'supraglottic_airway', 'intubation')} ORDER BY b."id" LIMIT 6`,
      quarter.start,
      quarter.end,
    );
    expect(targets).toHaveLength(6);
    await testSql(app).tx(async (q) => {
      for (const t of targets) {
        await q.run(`INSERT INTO "Intervention" ("id", "caseId", "kind", "at", "note", "createdAt", "createdById") VALUES (?, ?, 'bag_mask', ?, 'late entry (test)', ?, NULL)`, [randomUUID(), t.id, new Date(asDate(t.at).getTime() + 120_000), new Date()]);
      }
    });
    const client = openDb(app.target);
    try {
      for (const t of targets) await refreshSummary(client, t.id, new Date());
    } finally {
      await closeDb(client);
      // On PostgreSQL the client shared this process's pool for the URL with testSql, and closeDb ended it.
      await closeTestSql(app.target);
    }
    const ppvAfter = (await caseIds(quarter, `${PROPORTIONS.positive_pressure_ventilation.den} AND ${PROPORTIONS.positive_pressure_ventilation.num}`)).length;
    expect(ppvAfter).toBe(ppvBefore + 6);

    // version 1 is unchanged, byte for byte
    expect((await safety.get(`/api/v1/reports/${issuedV1.id}/export?format=json`)).text).toBe(before.json);
    expect((await safety.get(`/api/v1/reports/${issuedV1.id}/export?format=csv`)).text).toBe(before.csv);
    expect((await safety.get(`/api/v1/reports/${issuedV1.id}`)).json.report).toEqual(before.view);
    // while the live report already shows the late entries
    const live = (await safety.get(`/api/v1/reports/export?period=${quarter.label}&scope=all&format=json`)).json as IndicatorReport;
    expect(live.indicators.find((i) => i.id === 'positive_pressure_ventilation')!.current.numerator).toBe(ppvAfter);

    const v2 = await safety.post('/api/v1/reports', { period: quarter.label, scope: 'all' });
    expect(v2.status, v2.text).toBe(201);
    expect(v2.json.version).toBe(2);
    expect(v2.json.reportKey).toBe((issuedV1 as any).reportKey);
    const oldDisplay = before.view.indicators.find((i: any) => i.id === 'positive_pressure_ventilation').current.display.numerator;
    expect(v2.json.diff.changes).toContainEqual({
      indicatorId: 'positive_pressure_ventilation',
      title: 'Cases with bag-mask or other positive-pressure ventilation',
      what: `${quarter.label} numerator`,
      before: oldDisplay,
      after: String(ppvAfter),
    });
    // version 1 is still there and still unchanged; the list shows both versions
    expect((await safety.get(`/api/v1/reports/${issuedV1.id}/export?format=json`)).text).toBe(before.json);
    const list = (await safety.get('/api/v1/reports')).json.reports.filter((r: any) => r.reportKey === (issuedV1 as any).reportKey);
    expect(list.map((r: any) => r.version)).toEqual([2, 1]);
    expect(list[0].changes).toBe(v2.json.diff.changes.length);
    const v2Json = (await safety.get(`/api/v1/reports/${v2.json.id}/export?format=json`)).json as IndicatorReport;
    expect(v2Json.issue).toMatchObject({ version: 2 });

    // the page of version 2 lists the differences
    const c = new Client(app.url);
    await c.signIn(app.account('safety').username, app.account('safety').password);
    const html = (await c.get(`/reports/issued/${v2.json.id}`)).text;
    expect(html).toContain('Differences from version 1');
    expect(html).toContain(`${quarter.label} numerator`);

    // nothing new: a third issue is refused
    const again = await safety.post('/api/v1/reports', { period: quarter.label, scope: 'all' });
    expect(again.status).toBe(409);
    expect(again.json.error).toMatch(/version 2 already publishes these numbers/);

    const audit = await sql<{ action: string; n: number }>(`SELECT "action", COUNT(*) AS "n" FROM "AuditEntry" WHERE "entity" IN ('indicator_report', 'indicator_draft', 'report_case_ref') GROUP BY "action"`);
    const byAction = Object.fromEntries(audit.map((a) => [a.action, a.n]));
    expect(byAction.issue).toBe(2);
    expect(byAction.export).toBeGreaterThanOrEqual(8);
    expect(byAction.resolve_ref).toBeGreaterThan(0);
  });
});

describe('the PDF export', () => {
  it('renders every page with ink (pdftoppm) and holds every indicator row (pdftotext)', async () => {
    const lead = await as('lead');
    const pdf = await lead.get(`/api/v1/reports/${issuedV1.id}/export?format=pdf`);
    expect(pdf.status).toBe(200);
    expect(new TextDecoder().decode(pdf.bytes.slice(0, 5))).toBe('%PDF-');
    const ink = inkPerPage(pdf.bytes);
    const report = (await lead.get(`/api/v1/reports/${issuedV1.id}`)).json.report as IndicatorReport;
    expect(ink).toHaveLength(report.indicators.length + 2);
    for (const share of ink) expect(share).toBeGreaterThan(0.003);
    const text = pdftotext(pdf.bytes);
    const flat = text.replace(/\s+/g, ' ');
    expect(flat).toContain('Issued version 1');
    expect(flat).toContain(`Page 1 of ${ink.length}`);
    expect(flat).toContain(`Page ${ink.length} of ${ink.length}`);
    for (const ind of report.indicators) {
      expect(flat, ind.id).toContain(ind.definition.title);
      const c = ind.current.display;
      const expected = ind.definition.kind === 'proportion' ? `This period ${quarter.label} ${c.numerator} ${c.denominator} ${c.value}` : `This period ${quarter.label} ${c.denominator} ${c.value}`;
      // pdftotext closes up "< 5" to "<5": compare without spaces
      expect(flat.replace(/\s/g, ''), ind.id).toContain(expected.replace(/\s/g, ''));
    }
  });
});

describe('who may do what', () => {
  it('a nurse is refused every report page and route (403)', async () => {
    const nurse = await as('nurse');
    for (const p of ['/reports', `/reports/issued/${issuedV1.id}`, `/api/v1/indicators?from=${quarter.start}&to=${quarter.end}`, '/api/v1/reports', `/api/v1/reports/${issuedV1.id}`, `/api/v1/reports/${issuedV1.id}/export?format=csv`, `/api/v1/reports/export?period=${quarter.label}&format=csv`]) {
      expect((await nurse.get(p)).status, p).toBe(403);
    }
    expect((await nurse.post('/api/v1/reports', { period: quarter.label })).status).toBe(403);
  });

  it('a lead reads and exports but may not issue; an admin reads but may not export; only a lead resolves references', async () => {
    const lead = await as('lead');
    expect((await lead.get('/reports')).status).toBe(200);
    expect((await lead.post('/api/v1/reports', { period: quarter.label })).status).toBe(403);
    const admin = await as('admin');
    expect((await admin.get('/reports')).status).toBe(200);
    expect((await admin.get(`/reports/issued/${issuedV1.id}`)).status).toBe(200);
    expect((await admin.get(`/api/v1/reports/${issuedV1.id}/export?format=pdf`)).status).toBe(403);
    expect((await admin.get(`/api/v1/reports/${issuedV1.id}`)).json.refs).toBeNull();
    const safety = await as('safety');
    expect((await safety.get(`/api/v1/reports/${issuedV1.id}/refs/R-00000000`)).status).toBe(403);
    expect((await lead.get(`/api/v1/reports/${issuedV1.id}/refs/R-00000000`)).status).toBe(404);
    expect((await new BinClient(app.url).get('/api/v1/reports')).status).toBe(401);
  });

  it('the safety officer sees the report page with the issue button and downloads', async () => {
    const c = new Client(app.url);
    await c.signIn(app.account('safety').username, app.account('safety').password);
    const html = (await c.get(`/reports?period=${quarter.label}`)).text;
    expect(html).toContain('data-testid="issue-report"');
    expect(html).toContain('/api/v1/reports/export?');
    expect(html).toContain('Cases with hypoxaemia');
  });

  it('bad requests name the field; an unfinished period cannot be issued', async () => {
    const safety = await as('safety');
    const bad = await safety.post('/api/v1/reports', { period: '2026-13' });
    expect(bad.status).toBe(422);
    expect(bad.json.error).toMatch(/^period:/);
    const unknown = await safety.post('/api/v1/reports', { period: quarter.label, scope: ['no-such-unit'] });
    expect(unknown.status).toBe(422);
    expect(unknown.json.error).toMatch(/scope: unknown unit/);
    const running = await safety.post('/api/v1/reports', { period: periodContaining('quarter', localDate(new Date(), 'Europe/Dublin')).label });
    expect(running.status).toBe(409);
    expect(running.json.error).toMatch(/has not ended yet/);
    const lower = await safety.post('/api/v1/reports', { period: quarter.label, minCell: 2 });
    expect(lower.status).toBe(422);
    expect(lower.json.error).toMatch(/minCell/);
    const backwards = await safety.get(`/api/v1/indicators?from=${quarter.end}&to=${quarter.start}`);
    expect(backwards.status).toBe(422);
    expect(backwards.json.error).toMatch(/^from:/);
    const notDate = await safety.get('/api/v1/indicators?from=2026-02-30&to=2026-03-31');
    expect(notDate.status).toBe(422);
    expect(notDate.json.error).toMatch(/from/);
  });
});
