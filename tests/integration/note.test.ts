import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startApp, testSql, type AppServer } from '../helpers/appServer';
import { Client } from '../helpers/client';
import { inkPerPage, pdftotext } from '../helpers/pdf';
import { fhirR4Validator, SCHEMA_PACKAGE, schemaPackageVersion } from '../helpers/fhirSchema';
import { diffNotes } from '@/lib/note';

let app: AppServer;
let tmp: string;
beforeAll(async () => {
  app = await startApp({ cases: 20 });
  tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'plateau-note-'));
});
afterAll(async () => {
  await app?.stop();
});

async function as(role: string, which = 0) {
  const a = app.accounts.filter((x) => x.role === role)[which];
  const c = new Client(app.url);
  await c.signIn(a.username, a.password);
  return { c, a };
}

/** A case with an apnea imported from the monitor file, three doses and a jaw thrust. */
async function documentedCase(c: Client) {
  const r = await c.post('/api/v1/cases', {
    patient: { mrn: `N-${randomUUID().slice(0, 6)}`, familyName: 'Notetaker', givenName: 'Nia', birthDate: '1958-09-10', sex: 'female' },
    procedureType: 'colonoscopy',
    roomId: 'room-3',
    plannedDepth: 'deep',
    asaClass: 'III',
    weightKg: 64,
    heightCm: 162,
  });
  const id = r.json.id as string;
  const sheet = (await c.get(`/api/v1/cases/${id}/sheet`)).json;
  const start = Date.parse(sheet.case.startAt);
  const at = (s: number) => new Date(start + s * 1000).toISOString();
  const e = (body: Record<string, unknown>) => c.post(`/api/v1/cases/${id}/entries`, { id: randomUUID(), ...body });
  await e({ type: 'event', kind: 'sedation_start', at: at(100) });
  await e({ type: 'dose', drugId: 'drug-propofol', amount: 50, unit: 'mg', route: 'IV', at: at(130) });
  await e({ type: 'dose', drugId: 'drug-propofol', amount: 20, unit: 'mg', route: 'IV', at: at(600) });
  await e({ type: 'dose', drugId: 'drug-fentanyl', amount: 25, unit: 'mcg', route: 'IV', at: at(140) });
  await e({ type: 'intervention', kind: 'jaw_thrust', at: at(1512) });
  const text = fs.readFileSync(path.join(__dirname, '..', 'fixtures', 'csv', 'monitor-apnea.csv'), 'utf8');
  const preview = await c.post(`/api/v1/cases/${id}/imports/preview`, { text, fileName: 'monitor-apnea.csv' });
  expect(preview.status, preview.text).toBe(200);
  const imp = await c.post(`/api/v1/cases/${id}/imports`, { text, fileName: 'monitor-apnea.csv', mapping: preview.json.mapping });
  expect(imp.status, imp.text).toBe(201);
  await e({ type: 'event', kind: 'recovery_start', at: at(3500) });
  return id;
}

