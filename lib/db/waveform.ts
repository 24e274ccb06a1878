/**
 * Raw CO2 waveforms: CSV imports stored as WaveformChunk rows (10 s of Float32 little-endian mmHg
 * each), and the analysis of a case's stored waveform (breaths, shape findings, derived trends),
 * computed on the fly — the per-breath trends are derived data and are not stored as samples.
 *
 * Writes go through the Sql port in one write transaction with the WaveformImport row and a
 * hash-chained audit entry, like lib/db/sampleImport.ts.
 */
import { createHash, randomUUID } from 'node:crypto';
import type { PrismaClient } from './generated/client';
import { ConflictError, NotFoundError } from './cases';
import { appendAuditSql } from './auditSql';
import { SignedCaseError, type Actor } from './sampleImport';
import { sqlOf } from './client';
import { asDate, isUniqueViolation, type Sql, type SqlValue } from './sql';
import type { SampleSeries } from '@/lib/domain/caseRecord';
import { analyzeCapnogram, downsampleMinMax, parseWaveformCsv, type Breath, type CapnogramResult, type ShapeFinding, type WaveformGap, type WaveformSegment } from '@/lib/capnogram';

export const CHUNK_S = 10;

/** A stored segment: its samples are a Float32Array. */
export type StoredSegment = WaveformSegment & { v: Float32Array };

/** The same file (same SHA-256 of its text) was already imported into this case. */
export class DuplicateWaveformError extends ConflictError {
  constructor(public readonly importId: string, previousFileName: string) {
    super(`file: this waveform was already imported into this case (as "${previousFileName}"); nothing was added`);
    this.name = 'DuplicateWaveformError';
  }
}

export interface ImportWaveformInput {
  caseId: string;
  fileName: string;
  text: string;
  rateHz: number;
  unit: 'mmHg' | 'kPa';
  /** Seconds from the case start to time 0 of the file (its first sample for an index file). */
  clockOffsetS: number;
}

export interface ImportWaveformResult {
  importId: string;
  samples: number;
  chunks: number;
  /** Where the waveform sits on the case clock (s from the case start). */
  startS: number;
  endS: number;
  badValues: number;
  gapSamples: number;
  breaths: number;
  findings: number;
}

const LITTLE_ENDIAN = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

function encode(v: Float32Array): Buffer {
  if (LITTLE_ENDIAN) return Buffer.from(v.buffer, v.byteOffset, v.byteLength);
  const b = Buffer.alloc(v.length * 4);
  for (let i = 0; i < v.length; i++) b.writeFloatLE(v[i], i * 4);
  return b;
}

function decodeInto(out: Float32Array, at: number, bytes: Uint8Array, count: number): void {
  if (LITTLE_ENDIAN) {
    const copy = new Uint8Array(count * 4);
    copy.set(bytes.subarray(0, count * 4));
    out.set(new Float32Array(copy.buffer), at);
    return;
  }
  const dv = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  for (let i = 0; i < count; i++) out[at + i] = dv.getFloat32(i * 4, true);
}

/**
 * Imports a raw CO2 CSV into a case, all or nothing. Throws WaveformError (unreadable file, wrong
 * rate: 422), NotFoundError, SignedCaseError, DuplicateWaveformError, ConflictError (overlaps a
 * waveform already stored for the case).
 */
