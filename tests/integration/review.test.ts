/* eslint-disable @typescript-eslint/no-explicit-any -- API responses are JSON of many shapes */
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startApp, testSql, type AppServer } from '../helpers/appServer';
import { Client } from '../helpers/client';
import type { SqlValue } from '@/lib/db/sql';
import { PLATEAU_DEFAULT_V1 } from '@/lib/rules';

let app: AppServer;
let lead: Client;

beforeAll(async () => {
  app = await startApp({ cases: 120 });
  lead = new Client(app.url);
  const a = app.account('lead');
  await lead.signIn(a.username, a.password);
});
afterAll(async () => {
  await app?.stop();
});

function sql<T = any>(query: string, ...args: SqlValue[]): Promise<T[]> {
  return testSql(app).all<T>(query, args);
}

/** Written here from the tables, independently of lib/db/statsRows and lib/review. */
const REVIEWED_FROM = `FROM "Case" c JOIN "CaseSummary" s ON s."caseId" = c."id" AND s."ruleSetId" = 'plateau-default' AND s."ruleSetVersion" = 1
  WHERE c."status" = 'signed'`;
const REVIEWED = `${REVIEWED_FROM} AND c."scheduledDate" >= ? AND c."scheduledDate" <= ?`;

async function direct(from: string, to: string) {
  const n = async (where = '', ...args: SqlValue[]) => (await sql<{ n: number }>(`SELECT COUNT(*) AS "n" ${REVIEWED} ${where}`, from, to, ...args))[0].n;
  const withRule = (rule: string) => n(`AND EXISTS (SELECT 1 FROM "CaseSummaryRule" r WHERE r."summaryId" = s."id" AND r."ruleId" = ? AND r."episodes" > 0)`, rule);
  const responses = (
    await sql<{ v: number }>(
      `SELECT s."firstApneaResponseS" AS "v" ${REVIEWED} AND s."firstApneaResponseS" IS NOT NULL AND EXISTS (SELECT 1 FROM "CaseSummaryRule" r WHERE r."summaryId" = s."id" AND r."ruleId" = 'apnea' AND r."episodes" > 0) ORDER BY "v"`,
      from,
      to,
    )
  ).map((r) => r.v);
  const median = responses.length === 0 ? null : responses.length % 2 ? responses[(responses.length - 1) / 2] : (responses[responses.length / 2 - 1] + responses[responses.length / 2]) / 2;
  const rules: Record<string, number> = {};
  for (const r of PLATEAU_DEFAULT_V1.rules) rules[r.id] = await withRule(r.id);
  const levels: Record<string, number> = {};
  for (const l of ['none', 'observed', 'corrected', 'supported', 'rescued']) levels[l] = await n('AND s."caseLevel" = ?', l);
  return {
    cases: await n(),
    anyEpisode: await n('AND s."episodeCount" > 0'),
    rules,
    levels,
    supportedOrAbove: await n(`AND s."caseLevel" IN ('supported', 'rescued')`),
    major: await n('AND s."majorPhysiology" = TRUE'),
    queue: await n(`AND (s."caseLevel" IN ('supported', 'rescued') OR s."majorPhysiology" = TRUE OR s."firstApneaResponseS" > (SELECT u."reviewResponseLimitS" FROM "Unit" u WHERE u."id" = c."unitId"))`),
    responses,
    median,
    signedWithout: (await sql<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "Case" c WHERE c."status" = 'signed' AND c."scheduledDate" >= ? AND c."scheduledDate" <= ? AND NOT EXISTS (SELECT 1 FROM "CaseSummary" s WHERE s."caseId" = c."id" AND s."ruleSetId" = 'plateau-default' AND s."ruleSetVersion" = 1)`, from, to))[0].n,
  };
}

const months = async () => (await sql<{ m: string }>(`SELECT DISTINCT substr("scheduledDate", 1, 7) AS "m" FROM "Case" WHERE "status" = 'signed' ORDER BY "m"`)).map((r) => r.m);

describe('the monthly review, checked against the database', () => {
  it('opens by default on the last full month', async () => {
    const r = await lead.get('/api/v1/review');
    expect(r.status).toBe(200);
    const [y, m] = new Intl.DateTimeFormat('en-CA', { timeZone: 'Europe/Dublin', year: 'numeric', month: '2-digit' }).format(new Date()).split('-').map(Number);
    const last = m === 1 ? `${y - 1}-12` : `${y}-${String(m - 1).padStart(2, '0')}`;
    expect(r.json.review.period.month).toBe(last);
  });

  it('gives headline numerators and denominators equal to direct counts, for every seeded month', async () => {
    const all = await months();
    expect(all.length).toBeGreaterThanOrEqual(6);
    for (const month of all) {
      const r = await lead.get(`/api/v1/review?month=${month}`);
      expect(r.status, month).toBe(200);
      const h = r.json.review.headline;
      const d = await direct(r.json.review.period.from, r.json.review.period.to);
      const fig = (id: string) => h.figures.find((f: any) => f.id === id);
      expect(h.cases, month).toBe(d.cases);
      expect(h.withoutSummary, month).toBe(d.signedWithout);
      for (const f of h.figures) expect(f.denominator, `${month} ${f.id}`).toBe(d.cases);
      expect(fig('any_episode').numerator, month).toBe(d.anyEpisode);
      for (const [rule, x] of Object.entries(d.rules)) expect(fig(`rule:${rule}`).numerator, `${month} ${rule}`).toBe(x);
      for (const [level, x] of Object.entries(d.levels)) expect(fig(`level:${level}`).numerator, `${month} ${level}`).toBe(x);
      expect(fig('supported_or_above').numerator, month).toBe(d.supportedOrAbove);
      expect(fig('level:rescued').numerator, month).toBe(d.levels.rescued);
      expect(fig('major_physiology').numerator, month).toBe(d.major);
      expect(fig('in_review_queue').numerator, month).toBe(d.queue);
      expect(h.apneaResponse.values.length, month).toBe(d.responses.length);
      expect(h.apneaResponse.median.value, month).toBe(d.median);
      const apnea = fig('rule:apnea');
      if (d.cases > 0) expect(apnea.rate).toBeCloseTo(apnea.numerator / d.cases, 12);
    }
  });

  it('draws the trend from SQL counts that agree with each month’s own headline, and counts the O/E reference', async () => {
    const month = (await months()).at(-2)!;
    const { json } = await lead.get(`/api/v1/review?month=${month}`);
    expect(json.review.trend.months).toHaveLength(12);
    const headlines = new Map<string, any>();
    for (const s of json.review.trend.series) {
      for (const p of s.points) {
        if (!headlines.has(p.month)) headlines.set(p.month, (await lead.get(`/api/v1/review?month=${p.month}`)).json.review.headline);
        const f = headlines.get(p.month).figures.find((x: any) => x.id === s.figure);
        expect([p.x, p.n], `${s.figure} ${p.month}`).toEqual([f.numerator, f.denominator]);
      }
    }
    const ref = json.review.reference;
    const d = await direct(ref.from, ref.to);
    expect(json.review.focus).toBe('rule:apnea');
    expect(json.review.observedExpected.reference).toEqual({ cases: d.cases, events: d.rules.apnea });
  });

  it('has breakdowns whose rows sum to the total, and totals equal to the headline', async () => {
    const month = (await months()).at(-2)!;
    const { json } = await lead.get(`/api/v1/review?month=${month}`);
    const h = json.review.headline;
    expect(json.review.breakdowns).toHaveLength(10);
    for (const b of json.review.breakdowns) {
      expect(b.total.cases, b.dimension).toBe(h.cases);
      expect(b.rows.reduce((a: number, r: any) => a + r.cases, 0), b.dimension).toBe(h.cases);
      for (const f of b.figures) {
        const sum = b.rows.reduce((a: number, r: any) => a + r.cells[f].numerator, 0);
        expect(sum, `${b.dimension} ${f}`).toBe(b.total.cells[f].numerator);
        expect(b.total.cells[f].numerator, f).toBe(h.figures.find((x: any) => x.id === f).numerator);
      }
    }
  });

  it('lists behind a number exactly the cases it counts', async () => {
    const month = (await months()).at(-2)!;
    const { json } = await lead.get(`/api/v1/review?month=${month}`);
    const apnea = json.review.headline.figures.find((f: any) => f.id === 'rule:apnea');
    const list = await lead.get(`/api/v1/review/cases?month=${month}&figure=rule:apnea`);
    expect(list.status).toBe(200);
    expect(list.json.cases).toHaveLength(apnea.numerator);
    const b = json.review.breakdowns.find((x: any) => x.dimension === 'room');
    const room = b.rows[0];
    const byRoom = await lead.get(`/api/v1/review/cases?month=${month}&dim=room&value=${encodeURIComponent(room.key)}`);
    expect(byRoom.json.cases).toHaveLength(room.cases);
  });

  it('exports tables as CSV that parse and match the figures', async () => {
    const month = (await months()).at(-2)!;
    const { json } = await lead.get(`/api/v1/review?month=${month}`);
    const r = await lead.get(`/api/v1/review/export?table=headline&month=${month}`);
    expect(r.status).toBe(200);
    expect(r.headers.get('content-type')).toMatch(/^text\/csv/);
    expect(r.headers.get('content-disposition')).toMatch(/attachment; filename="plateau-review-headline-/);
    const rows = Papa.parse<Record<string, string>>(r.text, { header: true, skipEmptyLines: true }).data;
    for (const f of json.review.headline.figures) {
      const line = rows.find((x) => x.figure === f.id)!;
      expect(Number(line.numerator), f.id).toBe(f.numerator);
      expect(Number(line.denominator), f.id).toBe(f.denominator);
    }
    const b = await lead.get(`/api/v1/review/export?table=breakdown-procedure&month=${month}`);
    const parsed = Papa.parse<Record<string, string>>(b.text, { header: true, skipEmptyLines: true }).data;
    const total = parsed.find((x) => x.procedure === 'total')!;
    expect(parsed.filter((x) => x.procedure !== 'total').reduce((a, x) => a + Number(x.cases), 0)).toBe(Number(total.cases));
    expect(Number(total.cases)).toBe(json.review.headline.cases);
    const bad = await lead.get(`/api/v1/review/export?table=patients&month=${month}`);
    expect(bad.status).toBe(422);
  });

  it('refuses a period that is not one, naming the field', async () => {
    const r = await lead.get('/api/v1/review?month=2026-13');
    expect(r.status).toBe(422);
    expect(r.json.error).toMatch(/month/);
  });
});

describe('recording a review', () => {
  const caseId = async () => (await sql<{ id: string }>(`SELECT c."id" ${REVIEWED_FROM} ORDER BY s."episodeCount" DESC, c."id" LIMIT 1`))[0].id;

  it('saves status, category, comment and follow-up, audited in the same transaction', async () => {
    const id = await caseId();
    const before = (await sql<{ n: number }>('SELECT COUNT(*) AS "n" FROM "AuditEntry"'))[0].n;
    const r = await lead.req('PUT', `/api/v1/review/cases/${id}`, { status: 'reviewed', category: 'dosing', comment: 'Second propofol bolus 60 s after the first.', followUp: 'Discuss titration at the team meeting.', version: 0 });
    expect(r.status).toBe(200);
    expect(r.json.review).toMatchObject({ status: 'reviewed', category: 'dosing', version: 1, reviewer: app.account('lead').displayName });
    const stored = (await sql('SELECT * FROM "CaseReview" WHERE "caseId" = ?', id))[0];
    expect(stored).toMatchObject({ status: 'reviewed', category: 'dosing', version: 1, followUp: 'Discuss titration at the team meeting.' });
    const audit = await sql(`SELECT * FROM "AuditEntry" WHERE "entity" = 'case_review' AND "caseId" = ? ORDER BY "seq"`, id);
    expect(audit).toHaveLength(1);
    expect(audit[0]).toMatchObject({ action: 'create', role: 'lead', entityId: stored.id });
    expect(JSON.parse(audit[0].after)).toMatchObject({ status: 'reviewed', category: 'dosing', version: 1 });
    expect((await sql<{ n: number }>('SELECT COUNT(*) AS "n" FROM "AuditEntry"'))[0].n).toBe(before + 1);

    const upd = await lead.req('PUT', `/api/v1/review/cases/${id}`, { status: 'reviewed', category: 'patient_factors', comment: 'Obese, STOP-Bang 6.', followUp: '', version: 1 });
    expect(upd.status).toBe(200);
    expect(upd.json.review.version).toBe(2);
    const audit2 = await sql(`SELECT * FROM "AuditEntry" WHERE "entity" = 'case_review' AND "caseId" = ? ORDER BY "seq"`, id);
    expect(audit2.map((a) => a.action)).toEqual(['create', 'update']);
    expect(JSON.parse(audit2[1].before)).toMatchObject({ category: 'dosing', version: 1 });
  });

  it('refuses a stale edit with 409 and a clear message, and saves nothing', async () => {
    const id = await caseId();
    const stored = (await sql('SELECT * FROM "CaseReview" WHERE "caseId" = ?', id))[0];
    const audit = (await sql<{ n: number }>('SELECT COUNT(*) AS "n" FROM "AuditEntry"'))[0].n;
    const stale = await lead.req('PUT', `/api/v1/review/cases/${id}`, { status: 'to_review', comment: 'my older view', version: 1 });
    expect(stale.status).toBe(409);
    expect(stale.json.error).toMatch(/saved by .* after you opened it .*Nothing was saved/);
    expect((await sql('SELECT * FROM "CaseReview" WHERE "caseId" = ?', id))[0]).toEqual(stored);
    expect((await sql<{ n: number }>('SELECT COUNT(*) AS "n" FROM "AuditEntry"'))[0].n).toBe(audit);
    const fresh = await lead.req('PUT', `/api/v1/review/cases/${id}`, { status: 'to_review', version: 0 });
    expect(fresh.status).toBe(409);
  });

  it('asks for a category before a case is marked reviewed', async () => {
    const other = (await sql<{ id: string }>(`SELECT "id" FROM "Case" WHERE "status" = 'signed' AND "id" NOT IN (SELECT "caseId" FROM "CaseReview") ORDER BY "id" LIMIT 1`))[0].id;
    const r = await lead.req('PUT', `/api/v1/review/cases/${other}`, { status: 'reviewed', version: 0 });
    expect(r.status).toBe(422);
    expect(r.json.error).toMatch(/^category:/);
  });

  it('shows the review in the queue and in the case view', async () => {
    const id = await caseId();
    const c = await lead.get(`/api/v1/review/cases/${id}`);
    expect(c.status).toBe(200);
    expect(c.json.review).toMatchObject({ version: 2, category: 'patient_factors' });
    expect(c.json.timeline.length).toBeGreaterThan(3);
    for (const e of c.json.episodes) {
      expect(e.window.from).toBe(e.start - 120);
      expect(e.series.spo2.t.every((t: number) => t >= e.window.from && t <= e.window.to)).toBe(true);
    }
  });
});

describe('the review queue', () => {
  it('holds exactly the cases that meet the queue rule, with their review status', async () => {
    let found: any = null;
    for (const month of await months()) {
      const q = await lead.get(`/api/v1/review/queue?month=${month}`);
      expect(q.status).toBe(200);
      const { json } = await lead.get(`/api/v1/review?month=${month}`);
      expect(q.json.queue).toHaveLength(json.review.headline.figures.find((f: any) => f.id === 'in_review_queue').numerator);
      const period = json.review.period;
      const d = await direct(period.from, period.to);
      expect(q.json.queue).toHaveLength(d.queue);
      for (const item of q.json.queue) expect(item.reasons.length).toBeGreaterThan(0);
      if (!found && q.json.queue.length) found = { month, item: q.json.queue.find((i: any) => !i.review) ?? q.json.queue[0] };
    }
    expect(found, 'the seeded months have at least one case in the queue').not.toBeNull();
    const version = found.item.review?.version ?? 0;
    const r = await lead.req('PUT', `/api/v1/review/cases/${found.item.caseId}`, { status: 'reviewed', category: 'monitoring', comment: 'Capnography line kinked.', version });
    expect(r.status).toBe(200);
    const reviewed = await lead.get(`/api/v1/review/queue?month=${found.month}&status=reviewed`);
    expect(reviewed.json.queue.map((i: any) => i.caseId)).toContain(found.item.caseId);
    const open = await lead.get(`/api/v1/review/queue?month=${found.month}&status=to_review`);
    expect(open.json.queue.map((i: any) => i.caseId)).not.toContain(found.item.caseId);
    const csv = Papa.parse<Record<string, string>>((await lead.get(`/api/v1/review/export?table=queue&month=${found.month}`)).text, { header: true, skipEmptyLines: true }).data;
    expect(csv.find((x) => x.case === found.item.key)?.review_status).toBe('Reviewed');
  });
});

describe('rule sets', () => {
  it('saves a lead’s own rule set as new versions, never editing a saved one, audited', async () => {
    const mine = { ...PLATEAU_DEFAULT_V1, id: 'kestrel-bay-local', description: 'Local: apnea from 30 s', rules: PLATEAU_DEFAULT_V1.rules.map((r) => (r.id === 'apnea' ? { ...r, minDurationS: 30 } : r)) };
    const v1 = await lead.post('/api/v1/rule-sets', { ruleSet: mine });
    expect(v1.status).toBe(201);
    expect(v1.json).toEqual({ id: 'kestrel-bay-local', version: 1, created: true });
    const same = await lead.post('/api/v1/rule-sets', { ruleSet: mine });
    expect(same.status).toBe(200);
    expect(same.json.version).toBe(1);
    const v2 = await lead.post('/api/v1/rule-sets', { ruleSet: { ...mine, version: 1, rules: mine.rules.map((r) => (r.id === 'apnea' ? { ...r, minDurationS: 25 } : r)) } });
    expect(v2.json).toEqual({ id: 'kestrel-bay-local', version: 2, created: true });
    const stored = await sql('SELECT "version", "definition" FROM "RuleSetVersion" WHERE "ruleSetId" = ? ORDER BY "version"', 'kestrel-bay-local');
    expect(stored.map((s) => s.version)).toEqual([1, 2]);
    expect(JSON.parse(stored[0].definition).rules.find((r: any) => r.id === 'apnea').minDurationS).toBe(30);
    expect(await sql(`SELECT "action" FROM "AuditEntry" WHERE "entity" = 'rule_set'`)).toHaveLength(2);
    const builtIn = await lead.post('/api/v1/rule-sets', { ruleSet: PLATEAU_DEFAULT_V1 });
    expect(builtIn.status).toBe(409);
    const bad = await lead.post('/api/v1/rule-sets', { ruleSet: { ...mine, rules: [{ ...mine.rules[0], minDurationS: -1 }] } });
    expect(bad.status).toBe(422);
    expect(bad.json.error).toMatch(/ruleSet\.rules\[0\]\.minDurationS/);
    const list = await lead.get('/api/v1/rule-sets');
    expect(list.json.ruleSets.filter((r: any) => r.id === 'kestrel-bay-local').map((r: any) => r.version)).toEqual([2, 1]);
  });

  it('compares a month under another rule set once its summaries are computed', async () => {
    const month = (await months()).at(-2)!;
    const from = `${month}-01`;
    const to = (await sql<{ d: string }>(`SELECT max("scheduledDate") AS "d" FROM "Case" WHERE substr("scheduledDate", 1, 7) = ?`, month))[0].d;
    let before = await lead.get(`/api/v1/review/compare?from=${from}&to=${to}&rs=kestrel-bay-local@1`);
    expect(before.status).toBe(200);
    expect(before.json.missing).toBe(before.json.total);
    for (let i = 0; i < 20 && before.json.missing > 0; i++) {
      const step = await lead.post('/api/v1/rule-sets/summaries', { ruleSet: 'kestrel-bay-local@1', from, to, limit: 10 });
      expect(step.status).toBe(200);
      before = await lead.get(`/api/v1/review/compare?from=${from}&to=${to}&rs=kestrel-bay-local@1`);
    }
    const c = before.json.comparison;
    expect(before.json.missing).toBe(0);
    expect(c.cases).toBe((await direct(from, to)).cases);
    const apnea = c.figures.find((f: any) => f.id === 'rule:apnea');
    // a 30 s minimum can only lose apneas that the 20 s rule found
    expect(apnea.b.numerator).toBeLessThanOrEqual(apnea.a.numerator);
    expect(apnea.onlyB).toBe(0);
    expect(apnea.a.numerator - apnea.onlyA).toBe(apnea.b.numerator);
    for (const x of c.changedCases) expect(x.changes.length).toBeGreaterThan(0);
  });
});

describe('who may see the review', () => {
  const pages = ['/review', '/review/cases', '/review/queue', '/review/rule-sets'];
  const apis: [string, string][] = [
    ['GET', '/api/v1/review'],
    ['GET', '/api/v1/review/export?table=headline'],
    ['GET', '/api/v1/review/cases'],
    ['GET', '/api/v1/review/queue'],
    ['GET', '/api/v1/review/compare?rs=mason-2012@1'],
    ['GET', '/api/v1/rule-sets'],
  ];

  for (const role of ['nurse', 'safety', 'admin']) {
    it(`refuses the ${role} role on every review page and API`, async () => {
      const c = new Client(app.url);
      const a = app.account(role);
      await c.signIn(a.username, a.password);
      const caseId = (await sql<{ id: string }>('SELECT "id" FROM "Case" ORDER BY "id" LIMIT 1'))[0].id;
      for (const p of [...pages, `/review/cases/${caseId}`]) expect((await c.get(p)).status, p).toBe(403);
      for (const [m, p] of apis) expect((await c.req(m, p)).status, p).toBe(403);
      expect((await c.req('PUT', `/api/v1/review/cases/${caseId}`, { status: 'to_review', version: 0 })).status).toBe(403);
      expect((await c.post('/api/v1/rule-sets', { ruleSet: PLATEAU_DEFAULT_V1 })).status).toBe(403);
      expect((await c.post('/api/v1/rule-sets/summaries', { ruleSet: 'mason-2012@1', from: '2026-01-01', to: '2026-01-31' })).status).toBe(403);
    });
  }

  it('sends a visitor without a session to sign in', async () => {
    const c = new Client(app.url);
    expect((await c.get('/api/v1/review')).status).toBe(401);
    const page = await c.get('/review');
    expect([302, 303, 307]).toContain(page.status);
  });
});
