import { randomUUID } from 'node:crypto';
import type { PrismaClient } from './generated/client';
import { loadCaseRecord } from './caseRecord';
import { refreshSummary } from './summaries';
import { appendAudit } from './audit';
import { ConflictError, NotFoundError } from './cases';
import type { Actor } from './entries';
import { composeNote, coSignatureNeeded, type CaseNote, type NoteFacts, type NoteInput } from '@/lib/note';
import type { Analysis } from '@/lib/domain/episode';
import type { CaseRecord } from '@/lib/domain/caseRecord';
import type { DrugClass } from '@/lib/domain/drug';
import { PROCEDURE_LABEL, bmi } from '@/lib/domain/caseFacts';
import { stopBangFromFacts } from '@/lib/domain/stopBang';
import { ageInYears } from '@/lib/_shared/time';
import { writeTx } from './tx';
import { rebuildMonthsOfCase } from './statsMonths';
import { activeRuleSet } from './summaries';
import { getCatalogue } from '@/lib/indicators/catalogue';

/** A frozen note version as stored. */
export interface StoredNote {
  id: string;
  version: number;
  kind: 'signed' | 'amended';
  reason: string | null;
  note: CaseNote;
  analysis: Analysis;
  record: CaseRecord;
  author: string;
  authorRole: string;
  createdAt: string;
  cosignRequired: boolean;
  cosignedBy: string | null;
  cosignedAt: string | null;
}

/** Everything composeNote needs, from the database as it is now. */
export async function currentNoteInput(client: PrismaClient, caseId: string, now: Date, opts: { freeText?: string | null; version?: number } = {}): Promise<NoteInput & { caseStatus: string }> {
  const c = await client.case.findUnique({
    where: { id: caseId },
    include: {
      patient: true,
      unit: true,
      room: true,
      proceduralist: true,
      nurse: { select: { displayName: true } },
      recoveryScores: { where: { voidedAt: null }, orderBy: { at: 'asc' } },
      events: { where: { voidedAt: null, kind: 'discharge' }, orderBy: { at: 'asc' } },
    },
  });
  if (!c) throw new NotFoundError(`case ${caseId} not found`);
  const record = await loadCaseRecord(client, caseId);
  const analysis = await refreshSummary(client, caseId, now);
  if (!record || !analysis) throw new NotFoundError(`case ${caseId} not found`);
  const drugs = await client.drug.findMany({ where: { unitId: c.unitId } });
  const versions = await client.noteVersion.findMany({ where: { caseId }, orderBy: { version: 'asc' } });
  const names = await userNames(client, versions.flatMap((v) => [v.authorId, v.cosignedById].filter((x): x is string => !!x)));
  const startMs = c.startAt.getTime();
  const b = bmi(c.weightKg, c.heightCm);
  const age = ageInYears(c.patient.birthDate, c.startAt);
  const answered = c.sbSnoring !== null && c.sbTired !== null && c.sbObserved !== null && c.sbPressure !== null;
  const sb = answered
    ? stopBangFromFacts({ answers: { snoring: !!c.sbSnoring, tired: !!c.sbTired, observedApnea: !!c.sbObserved, pressure: !!c.sbPressure, neckOver40: c.sbNeck }, bmi: b, age, sex: c.patient.sex as 'female' | 'male', neckCm: c.neckCm })
    : null;
  const depth = (d: string | null) => (d === 'minimal' || d === 'moderate' || d === 'deep' || d === 'general' ? d : null);
  const asa = (['I', 'II', 'III', 'IV', 'V', 'VI'] as const).find((x) => x === c.asaClass) ?? null;
  const facts: NoteFacts = {
    unitName: c.unit.name,
    patient: { name: `${c.patient.familyName.toUpperCase()}, ${c.patient.givenName}`, mrn: c.patient.mrn, birthDate: c.patient.birthDate, ageYears: age, sex: (['female', 'male', 'other', 'unknown'] as const).find((s) => s === c.patient.sex) ?? null },
    procedureLabel: PROCEDURE_LABEL[c.procedureType] ?? c.procedureType,
    proceduralist: c.proceduralist?.name ?? null,
    nurse: c.nurse?.displayName ?? null,
    room: c.room?.name ?? null,
    plannedDepth: depth(c.plannedDepth),
    reachedDepth: depth(c.reachedDepth),
    asaClass: asa,
    asaEmergency: c.asaEmergency,
    weightKg: c.weightKg,
    heightCm: c.heightCm,
    bmi: b,
    stopBang: sb ? { score: sb.score, band: sb.band } : null,
    airwayClass: c.airwayClass,
    drugs: Object.fromEntries(drugs.map((d) => [d.name, { label: d.name.charAt(0).toUpperCase() + d.name.slice(1), drugClass: d.drugClass as DrugClass }])),
    recoveryScores: c.recoveryScores.map((r) => ({ t: (r.at.getTime() - startMs) / 1000, total: r.total, items: { activity: r.activity, respiration: r.respiration, circulation: r.circulation, consciousness: r.consciousness, oxygenation: r.oxygenation } })),
    dischargeT: c.events[0] ? (c.events[0].at.getTime() - startMs) / 1000 : null,
    freeText: opts.freeText !== undefined ? opts.freeText : c.nurseText,
    signatures: versions.flatMap((v) => [
      { by: names.get(v.authorId) ?? v.authorId, role: v.authorRole, at: v.createdAt.toISOString(), kind: v.kind as 'signed' | 'amended', ...(v.reason ? { reason: v.reason } : {}) },
      ...(v.cosignedById && v.cosignedAt ? [{ by: names.get(v.cosignedById) ?? v.cosignedById, role: 'lead', at: v.cosignedAt.toISOString(), kind: 'cosigned' as const }] : []),
    ]),
    version: opts.version ?? versions.length + 1,
  };
  return { record, analysis, facts, timeZone: c.unit.timeZone, caseStatus: c.status };
}

