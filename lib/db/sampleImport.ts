/**
 * Monitor CSV imports: samples of a case written in one transaction with their SampleImport row
 * and an audit entry.
 *
 * Bulk writes go through the Sql port (lib/db/sql.ts) in one write transaction (the write lock
 * is taken first, so the signed/duplicate checks and the inserts see the same database). Measured
 * on the build machine with 3,600 × 4 samples on SQLite: Prisma `createMany` in an interactive
 * transaction ≈ 4.3 s; Prisma `$executeRawUnsafe` with 500-row multi-value INSERTs ≈ 240 ms;
 * a better-sqlite3 prepared statement in one transaction ≈ 80 ms — which is what the port does
 * on SQLite (on PostgreSQL it sends multi-row INSERTs).
 *
 * Samples at an instant that already has a monitor sample of the same channel (the Sample table's
 * unique (caseId, channel, source, atMs)) are skipped: the stored sample is kept, and the number
 * skipped is reported per channel. A second import of the same file into a case (same SHA-256 of
 * the bytes) is refused with DuplicateImportError.
 */
import { createHash, randomUUID } from 'node:crypto';
import type { PrismaClient } from './generated/client';
import { ConflictError, NotFoundError } from './cases';
import { appendAuditSql } from './auditSql';
import { sqlOf } from './client';
import { asDate, isUniqueViolation, type Sql } from './sql';
import { CHANNELS, type Channel } from '@/lib/domain/channel';
import type { SampleSeries } from '@/lib/domain/caseRecord';
import {
  inspectCsv,
  mappingFromSuggestion,
  parseMonitorCsv,
  previewSeries,
  problemSummary,
  withMappingDefaults,
  type CsvInspection,
  type CsvProblem,
  type MonitorCsvMapping,
  type ParsedChannel,
  type SeriesPreview,
} from '@/lib/ingest/monitorCsv';

/** The same file (same SHA-256) was already imported into this case. */
export class DuplicateImportError extends ConflictError {
  constructor(
    public readonly importId: string,
    public readonly importedAt: string,
    public readonly previousFileName: string,
  ) {
    super(`file: this file was already imported into this case (as "${previousFileName}" at ${importedAt}); nothing was added`);
    this.name = 'DuplicateImportError';
  }
}

/** The case's note is signed: samples cannot be added. */
export class SignedCaseError extends ConflictError {
  constructor() {
    super('case: the note is signed; amend the note instead of importing samples');
    this.name = 'SignedCaseError';
  }
}

/** The file cannot be read with the mapping; problems by row and column. Nothing was written. */
export class CsvRejectedError extends Error {
  constructor(
    public readonly errors: CsvProblem[],
    public readonly errorCount: number,
  ) {
    super(problemSummary(errors, errorCount));
    this.name = 'CsvRejectedError';
  }
}

export interface Actor {
  id: string;
  role: string;
  origin: string | null;
}

export interface ImportSamplesInput {
  caseId: string;
  fileName: string;
  /** SHA-256 (hex) of the raw bytes of the file. */
  fileHash: string;
  /** Monitor series, times in seconds from the case start. */
  series: SampleSeries[];
  /** Data rows of the file. */
  rows: number;
  /** The case start the series were computed from; when given and the case start has changed since, the import is refused. */
  caseStartIso?: string;
}

export interface ChannelCount {
  inserted: number;
  /** Samples skipped because the case already had a monitor sample of the channel at that instant. */
  skipped: number;
}

export interface ImportSamplesResult {
  importId: string;
  rows: number;
  /** Samples written. */
  samples: number;
  /** Samples skipped at instants that already had a sample (kept as stored). */
  skipped: number;
  byChannel: Partial<Record<Channel, ChannelCount>>;
}

/** SHA-256 hex of bytes. */
export function sha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

/**
 * Imports monitor samples into a case, all or nothing: one SampleImport row, the samples
 * (source `monitor`, atMs = case start + t·1000, rounded to the millisecond) and one audit entry,
 * in one transaction.
 *
 * `client` is read first so a missing or signed case fails without taking the write lock; the
 * checks are repeated inside the transaction.
 *
 * Throws NotFoundError (no such case), SignedCaseError, DuplicateImportError (same file hash for
 * the case), ConflictError (the case start changed since the file was read).
 */
