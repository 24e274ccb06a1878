import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startApp, testSql, type AppServer } from '../helpers/appServer';
import { Client } from '../helpers/client';
import type { SqlValue } from '@/lib/db/sql';

let app: AppServer;
beforeAll(async () => {
  app = await startApp({ cases: 25 });
});
afterAll(async () => {
  await app?.stop();
});

const all = <T,>(sql: string, ...args: SqlValue[]): Promise<T[]> => testSql(app).all<T>(sql, args);

describe('stored per-case summaries', () => {
  it('exist for every seeded demo case, keyed by the rule set and its version', async () => {
    const missing = await all<{ id: string }>(`SELECT c."id" FROM "Case" c LEFT JOIN "CaseSummary" s ON s."caseId" = c."id" AND s."ruleSetId" = 'plateau-default' AND s."ruleSetVersion" = 1 WHERE s."id" IS NULL`);
    expect(missing).toEqual([]);
    const perRule = await all<{ n: number }>('SELECT COUNT(DISTINCT "ruleId") AS "n" FROM "CaseSummaryRule"');
    expect(perRule[0].n).toBe(9);
  });

  it('are recomputed when the case data changes: an intervention during an apnea raises the level', async () => {
    const c = new Client(app.url);
    await c.signIn(app.account('nurse').username, app.account('nurse').password);
    const row = (await all<{ caseId: string; analysisJson: string }>(`SELECT s."caseId", s."analysisJson" FROM "CaseSummary" s JOIN "Case" c ON c."id" = s."caseId" WHERE c."status" != 'signed' AND s."episodeCount" > 0 ORDER BY s."caseId" LIMIT 1`))[0]
      ?? (await all<{ caseId: string; analysisJson: string }>(`SELECT s."caseId", s."analysisJson" FROM "CaseSummary" s JOIN "Case" c ON c."id" = s."caseId" WHERE c."status" != 'signed' ORDER BY s."caseId" LIMIT 1`))[0];
    expect(row, 'an unsigned demo case today').toBeTruthy();
    const sheet = (await c.get(`/api/v1/cases/${row.caseId}/sheet`)).json;
    const start = Date.parse(sheet.case.startAt);
    const before = (await all<{ caseLevel: string; inputHash: string }>('SELECT "caseLevel", "inputHash" FROM "CaseSummary" WHERE "caseId" = ?', row.caseId))[0];
    const r = await c.post(`/api/v1/cases/${row.caseId}/entries`, { id: randomUUID(), type: 'intervention', kind: 'bag_mask', at: new Date(start + 60_000).toISOString() });
    expect(r.status).toBe(201);
    // Whoever reads the case next (here the sheet) finds the summary brought up to date.
    await c.get(`/api/v1/cases/${row.caseId}/sheet`);
    const after = (await all<{ caseLevel: string; inputHash: string }>('SELECT "caseLevel", "inputHash" FROM "CaseSummary" WHERE "caseId" = ?', row.caseId))[0];
    expect(after.inputHash).not.toBe(before.inputHash);
    // rules.md §6: the case level is the highest level of all interventions recorded.
    expect(after.caseLevel).toBe('supported');
  });

  it('are recomputed for another rule set when a lead makes it the unit’s active one; a nurse may not', async () => {
    const nurse = new Client(app.url);
    await nurse.signIn(app.account('nurse').username, app.account('nurse').password);
    expect((await nurse.post('/api/v1/admin/rule-set', { ruleSetId: 'conway-2019', version: 1 })).status).toBe(403);
    const lead = new Client(app.url);
    await lead.signIn(app.account('lead').username, app.account('lead').password);
    const unknown = await lead.post('/api/v1/admin/rule-set', { ruleSetId: 'no-such-set', version: 1 });
    expect(unknown.status).toBe(404);
    const r = await lead.post('/api/v1/admin/rule-set', { ruleSetId: 'conway-2019', version: 1 });
    expect(r.status, r.text).toBe(200);
    const cases = (await all<{ n: number }>('SELECT COUNT(*) AS "n" FROM "Case"'))[0].n;
    expect(r.json.recomputed).toBe(cases);
    expect((await all<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "CaseSummary" WHERE "ruleSetId" = 'conway-2019' AND "ruleSetVersion" = 1`))[0].n).toBe(cases);
    // The default rule set's rows stay: results are kept per version, never overwritten.
    expect((await all<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "CaseSummary" WHERE "ruleSetId" = 'plateau-default'`))[0].n).toBe(cases);
    await lead.post('/api/v1/admin/rule-set', { ruleSetId: 'plateau-default', version: 1 });
  });
});