export async function importWaveformCsv(client: PrismaClient, input: ImportWaveformInput, actor: Actor, now: Date): Promise<ImportWaveformResult> {
  const pre = await client.case.findUnique({ where: { id: input.caseId }, select: { status: true } });
  if (!pre) throw new NotFoundError(`case ${input.caseId} not found`);
  if (pre.status === 'signed') throw new SignedCaseError();
  const parsed = parseWaveformCsv(input.text, { rateHz: input.rateHz, unit: input.unit });
  const fileHash = createHash('sha256').update(input.text, 'utf8').digest('hex');
  const rate = parsed.rateHz;
  const per = Math.round(CHUNK_S * rate);
  const offsetS = input.clockOffsetS + parsed.fileT0S;
  const q = sqlOf(client);
  const importId = randomUUID();
  const findDup = (on: Sql) => on.get<{ id: string; fileName: string }>('SELECT "id", "fileName" FROM "WaveformImport" WHERE "caseId" = ? AND "fileHash" = ?', [input.caseId, fileHash]);
  let r: ImportWaveformResult;
  try {
    r = await q.tx(async (t): Promise<ImportWaveformResult> => {
      const c = await t.get<{ status: string; startAt: unknown }>('SELECT "status", "startAt" FROM "Case" WHERE "id" = ?', [input.caseId]);
      if (!c) throw new NotFoundError(`case ${input.caseId} not found`);
      if (c.status === 'signed') throw new SignedCaseError();
      const dup = await findDup(t);
      if (dup) throw new DuplicateWaveformError(dup.id, dup.fileName);
      const caseStartMs = asDate(c.startAt).getTime();
      const t0Ms = caseStartMs + offsetS * 1000;
      const endMs = t0Ms + (parsed.v.length / rate) * 1000;
      const overlap = await t.get<{ n: number }>(
        `SELECT COUNT(*) AS "n" FROM "WaveformChunk" WHERE "caseId" = ? AND "channel" = 'co2' AND "startMs" < ? AND "startMs" + "count" * 1000.0 / "rateHz" > ?`,
        [input.caseId, endMs, t0Ms],
      );
      if (Number(overlap?.n ?? 0) > 0) throw new ConflictError('clockOffsetS: this waveform overlaps one already stored for the case; check the clock offset');
      await t.run('INSERT INTO "WaveformImport" ("id", "caseId", "fileHash", "fileName", "rateHz", "samples", "createdAt", "createdById") VALUES (?, ?, ?, ?, ?, ?, ?, ?)', [importId, input.caseId, fileHash, input.fileName, rate, parsed.rows, now, actor.id]);
      const chunks: SqlValue[][] = [];
      for (let k = 0; k < parsed.v.length; k += per) {
        const part = parsed.v.subarray(k, Math.min(parsed.v.length, k + per));
        let any = false;
        for (let i = 0; i < part.length && !any; i++) any = part[i] === part[i];
        if (!any) continue; // a chunk of nothing but gap is not stored
        chunks.push([randomUUID(), input.caseId, 'co2', t0Ms + (k / rate) * 1000, rate, part.length, encode(part), 'csv', importId, now, actor.id]);
      }
      await t.insertMany('WaveformChunk', ['id', 'caseId', 'channel', 'startMs', 'rateHz', 'count', 'data', 'source', 'importId', 'createdAt', 'createdById'], chunks);
      await appendAuditSql(t, {
        at: now,
        actorId: actor.id,
        role: actor.role,
        action: 'import',
        entity: 'waveform_import',
        entityId: importId,
        caseId: input.caseId,
        after: { fileName: input.fileName, fileHash, rateHz: rate, unit: input.unit, clockOffsetS: input.clockOffsetS, samples: parsed.rows, chunks: chunks.length, badValues: parsed.badValues, gapSamples: parsed.gapSamples },
        origin: actor.origin,
      });
      return { importId, samples: parsed.rows, chunks: chunks.length, startS: offsetS, endS: offsetS + parsed.v.length / rate, badValues: parsed.badValues, gapSamples: parsed.gapSamples, breaths: 0, findings: 0 };
    });
  } catch (e) {
    if (isUniqueViolation(e)) {
      const dup = await findDup(q);
      if (dup) throw new DuplicateWaveformError(dup.id, dup.fileName);
    }
    throw e;
  }
  const a = analyzeCapnogram([{ t0S: offsetS, rateHz: rate, v: parsed.v }]);
  return { ...r, breaths: a.breaths.length, findings: a.findings.length };
}

/** A case's stored CO2 waveform as contiguous segments on the case clock (s from Case.startAt). */
export async function loadWaveform(client: PrismaClient, caseId: string): Promise<{ caseStartMs: number; segments: StoredSegment[] } | null> {
  const c = await client.case.findUnique({ where: { id: caseId }, select: { startAt: true } });
  if (!c) return null;
  const caseStartMs = c.startAt.getTime();
  const rows = await client.waveformChunk.findMany({ where: { caseId, channel: 'co2' }, orderBy: { startMs: 'asc' }, select: { startMs: true, rateHz: true, count: true, data: true } });
  const segments: StoredSegment[] = [];
  let i = 0;
  while (i < rows.length) {
    // Chunks that follow each other exactly at one rate form one segment.
    let j = i + 1;
    let n = rows[i].count;
    while (j < rows.length && rows[j].rateHz === rows[i].rateHz && Math.abs(rows[j].startMs - (rows[j - 1].startMs + (rows[j - 1].count / rows[j - 1].rateHz) * 1000)) < 1) n += rows[j++].count;
    const v = new Float32Array(n);
    let at = 0;
    for (let k = i; k < j; k++) {
      decodeInto(v, at, rows[k].data, rows[k].count);
      at += rows[k].count;
    }
    segments.push({ t0S: (rows[i].startMs - caseStartMs) / 1000, rateHz: rows[i].rateHz, v });
    i = j;
  }
  return { caseStartMs, segments };
}

