/**
 * HL7 v2 feed storage, on either database through the Sql port (lib/db/sql.ts): one write
 * transaction per message (`Sql.tx`: SQLite BEGIN IMMEDIATE, PostgreSQL the Plateau write lock),
 * so the ACK that follows the commit means the samples are durable (SQLite: WAL with
 * synchronous=FULL; PostgreSQL: its commit).
 *
 * - Authentication of the sender (MLLP): an active Device whose keyHash is the SHA-256 of MSH-8
 *   (the HL7 "Security" field), or whose sendingFacility equals MSH-4.1. HTTP senders are
 *   authenticated by their API token instead; the device lookup then only helps routing.
 * - Routing: the device's room (Device.roomId) when the device is bound to one, else the active
 *   Room whose location equals PV1-3.1. The case: the newest case in that room with status
 *   `in_progress` (a draft case has not started sedation and gets nothing; its samples wait in
 *   the inbox until a nurse attaches them).
 * - Duplicates: a message with the same (sending facility, control id) as one already taken is
 *   logged with status `duplicate` and writes no samples; a sample at an instant that already has a
 *   monitor sample of that channel is skipped (INSERT … ON CONFLICT DO NOTHING on the Sample unique
 *   key; the same check by room/location for inbox rows).
 * - No open case: status `unmatched`, samples to Hl7InboxSample.
 *
 * The checks and the writes run inside one serialised write transaction, so two messages with
 * the same control id arriving at once (two listeners, or MLLP and HTTP) cannot both be taken.
 */
import { createHash, randomUUID } from 'node:crypto';
import { appendAuditSql } from './auditSql';
import { asDate, chunkRows, placeholders, type Sql, type SqlValue } from './sql';
import type { Hl7Message } from '@/lib/ingest/hl7';

export type Hl7Status = 'accepted' | 'unmatched' | 'duplicate';

export interface StoreResult {
  messageId: string;
  status: Hl7Status;
  caseId: string | null;
  roomId: string | null;
  deviceId: string | null;
  /** Samples written (new rows). */
  stored: number;
  /** Samples skipped because one already existed at that channel and instant. */
  skipped: number;
  duplicateOf: string | null;
}

export type Hl7Sender = { kind: 'mllp'; address: string } | { kind: 'http'; tokenId: string };

/** The sender is not a known device (MLLP). */
export class UnknownDeviceError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'UnknownDeviceError';
  }
}

export function sha256(s: string): string {
  return createHash('sha256').update(s).digest('hex');
}

interface DeviceRow {
  id: string;
  roomId: string | null;
}

/**
 * `"col" = ?` for a value, `"col" IS NULL` for null: the same match as `IS NOT DISTINCT FROM ?`,
 * but one both databases answer from an index (PostgreSQL does not use an index for
 * IS NOT DISTINCT FROM).
 */
function eqOrNull(column: string, v: string | null): { text: string; params: SqlValue[] } {
  return v === null ? { text: `${column} IS NULL`, params: [] } : { text: `${column} = ?`, params: [v] };
}

const SAMPLE_COLUMNS = ['caseId', 'channel', 'atMs', 'value', 'source', 'probeOff'] as const;
// Lists of ids bound into one `IN (…)`: well under both drivers' parameter limits.
const IN_CHUNK = 1000;

/** Authentication, routing and storage of HL7 messages over one Sql port; create once per process. */
export class Hl7Store {
  constructor(private readonly q: Sql) {}

  /** The device a message names (MSH-8 key, MSH-4 facility, OBX-18 equipment id), or null. */
  async findDevice(m: Hl7Message, q: Sql = this.q): Promise<DeviceRow | null> {
    if (m.header.security) {
      const d = await q.get<DeviceRow>('SELECT "id", "roomId" FROM "Device" WHERE "active" = TRUE AND "keyHash" = ? LIMIT 1', [sha256(m.header.security)]);
      if (d) return d;
    }
    if (m.header.sendingFacility) {
      const d = await q.get<DeviceRow>('SELECT "id", "roomId" FROM "Device" WHERE "active" = TRUE AND "sendingFacility" = ? ORDER BY ("roomId" IS NULL), "id" LIMIT 1', [m.header.sendingFacility]);
      if (d) return d;
    }
    return null;
  }