export async function importSamples(client: PrismaClient, input: ImportSamplesInput, actor: Actor, now: Date): Promise<ImportSamplesResult> {
  const pre = await client.case.findUnique({ where: { id: input.caseId }, select: { status: true } });
  if (!pre) throw new NotFoundError(`case ${input.caseId} not found`);
  if (pre.status === 'signed') throw new SignedCaseError();
  checkSeries(input.series);
  if (!/^[0-9a-f]{64}$/.test(input.fileHash)) throw new RangeError('fileHash: must be a SHA-256 hex digest');

  const q = sqlOf(client);
  const importId = randomUUID();
  const findDup = (on: Sql) => on.get<{ id: string; fileName: string; createdAt: unknown }>('SELECT "id", "fileName", "createdAt" FROM "SampleImport" WHERE "caseId" = ? AND "fileHash" = ?', [input.caseId, input.fileHash]);
  try {
    return await q.tx(async (t): Promise<ImportSamplesResult> => {
      const c = await t.get<{ status: string; startAt: unknown }>('SELECT "status", "startAt" FROM "Case" WHERE "id" = ?', [input.caseId]);
      if (!c) throw new NotFoundError(`case ${input.caseId} not found`);
      if (c.status === 'signed') throw new SignedCaseError();
      const startMs = asDate(c.startAt).getTime();
      if (input.caseStartIso !== undefined && Date.parse(input.caseStartIso) !== startMs) {
        throw new ConflictError('case: the case start changed while the file was being imported; preview the file again');
      }
      const dup = await findDup(t);
      if (dup) throw new DuplicateImportError(dup.id, asDate(dup.createdAt).toISOString(), dup.fileName);

      // The import row first (samples reference its id); its counts are set once the samples are in.
      await t.run('INSERT INTO "SampleImport" ("id", "caseId", "fileHash", "fileName", "rows", "samples", "createdAt", "createdById") VALUES (?, ?, ?, ?, ?, 0, ?, ?)', [importId, input.caseId, input.fileHash, input.fileName, input.rows, now, actor.id]);
      const byChannel: Partial<Record<Channel, ChannelCount>> = {};
      let inserted = 0;
      let skipped = 0;
      for (const s of input.series) {
        const rows = s.t.map((tS, i) => [input.caseId, s.channel, startMs + Math.round(tS * 1000), s.v[i], 'monitor', false, importId]);
        const n = await t.insertMany('Sample', ['caseId', 'channel', 'atMs', 'value', 'source', 'probeOff', 'importId'], rows, { ignoreConflicts: true });
        const count = (byChannel[s.channel] ??= { inserted: 0, skipped: 0 });
        count.inserted += n;
        count.skipped += rows.length - n;
        inserted += n;
        skipped += rows.length - n;
      }
      await t.run('UPDATE "SampleImport" SET "samples" = ? WHERE "id" = ?', [inserted, importId]);
      await appendAuditSql(t, {
        at: now,
        actorId: actor.id,
        role: actor.role,
        action: 'import',
        entity: 'sample_import',
        entityId: importId,
        caseId: input.caseId,
        after: { fileName: input.fileName, fileHash: input.fileHash, rows: input.rows, samples: inserted, skipped, byChannel },
        origin: actor.origin,
      });
      return { importId, rows: input.rows, samples: inserted, skipped, byChannel };
    });
  } catch (e) {
    // Two requests with the same file at once: the unique (caseId, fileHash) index decides.
    if (isUniqueViolation(e)) {
      const dup = await findDup(q);
      if (dup) throw new DuplicateImportError(dup.id, asDate(dup.createdAt).toISOString(), dup.fileName);
    }
    throw e;
  }
}

function checkSeries(series: SampleSeries[]): void {
  const seen = new Set<string>();
  series.forEach((s, k) => {
    if (!(CHANNELS as readonly string[]).includes(s.channel)) throw new RangeError(`series[${k}].channel: ${String(s.channel)} is not a channel`);
    if (s.source !== 'monitor') throw new RangeError(`series[${k}].source: imports write monitor samples`);
    if (s.unit === 'kPa') throw new RangeError(`series[${k}].unit: convert kPa to mmHg before storing`);
    if (seen.has(s.channel)) throw new RangeError(`series[${k}].channel: ${s.channel} appears twice`);
    seen.add(s.channel);
    if (s.t.length !== s.v.length) throw new RangeError(`series[${k}]: t and v differ in length`);
    for (let i = 0; i < s.t.length; i++) {
      if (!Number.isFinite(s.t[i]) || !Number.isFinite(s.v[i])) throw new RangeError(`series[${k}][${i}]: not a finite number`);
      if (i > 0 && !(s.t[i] > s.t[i - 1])) throw new RangeError(`series[${k}].t[${i}]: times must increase`);
    }
  });
}

// ─── the routes' calls: a case's CSV preview and import ────────────────────────────────────