async function userNames(client: PrismaClient, ids: string[]): Promise<Map<string, string>> {
  if (!ids.length) return new Map();
  const users = await client.user.findMany({ where: { id: { in: [...new Set(ids)] } }, select: { id: true, displayName: true } });
  return new Map(users.map((u) => [u.id, u.displayName]));
}

/** The draft the nurse checks before signing: composed from the record as it is now. */
export async function draftNote(client: PrismaClient, caseId: string, now: Date, freeText?: string | null): Promise<{ note: CaseNote; input: NoteInput; status: string }> {
  const input = await currentNoteInput(client, caseId, now, { freeText });
  return { note: composeNote(input), input, status: input.caseStatus };
}

export async function listNoteVersions(client: PrismaClient, caseId: string): Promise<StoredNote[]> {
  const rows = await client.noteVersion.findMany({ where: { caseId }, orderBy: { version: 'asc' } });
  const names = await userNames(client, rows.flatMap((r) => [r.authorId, r.cosignedById].filter((x): x is string => !!x)));
  return rows.map((r) => ({
    id: r.id,
    version: r.version,
    kind: r.kind as 'signed' | 'amended',
    reason: r.reason,
    note: JSON.parse(r.structuredJson) as CaseNote,
    analysis: JSON.parse(r.analysisJson) as Analysis,
    record: JSON.parse(r.recordJson) as CaseRecord,
    author: names.get(r.authorId) ?? r.authorId,
    authorRole: r.authorRole,
    createdAt: r.createdAt.toISOString(),
    cosignRequired: r.cosignRequired,
    cosignedBy: r.cosignedById ? (names.get(r.cosignedById) ?? r.cosignedById) : null,
    cosignedAt: r.cosignedAt?.toISOString() ?? null,
  }));
}

/**
 * Signs the note: freezes the text, its structure, the analysis and the record it came from as
 * version 1, and the case's entries with it. A signed case is signed once; later changes are
 * amendments.
 */
export async function signNote(client: PrismaClient, caseId: string, freeText: string | null, actor: Actor, now: Date): Promise<StoredNote> {
  const existing = await client.noteVersion.count({ where: { caseId } });
  if (existing > 0) throw new ConflictError('case: the note is already signed; amend it with a reason instead');
  return writeVersion(client, caseId, { kind: 'signed', reason: null, freeText }, actor, now);
}

/** Amends a signed note: a new version with a reason, author and time; earlier versions stay. */
export async function amendNote(client: PrismaClient, caseId: string, reason: string, freeText: string | null, actor: Actor, now: Date): Promise<StoredNote> {
  const existing = await client.noteVersion.count({ where: { caseId } });
  if (existing === 0) throw new ConflictError('case: the note is not signed yet; sign it first');
  return writeVersion(client, caseId, { kind: 'amended', reason, freeText }, actor, now);
}