  /**
   * Stores one parsed message in one write transaction. Throws UnknownDeviceError for an MLLP
   * sender no Device row names (nothing written). Send the ACK only after this resolves: it
   * resolves after the commit.
   */
  async store(m: Hl7Message, rawText: string, sender: Hl7Sender, now: Date): Promise<StoreResult> {
    return this.q.tx(async (t): Promise<StoreResult> => {
      const device = await this.findDevice(m, t);
      if (sender.kind === 'mllp' && !device) throw new UnknownDeviceError(m.header.security ? 'MSH-8: device key is not known' : `MSH-4: sending facility ${m.header.sendingFacility ?? '(empty)'} is not a configured device`);
      const byEquipment = !device?.roomId && m.equipmentId ? await t.get<DeviceRow>('SELECT "id", "roomId" FROM "Device" WHERE "active" = TRUE AND "equipmentId" = ? LIMIT 1', [m.equipmentId]) : undefined;
      const dev = device?.roomId ? device : (byEquipment ?? device ?? null);
      const id = randomUUID();
      const base = { messageId: id, deviceId: dev?.id ?? null, skipped: 0 };
      const insertMessage = (status: Hl7Status, caseId: string | null, roomId: string | null, samples: number, error: string | null) =>
        t.run(
          'INSERT INTO "Hl7Message" ("id", "controlId", "sendingApp", "sendingFacility", "receivedAt", "status", "caseId", "roomId", "deviceId", "location", "samples", "error", "raw") VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)',
          [id, m.header.controlId, m.header.sendingApp, m.header.sendingFacility, now, status, caseId, roomId, dev?.id ?? null, m.location, samples, error, rawText],
        );

      const facility = eqOrNull('"sendingFacility"', m.header.sendingFacility);
      const dup = await t.get<{ id: string }>(`SELECT "id" FROM "Hl7Message" WHERE ${facility.text} AND "controlId" = ? AND "status" IN ('accepted', 'unmatched', 'attached') LIMIT 1`, [...facility.params, m.header.controlId]);
      if (dup) {
        await insertMessage('duplicate', null, null, 0, `duplicate of ${dup.id}`);
        return { ...base, status: 'duplicate', caseId: null, roomId: null, stored: 0, skipped: m.samples.length, duplicateOf: dup.id };
      }

      const roomId = dev?.roomId ?? (m.location ? ((await t.get<{ id: string }>('SELECT "id" FROM "Room" WHERE "active" = TRUE AND "location" = ? ORDER BY "sortOrder", "id" LIMIT 1', [m.location]))?.id ?? null) : null);
      const caseId = roomId ? ((await t.get<{ id: string }>(`SELECT "id" FROM "Case" WHERE "roomId" = ? AND "status" = 'in_progress' ORDER BY "startAt" DESC, "id" LIMIT 1`, [roomId]))?.id ?? null) : null;

      if (caseId) {
        const stored = await t.insertMany('Sample', SAMPLE_COLUMNS, m.samples.map((s) => [caseId, s.channel, s.atMs, s.value, 'monitor', false]), { ignoreConflicts: true });
        await insertMessage('accepted', caseId, roomId, stored, null);
        return { ...base, status: 'accepted', caseId, roomId, stored, skipped: m.samples.length - stored, duplicateOf: null };
      }

      // No case in progress: the message first (inbox rows point at it), then its samples.
      await insertMessage('unmatched', null, roomId, 0, null);
      const room = eqOrNull('"roomId"', roomId);
      const location = eqOrNull('"location"', m.location);
      let stored = 0;
      for (const s of m.samples) {
        const exists = await t.get(`SELECT 1 AS "one" FROM "Hl7InboxSample" WHERE ${room.text} AND ${location.text} AND "channel" = ? AND "atMs" = ? LIMIT 1`, [...room.params, ...location.params, s.channel, s.atMs]);
        if (exists) continue;
        await t.run('INSERT INTO "Hl7InboxSample" ("messageId", "roomId", "location", "channel", "atMs", "value") VALUES (?, ?, ?, ?, ?, ?)', [id, roomId, m.location, s.channel, s.atMs, s.value]);
        stored++;
      }
      if (stored > 0) await t.run('UPDATE "Hl7Message" SET "samples" = ? WHERE "id" = ?', [stored, id]);
      return { ...base, status: 'unmatched', caseId: null, roomId, stored, skipped: m.samples.length - stored, duplicateOf: null };
    });
  }
}

/** An API token's id when `token` is a live hl7-scope token (and marks it used), else null. */
export async function checkApiToken(q: Sql, token: string, now: Date): Promise<string | null> {
  const row = await q.get<{ id: string }>(`SELECT "id" FROM "ApiToken" WHERE "tokenHash" = ? AND "revokedAt" IS NULL AND "scope" = 'hl7'`, [sha256(token)]);
  if (!row) return null;
  await q.run('UPDATE "ApiToken" SET "lastUsedAt" = ? WHERE "id" = ?', [now, row.id]);
  return row.id;
}

export interface InboxMessage {
  id: string;
  controlId: string;
  sendingFacility: string | null;
  /** ISO instant. */
  receivedAt: string;
  roomId: string | null;
  location: string | null;
  samples: number;
  fromMs: number | null;
  toMs: number | null;
}

/** Unmatched messages with their sample time span, newest first. */
export async function listInbox(q: Sql, opts: { roomId?: string; limit?: number } = {}): Promise<InboxMessage[]> {
  const params: SqlValue[] = [];
  let where = `m."status" = 'unmatched'`;
  if (opts.roomId !== undefined) {
    where += ' AND m."roomId" = ?';
    params.push(opts.roomId);
  }
  params.push(opts.limit ?? 500);
  const rows = await q.all<Omit<InboxMessage, 'receivedAt'> & { receivedAt: unknown }>(
    `SELECT m."id", m."controlId", m."sendingFacility", m."receivedAt", m."roomId", m."location", COUNT(s."id") AS "samples", MIN(s."atMs") AS "fromMs", MAX(s."atMs") AS "toMs"
     FROM "Hl7Message" m LEFT JOIN "Hl7InboxSample" s ON s."messageId" = m."id"
     WHERE ${where}
     GROUP BY m."id" ORDER BY m."receivedAt" DESC, m."id" LIMIT ?`,
    params,
  );
  return rows.map((r) => ({
    ...r,
    receivedAt: asDate(r.receivedAt).toISOString(),
    samples: Number(r.samples),
    fromMs: r.fromMs === null ? null : Number(r.fromMs),
    toMs: r.toMs === null ? null : Number(r.toMs),
  }));
}