/**
 * The per-breath EtCO2, inspired CO2 and RR of a case's stored waveform as CaseRecord monitor
 * series (`source: 'monitor'`) for `analyzeCase`; empty when the case has no waveform.
 */
export async function waveformSeriesForCase(client: PrismaClient, caseId: string): Promise<SampleSeries[]> {
  const w = await loadWaveform(client, caseId);
  if (!w || !w.segments.length) return [];
  return analyzeCapnogram(w.segments).series;
}

export interface WaveformWindow {
  caseStart: string;
  /** Stored waveform extent on the case clock, per segment. */
  coverage: { startS: number; endS: number; rateHz: number }[];
  window: { fromS: number; toS: number };
  /** Samples of the window, min/max-decimated to at most maxPoints; null marks a gap. */
  points: { t: number[]; v: (number | null)[] };
  downsampled: boolean;
  /** Breaths in the window with their index in the case's breath list (findings refer to it). */
  breaths: (Breath & { i: number })[];
  /** All findings of the case (the viewer lists them and jumps to each). */
  findings: ShapeFinding[];
  gaps: WaveformGap[];
  referenceAmplitude: number | null;
  breathCount: number;
}

/**
 * A window of a case's waveform for the viewer: samples (downsampled when wide), the breaths in
 * it and the case's findings, analysed on the fly. Null when the case does not exist.
 */
export async function waveformWindow(client: PrismaClient, caseId: string, q: { fromS?: number; toS?: number; maxPoints?: number } = {}): Promise<WaveformWindow | null> {
  const w = await loadWaveform(client, caseId);
  if (!w) return null;
  const coverage = w.segments.map((s) => ({ startS: s.t0S, endS: s.t0S + s.v.length / s.rateHz, rateHz: s.rateHz }));
  const a: CapnogramResult | null = w.segments.length ? analyzeCapnogram(w.segments) : null;
  const first = coverage[0]?.startS ?? 0;
  const last = coverage[coverage.length - 1]?.endS ?? 0;
  const fromS = q.fromS ?? first;
  const toS = q.toS ?? Math.min(last, fromS + 120);
  const maxPoints = q.maxPoints ?? 4000;
  const t: number[] = [];
  const v: (number | null)[] = [];
  let downsampled = false;
  const total = w.segments.reduce((s, g) => s + Math.max(0, Math.min(g.t0S + g.v.length / g.rateHz, toS) - Math.max(g.t0S, fromS)) * g.rateHz, 0);
  for (const g of w.segments) {
    const i0 = Math.max(0, Math.floor((fromS - g.t0S) * g.rateHz));
    const i1 = Math.min(g.v.length, Math.ceil((toS - g.t0S) * g.rateHz));
    if (i1 <= i0) continue;
    const share = Math.max(2, Math.round((maxPoints * (i1 - i0)) / Math.max(1, total)));
    if (i1 - i0 > share) downsampled = true;
    const d = downsampleMinMax(g.v.subarray(i0, i1), g.t0S + i0 / g.rateHz, g.rateHz, share);
    if (t.length) {
      t.push(t[t.length - 1] + 1e-3);
      v.push(null); // break the line between segments
    }
    for (let k = 0; k < d.t.length; k++) {
      t.push(Math.round(d.t[k] * 1000) / 1000);
      v.push(d.v[k]);
    }
  }
  const breaths = a ? a.breaths.map((b, i) => ({ ...b, i })).filter((b) => b.expEndS >= fromS && b.expStartS <= toS) : [];
  return {
    caseStart: new Date(w.caseStartMs).toISOString(),
    coverage,
    window: { fromS, toS },
    points: { t, v },
    downsampled,
    breaths,
    findings: a?.findings ?? [],
    gaps: a?.gaps ?? [],
    referenceAmplitude: a?.referenceAmplitude ?? null,
    breathCount: a?.breaths.length ?? 0,
  };
}