async function writeVersion(client: PrismaClient, caseId: string, v: { kind: 'signed' | 'amended'; reason: string | null; freeText: string | null }, actor: Actor, now: Date): Promise<StoredNote> {
  const input = await currentNoteInput(client, caseId, now, { freeText: v.freeText });
  // The signature being made is part of the note it signs.
  input.facts.signatures.push({ by: (await userNames(client, [actor.id])).get(actor.id) ?? actor.id, role: actor.role, at: now.toISOString(), kind: v.kind, ...(v.reason ? { reason: v.reason } : {}) });
  const note = composeNote(input);
  const id = randomUUID();
  await writeTx(client, async (tx) => {
    const count = await tx.noteVersion.count({ where: { caseId } });
    if ((v.kind === 'signed' && count > 0) || count + 1 !== input.facts.version) throw new ConflictError('case: someone else signed or amended this note a moment ago; reload');
    await tx.noteVersion.create({
      data: {
        id,
        caseId,
        version: input.facts.version,
        kind: v.kind,
        reason: v.reason,
        text: note.text,
        structuredJson: JSON.stringify(note),
        analysisJson: JSON.stringify(input.analysis),
        recordJson: JSON.stringify(input.record),
        ruleSetId: input.analysis.ruleSet.id,
        ruleSetVersion: input.analysis.ruleSet.version,
        nurseText: v.freeText,
        authorId: actor.id,
        authorRole: actor.role,
        createdAt: now,
        cosignRequired: coSignatureNeeded(input.analysis),
      },
    });
    await tx.case.update({ where: { id: caseId }, data: { status: 'signed', nurseText: v.freeText, version: { increment: 1 } } });
    await appendAudit(tx, { at: now, actorId: actor.id, role: actor.role, action: v.kind === 'signed' ? 'sign' : 'amend', entity: 'note', entityId: id, caseId, after: { version: input.facts.version, reason: v.reason, ruleSet: input.analysis.ruleSet }, origin: actor.origin });
  });
  // The case now counts in statistics: rebuild its month's rollups (lib/db/statsMonths). Should
  // this fail, the next statistics read finds the month's count behind and rebuilds it.
  if (v.kind === 'signed') {
    const c = await client.case.findUnique({ where: { id: caseId }, select: { unitId: true } });
    const sets = c ? [await activeRuleSet(client, c.unitId), getCatalogue().ruleSet] : [];
    await rebuildMonthsOfCase(client, caseId, sets, now).catch((e: unknown) => console.error('statistics rollup after signing failed:', e instanceof Error ? e.message : 'unknown'));
  }
  const all = await listNoteVersions(client, caseId);
  return all[all.length - 1];
}

/** The lead's co-signature on the latest version of a note that needs one. */
export async function cosignNote(client: PrismaClient, caseId: string, actor: Actor, now: Date) {
  return writeTx(client, async (tx) => {
    const latest = await tx.noteVersion.findFirst({ where: { caseId }, orderBy: { version: 'desc' } });
    if (!latest) throw new ConflictError('case: the note is not signed yet');
    if (!latest.cosignRequired) throw new ConflictError('case: this note does not need a co-signature');
    if (latest.cosignedAt) throw new ConflictError('case: already co-signed');
    if (latest.authorId === actor.id) throw new ConflictError('case: the co-signature must come from someone other than the author');
    await tx.noteVersion.update({ where: { id: latest.id }, data: { cosignedById: actor.id, cosignedAt: now } });
    await appendAudit(tx, { at: now, actorId: actor.id, role: actor.role, action: 'cosign', entity: 'note', entityId: latest.id, caseId, after: { version: latest.version }, origin: actor.origin });
    return { version: latest.version };
  });
}

/**
 * A note version ready for export: a signed version as frozen, or — when the case is not
 * signed yet and no version is asked for — the current draft.
 */
export async function noteForExport(client: PrismaClient, caseId: string, version: number | null, now: Date): Promise<NoteInput & { note: CaseNote; draft: boolean; caseStatus: string }> {
  const current = await currentNoteInput(client, caseId, now);
  const versions = await listNoteVersions(client, caseId);
  if (version === null && versions.length === 0) return { ...current, note: composeNote(current), draft: true };
  const v = version === null ? versions[versions.length - 1] : versions.find((x) => x.version === version);
  if (!v) throw new NotFoundError(`version: note version ${version} does not exist`);
  return { ...current, record: v.record, analysis: v.analysis, note: v.note, draft: false };
}