export class AttachError extends Error {
  constructor(
    public readonly status: number,
    message: string,
  ) {
    super(message);
    this.name = 'AttachError';
  }
}

export type AttachSelection = { messageIds: string[] } | { roomId: string; fromMs: number; toMs: number };

type InboxRow = { id: number; messageId: string; channel: string; atMs: number; value: number };

/**
 * Moves inbox samples into a case's monitor samples (by their own times; duplicates at an
 * instant skipped), marks fully moved messages `attached`, and writes one audit entry — all in
 * one write transaction.
 */
export async function attachInbox(q: Sql, sel: AttachSelection, caseId: string, actor: { id: string; role: string; origin: string | null }, now: Date): Promise<{ messages: number; stored: number; skipped: number }> {
  return q.tx(async (t) => {
    const c = await t.get<{ status: string }>('SELECT "status" FROM "Case" WHERE "id" = ?', [caseId]);
    if (!c) throw new AttachError(404, `caseId: case ${caseId} not found`);
    if (c.status === 'signed') throw new AttachError(409, 'caseId: the note is signed; amend the note instead of adding samples');
    let rows: InboxRow[];
    if ('messageIds' in sel) {
      const ids = [...new Set(sel.messageIds)];
      const found = new Map<string, string>();
      for (const chunk of chunkRows(ids, 1, IN_CHUNK)) {
        for (const f of await t.all<{ id: string; status: string }>(`SELECT "id", "status" FROM "Hl7Message" WHERE "id" IN (${placeholders(chunk.length)})`, chunk)) found.set(f.id, f.status);
      }
      for (const mid of sel.messageIds) {
        const status = found.get(mid);
        if (status === undefined) throw new AttachError(404, `messageIds: message ${mid} not found`);
        if (status !== 'unmatched') throw new AttachError(409, `messageIds: message ${mid} is ${status}, not unmatched`);
      }
      rows = [];
      for (const chunk of chunkRows(ids, 1, IN_CHUNK)) {
        rows.push(...(await t.all<InboxRow>(`SELECT "id", "messageId", "channel", "atMs", "value" FROM "Hl7InboxSample" WHERE "messageId" IN (${placeholders(chunk.length)})`, chunk)));
      }
      rows.sort((a, b) => a.atMs - b.atMs || a.id - b.id);
    } else {
      rows = await t.all<InboxRow>(
        `SELECT s."id", s."messageId", s."channel", s."atMs", s."value" FROM "Hl7InboxSample" s JOIN "Hl7Message" m ON m."id" = s."messageId"
         WHERE m."status" = 'unmatched' AND s."roomId" = ? AND s."atMs" >= ? AND s."atMs" <= ? ORDER BY s."atMs", s."id"`,
        [sel.roomId, sel.fromMs, sel.toMs],
      );
    }
    const stored = await t.insertMany('Sample', SAMPLE_COLUMNS, rows.map((r) => [caseId, r.channel, r.atMs, r.value, 'monitor', false]), { ignoreConflicts: true });
    for (const chunk of chunkRows(rows, 1, IN_CHUNK)) {
      await t.run(`DELETE FROM "Hl7InboxSample" WHERE "id" IN (${placeholders(chunk.length)})`, chunk.map((r) => r.id));
    }
    const mids = 'messageIds' in sel ? [...new Set(sel.messageIds)] : [...new Set(rows.map((r) => r.messageId))];
    // A message is attached once none of its samples is left in the inbox (a time range may take part of one).
    let messages = 0;
    for (const chunk of chunkRows(mids, 1, IN_CHUNK)) {
      messages += await t.run(
        `UPDATE "Hl7Message" SET "status" = 'attached', "caseId" = ? WHERE "id" IN (${placeholders(chunk.length)}) AND "status" = 'unmatched'
         AND NOT EXISTS (SELECT 1 FROM "Hl7InboxSample" s WHERE s."messageId" = "Hl7Message"."id")`,
        [caseId, ...chunk],
      );
    }
    await appendAuditSql(t, {
      at: now,
      actorId: actor.id,
      role: actor.role,
      action: 'hl7.attach',
      entity: 'Hl7Message',
      entityId: mids.length === 1 ? mids[0] : null,
      caseId,
      after: { messageIds: mids, samples: rows.length, stored, ...('roomId' in sel ? { roomId: sel.roomId, fromMs: sel.fromMs, toMs: sel.toMs } : {}) },
      origin: actor.origin,
    });
    return { messages, stored, skipped: rows.length - stored };
  });
}