describe('the case note', () => {
  it('is signed with the password re-entered, freezes the case, and a wrong password signs nothing', async () => {
    const { c, a } = await as('nurse');
    const id = await documentedCase(c);
    const draft = (await c.get(`/api/v1/cases/${id}/note`)).json;
    expect(draft.versions).toHaveLength(0);
    expect(draft.draft.text).toMatch(/Apnea/);
    const wrong = await c.post(`/api/v1/cases/${id}/note/sign`, { password: 'not-mine-123', freeText: 'x' });
    expect(wrong.status).toBe(403);
    expect(wrong.json.error).toMatch(/password: not right/);
    const signed = await c.post(`/api/v1/cases/${id}/note/sign`, { password: a.password, freeText: 'Comfortable throughout.' });
    expect(signed.status, signed.text).toBe(201);
    expect(signed.json.version).toBe(1);
    const late = await c.post(`/api/v1/cases/${id}/entries`, { id: randomUUID(), at: new Date().toISOString(), type: 'intervention', kind: 'stimulation' });
    expect(late.status).toBe(409);
    const again = await c.post(`/api/v1/cases/${id}/note/sign`, { password: a.password });
    expect(again.status).toBe(409);
    const db = testSql(app);
    expect((await db.get<{ status: string }>('SELECT "status" FROM "Case" WHERE "id" = ?', [id]))!.status).toBe('signed');
    expect((await db.get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "AuditEntry" WHERE "action" = 'sign' AND "caseId" = ?`, [id]))!.n).toBe(1);
  });

  it('keeps a signed version unchanged when the unit later changes its rule set; an amendment makes version 2 with a reason and a diff', async () => {
    const { c: nurse, a } = await as('nurse');
    const id = await documentedCase(nurse);
    await nurse.post(`/api/v1/cases/${id}/note/sign`, { password: a.password, freeText: 'First text.' });
    const v1 = (await nurse.get(`/api/v1/cases/${id}/note`)).json.versions[0];
    await testSql(app).run(`UPDATE "Unit" SET "activeRuleSetId" = 'conway-2019', "activeRuleSetVersion" = 1`);
    try {
      const after = (await nurse.get(`/api/v1/cases/${id}/note`)).json;
      expect(after.versions[0].note.text).toBe(v1.note.text);
      expect(after.versions[0].analysis.ruleSet).toEqual({ id: 'plateau-default', version: 1 });
      const { c: lead, a: la } = await as('lead');
      const noReason = await lead.post(`/api/v1/cases/${id}/note/amend`, { password: la.password, reason: '', freeText: 'x' });
      expect(noReason.status).toBe(422);
      const amended = await lead.post(`/api/v1/cases/${id}/note/amend`, { password: la.password, reason: 'free text corrected after review', freeText: 'Corrected text.' });
      expect(amended.status, amended.text).toBe(201);
      expect(amended.json.version).toBe(2);
      const versions = (await lead.get(`/api/v1/cases/${id}/note`)).json.versions;
      expect(versions.map((v: { version: number; kind: string }) => [v.version, v.kind])).toEqual([[1, 'signed'], [2, 'amended']]);
      expect(versions[1].reason).toBe('free text corrected after review');
      expect(versions[0].note.text).toContain('First text.');
      expect(versions[1].note.text).toContain('Corrected text.');
      expect(versions[1].note.text).not.toContain('First text.');
      const diff = diffNotes(versions[0].note, versions[1].note);
      expect(diff.lines.filter((l) => l.op === 'added').map((l) => l.text).join('\n')).toContain('Corrected text.');
      expect(diff.lines.filter((l) => l.op === 'removed').map((l) => l.text).join('\n')).toContain('First text.');
    } finally {
      await testSql(app).run(`UPDATE "Unit" SET "activeRuleSetId" = 'plateau-default', "activeRuleSetVersion" = 1`);
    }
  });

  it('cannot be signed or amended by the safety officer or the administrator', async () => {
    const { c: nurse } = await as('nurse');
    const id = await documentedCase(nurse);
    for (const role of ['safety', 'admin']) {
      const { c, a } = await as(role);
      expect((await c.post(`/api/v1/cases/${id}/note/sign`, { password: a.password })).status).toBe(403);
      expect((await c.post(`/api/v1/cases/${id}/note/amend`, { password: a.password, reason: 'because I can' })).status).toBe(403);
    }
  });

  it('needs the lead’s co-signature at level supported or above, and not from the author', async () => {
    const { c: nurse, a } = await as('nurse');
    const id = await documentedCase(nurse);
    await nurse.post(`/api/v1/cases/${id}/entries`, { id: randomUUID(), type: 'intervention', kind: 'bag_mask', at: new Date(Date.parse((await nurse.get(`/api/v1/cases/${id}/sheet`)).json.case.startAt) + 1520_000).toISOString() });
    const signed = await nurse.post(`/api/v1/cases/${id}/note/sign`, { password: a.password });
    expect(signed.json.cosignRequired).toBe(true);
    expect((await nurse.post(`/api/v1/cases/${id}/note/cosign`, { password: a.password })).status).toBe(403);
    const { c: lead, a: la } = await as('lead');
    const co = await lead.post(`/api/v1/cases/${id}/note/cosign`, { password: la.password });
    expect(co.status, co.text).toBe(201);
    expect((await lead.post(`/api/v1/cases/${id}/note/cosign`, { password: la.password })).status).toBe(409);
  });

  it('prints as a PDF (A4 and Letter) whose pages have ink and whose text holds the case facts, totals and episode rows', async () => {
    const { c: nurse, a } = await as('nurse');
    const id = await documentedCase(nurse);
    await nurse.post(`/api/v1/cases/${id}/note/sign`, { password: a.password });
    for (const size of ['A4', 'LETTER']) {
      const r = await nurse.fetchRaw(`/api/v1/cases/${id}/note/pdf?version=1&size=${size}`);
      expect(r.status).toBe(200);
      expect(r.headers.get('content-type')).toBe('application/pdf');
      const file = path.join(tmp, `${id}-${size}.pdf`);
      fs.writeFileSync(file, Buffer.from(await r.arrayBuffer()));
      const ink = inkPerPage(file, tmp);
      expect(ink.length).toBeGreaterThanOrEqual(1);
      for (const p of ink) expect(p).toBeGreaterThan(0.003);
      const text = pdftotext(file);
      expect(text).toMatch(/NOTETAKER, Nia/);
      expect(text).toMatch(/70 mg/); // propofol total 50 + 20
      expect(text).toMatch(/25 mcg/);
      expect(text).toMatch(/Apnea/);
      expect(text).toMatch(/Page 1 of \d/);
    }
  });

  it('exports one FHIR R4 Bundle per version that validates against the published schema, for the lead only', async () => {
    const { c: nurse, a } = await as('nurse');
    const id = await documentedCase(nurse);
    await nurse.post(`/api/v1/cases/${id}/note/sign`, { password: a.password, freeText: 'v1' });
    expect((await nurse.get(`/api/v1/cases/${id}/fhir`)).status).toBe(403);
    const { c: lead, a: la } = await as('lead');
    await lead.post(`/api/v1/cases/${id}/note/amend`, { password: la.password, reason: 'added a comment', freeText: 'v2' });
    const validate = fhirR4Validator();
    for (const v of [1, 2]) {
      const r = await lead.get(`/api/v1/cases/${id}/fhir?version=${v}`);
      expect(r.status).toBe(200);
      const ok = validate(r.json);
      expect(ok, `${SCHEMA_PACKAGE}@${schemaPackageVersion}: ${JSON.stringify(validate.errors?.slice(0, 3))}`).toBe(true);
      const types = (r.json.entry as { resource: { resourceType: string } }[]).map((e) => e.resource.resourceType);
      expect(types).toContain('Patient');
      expect(types).toContain('MedicationAdministration');
      expect(types).toContain('DocumentReference');
    }
  });
});