async function caseForImport(client: PrismaClient, caseId: string) {
  const c = await client.case.findUnique({ where: { id: caseId }, select: { id: true, status: true, startAt: true, scheduledDate: true, unit: { select: { timeZone: true } } } });
  if (!c) throw new NotFoundError(`case ${caseId} not found`);
  return c;
}

export interface CsvPreview {
  ok: boolean;
  caseStart: string;
  inspection: CsvInspection | null;
  /** The mapping the file was read with (the one sent, or the suggestion), defaults filled in. */
  mapping: MonitorCsvMapping | null;
  /** When ok: what would be imported. */
  rows?: number;
  samples?: number;
  firstAt?: number | null;
  lastAt?: number | null;
  channels?: ParsedChannel[];
  series?: SeriesPreview[];
  warnings: string[];
  /** When not ok: problems by row and column. */
  errors?: CsvProblem[];
  errorCount?: number;
}

/**
 * Reads a file for a case without writing anything: the inspection, and the series the mapping
 * (or, without one, the suggested mapping) gives, thinned for a chart — or the problems.
 * Wall-clock times without a zone are read in the unit's zone; clock-only times without a date on
 * the case's scheduled date.
 */
export async function previewMonitorCsv(client: PrismaClient, input: { caseId: string; text: string; mapping?: MonitorCsvMapping }): Promise<CsvPreview> {
  const c = await caseForImport(client, input.caseId);
  const caseStart = c.startAt.toISOString();
  const defaults = { timeZone: c.unit.timeZone, date: c.scheduledDate };
  const inspected = inspectCsv(input.text);
  if (!inspected.ok) return { ok: false, caseStart, inspection: null, mapping: input.mapping ?? null, warnings: [], errors: inspected.errors, errorCount: inspected.errorCount };
  const mapping = input.mapping ? withMappingDefaults(input.mapping, defaults) : mappingFromSuggestion(inspected.suggestion, defaults);
  if (!mapping) {
    const message = inspected.suggestion.timeColumn ? 'no column looks like a monitor channel; map the channels' : 'no time column found; choose the time column and its format';
    return { ok: false, caseStart, inspection: inspected, mapping: null, warnings: inspected.warnings, errors: [{ row: 1, column: null, message }], errorCount: 1 };
  }
  const parsed = parseMonitorCsv(input.text, mapping, caseStart);
  if (!parsed.ok) return { ok: false, caseStart, inspection: inspected, mapping, warnings: inspected.warnings, errors: parsed.errors, errorCount: parsed.errorCount };
  return {
    ok: true,
    caseStart,
    inspection: inspected,
    mapping,
    rows: parsed.rows,
    samples: parsed.samples,
    firstAt: parsed.firstAt,
    lastAt: parsed.lastAt,
    channels: parsed.channels,
    series: previewSeries(parsed),
    warnings: [...new Set([...inspected.warnings, ...parsed.warnings])],
  };
}

export interface CsvImportResult extends ImportSamplesResult {
  fileName: string;
  fileHash: string;
  firstAt: number | null;
  lastAt: number | null;
  mapping: MonitorCsvMapping;
  warnings: string[];
}

/**
 * Reads a file with a confirmed mapping and imports it into a case atomically.
 * Throws CsvRejectedError (problems by row/column), and the errors of importSamples.
 */
export async function importMonitorCsv(
  client: PrismaClient,
  input: { caseId: string; fileName: string; bytes: Uint8Array; text: string; mapping: MonitorCsvMapping },
  actor: Actor,
  now: Date,
): Promise<CsvImportResult> {
  const c = await caseForImport(client, input.caseId);
  if (c.status === 'signed') throw new SignedCaseError();
  const caseStart = c.startAt.toISOString();
  const mapping = withMappingDefaults(input.mapping, { timeZone: c.unit.timeZone, date: c.scheduledDate });
  const parsed = parseMonitorCsv(input.text, mapping, caseStart);
  if (!parsed.ok) throw new CsvRejectedError(parsed.errors, parsed.errorCount);
  if (parsed.samples === 0) throw new CsvRejectedError([{ row: 2, column: null, message: 'the mapped columns hold no values' }], 1);
  const fileHash = sha256Hex(input.bytes);
  const r = await importSamples(client, { caseId: input.caseId, fileName: input.fileName, fileHash, series: parsed.series, rows: parsed.rows, caseStartIso: caseStart }, actor, now);
  return { ...r, fileName: input.fileName, fileHash, firstAt: parsed.firstAt, lastAt: parsed.lastAt, mapping, warnings: parsed.warnings };
}
