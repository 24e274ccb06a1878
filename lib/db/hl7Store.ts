/**
 * HL7 v2 feed storage: one IMMEDIATE better-sqlite3 transaction per message (so the ACK that
 * follows the commit means the samples are on disk: WAL with synchronous=FULL).
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
 *   monitor sample of that channel is skipped (INSERT OR IGNORE on the Sample unique key; the same
 *   check by room/location for inbox rows).
 * - No open case: status `unmatched`, samples to Hl7InboxSample.
 */
import { createHash, randomUUID } from 'node:crypto';
import type Database from 'better-sqlite3';
import { appendAuditRaw } from './auditRaw';
import { isoDb } from './sqlite';
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

/** Prepared statements over one raw handle; create once per process. */
export class Hl7Store {
  private readonly q;

  constructor(private readonly raw: Database.Database) {
    this.q = {
      deviceByKey: raw.prepare('SELECT id, roomId FROM Device WHERE active = 1 AND keyHash = ? LIMIT 1'),
      deviceByFacility: raw.prepare('SELECT id, roomId FROM Device WHERE active = 1 AND sendingFacility = ? ORDER BY (roomId IS NULL), id LIMIT 1'),
      deviceByEquipment: raw.prepare('SELECT id, roomId FROM Device WHERE active = 1 AND equipmentId = ? LIMIT 1'),
      dup: raw.prepare("SELECT id FROM Hl7Message WHERE sendingFacility IS ? AND controlId = ? AND status IN ('accepted', 'unmatched', 'attached') LIMIT 1"),
      roomByLocation: raw.prepare('SELECT id FROM Room WHERE active = 1 AND location = ? ORDER BY sortOrder, id LIMIT 1'),
      caseInRoom: raw.prepare("SELECT id FROM \"Case\" WHERE roomId = ? AND status = 'in_progress' ORDER BY startAt DESC, id LIMIT 1"),
      insertMessage: raw.prepare('INSERT INTO Hl7Message (id, controlId, sendingApp, sendingFacility, receivedAt, status, caseId, roomId, deviceId, location, samples, error, raw) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)'),
      insertSample: raw.prepare("INSERT OR IGNORE INTO Sample (caseId, channel, atMs, value, source, probeOff) VALUES (?, ?, ?, ?, 'monitor', 0)"),
      inboxExists: raw.prepare('SELECT 1 FROM Hl7InboxSample WHERE roomId IS ? AND location IS ? AND channel = ? AND atMs = ? LIMIT 1'),
      insertInbox: raw.prepare('INSERT INTO Hl7InboxSample (messageId, roomId, location, channel, atMs, value) VALUES (?, ?, ?, ?, ?, ?)'),
    };
  }

  /** The device a message names (MSH-8 key, MSH-4 facility, OBX-18 equipment id), or null. */
  findDevice(m: Hl7Message): DeviceRow | null {
    if (m.header.security) {
      const d = this.q.deviceByKey.get(sha256(m.header.security)) as DeviceRow | undefined;
      if (d) return d;
    }
    if (m.header.sendingFacility) {
      const d = this.q.deviceByFacility.get(m.header.sendingFacility) as DeviceRow | undefined;
      if (d) return d;
    }
    return null;
  }

  /**
   * Stores one parsed message. Throws UnknownDeviceError for an MLLP sender no Device row names
   * (nothing written). Call the ACK only after this returns.
   */
  store(m: Hl7Message, rawText: string, sender: Hl7Sender, now: Date): StoreResult {
    const run = this.raw.transaction((): StoreResult => {
      const device = this.findDevice(m);
      if (sender.kind === 'mllp' && !device) throw new UnknownDeviceError(m.header.security ? 'MSH-8: device key is not known' : `MSH-4: sending facility ${m.header.sendingFacility ?? '(empty)'} is not a configured device`);
      const byEquipment = !device?.roomId && m.equipmentId ? (this.q.deviceByEquipment.get(m.equipmentId) as DeviceRow | undefined) : undefined;
      const dev = device?.roomId ? device : byEquipment ?? device ?? null;
      const id = randomUUID();
      const base = { messageId: id, deviceId: dev?.id ?? null, skipped: 0 };
      const dup = this.q.dup.get(m.header.sendingFacility, m.header.controlId) as { id: string } | undefined;
      if (dup) {
        this.q.insertMessage.run(id, m.header.controlId, m.header.sendingApp, m.header.sendingFacility, isoDb(now), 'duplicate', null, null, dev?.id ?? null, m.location, 0, `duplicate of ${dup.id}`, rawText);
        return { ...base, status: 'duplicate', caseId: null, roomId: null, stored: 0, skipped: m.samples.length, duplicateOf: dup.id };
      }
      const roomId = dev?.roomId ?? (m.location ? ((this.q.roomByLocation.get(m.location) as { id: string } | undefined)?.id ?? null) : null);
      const caseId = roomId ? ((this.q.caseInRoom.get(roomId) as { id: string } | undefined)?.id ?? null) : null;
      let stored = 0;
      if (caseId) {
        for (const s of m.samples) stored += this.q.insertSample.run(caseId, s.channel, s.atMs, s.value).changes;
      } else {
        // insert the message first: inbox rows point at it
      }
      const status: Hl7Status = caseId ? 'accepted' : 'unmatched';
      this.q.insertMessage.run(id, m.header.controlId, m.header.sendingApp, m.header.sendingFacility, isoDb(now), status, caseId, roomId, dev?.id ?? null, m.location, 0, null, rawText);
      if (!caseId) {
        for (const s of m.samples) {
          if (this.q.inboxExists.get(roomId, m.location, s.channel, s.atMs)) continue;
          this.q.insertInbox.run(id, roomId, m.location, s.channel, s.atMs, s.value);
          stored++;
        }
      }
      this.raw.prepare('UPDATE Hl7Message SET samples = ? WHERE id = ?').run(stored, id);
      return { ...base, status, caseId, roomId, stored, skipped: m.samples.length - stored, duplicateOf: null };
    });
    return run.immediate();
  }
}

/** An API token's id when `token` is a live hl7-scope token (and marks it used), else null. */
export function checkApiToken(raw: Database.Database, token: string, now: Date): string | null {
  const row = raw.prepare("SELECT id FROM ApiToken WHERE tokenHash = ? AND revokedAt IS NULL AND scope = 'hl7'").get(sha256(token)) as { id: string } | undefined;
  if (!row) return null;
  raw.prepare('UPDATE ApiToken SET lastUsedAt = ? WHERE id = ?').run(isoDb(now), row.id);
  return row.id;
}

export interface InboxMessage {
  id: string;
  controlId: string;
  sendingFacility: string | null;
  receivedAt: string;
  roomId: string | null;
  location: string | null;
  samples: number;
  fromMs: number | null;
  toMs: number | null;
}

/** Unmatched messages with their sample time span, newest first. */
export function listInbox(raw: Database.Database, opts: { roomId?: string; limit?: number } = {}): InboxMessage[] {
  return raw
    .prepare(
      `SELECT m.id, m.controlId, m.sendingFacility, m.receivedAt, m.roomId, m.location, COUNT(s.id) AS samples, MIN(s.atMs) AS fromMs, MAX(s.atMs) AS toMs
       FROM Hl7Message m LEFT JOIN Hl7InboxSample s ON s.messageId = m.id
       WHERE m.status = 'unmatched' AND (? IS NULL OR m.roomId = ?)
       GROUP BY m.id ORDER BY m.receivedAt DESC LIMIT ?`,
    )
    .all(opts.roomId ?? null, opts.roomId ?? null, opts.limit ?? 500) as InboxMessage[];
}

export class AttachError extends Error {
  constructor(public readonly status: number, message: string) {
    super(message);
    this.name = 'AttachError';
  }
}

export type AttachSelection = { messageIds: string[] } | { roomId: string; fromMs: number; toMs: number };

/**
 * Moves inbox samples into a case's monitor samples (by their own times; duplicates at an
 * instant skipped), marks fully moved messages `attached`, and writes one audit entry.
 */
export function attachInbox(raw: Database.Database, sel: AttachSelection, caseId: string, actor: { id: string; role: string; origin: string | null }, now: Date): { messages: number; stored: number; skipped: number } {
  const run = raw.transaction(() => {
    const c = raw.prepare('SELECT status FROM "Case" WHERE id = ?').get(caseId) as { status: string } | undefined;
    if (!c) throw new AttachError(404, `caseId: case ${caseId} not found`);
    if (c.status === 'signed') throw new AttachError(409, 'caseId: the note is signed; amend the note instead of adding samples');
    let rows: { id: number; messageId: string; channel: string; atMs: number; value: number }[];
    if ('messageIds' in sel) {
      const ph = sel.messageIds.map(() => '?').join(',');
      const found = raw.prepare(`SELECT id, status FROM Hl7Message WHERE id IN (${ph})`).all(...sel.messageIds) as { id: string; status: string }[];
      for (const mid of sel.messageIds) {
        const f = found.find((x) => x.id === mid);
        if (!f) throw new AttachError(404, `messageIds: message ${mid} not found`);
        if (f.status !== 'unmatched') throw new AttachError(409, `messageIds: message ${mid} is ${f.status}, not unmatched`);
      }
      rows = raw.prepare(`SELECT id, messageId, channel, atMs, value FROM Hl7InboxSample WHERE messageId IN (${ph}) ORDER BY atMs`).all(...sel.messageIds) as typeof rows;
    } else {
      rows = raw
        .prepare("SELECT s.id, s.messageId, s.channel, s.atMs, s.value FROM Hl7InboxSample s JOIN Hl7Message m ON m.id = s.messageId WHERE m.status = 'unmatched' AND s.roomId = ? AND s.atMs >= ? AND s.atMs <= ? ORDER BY s.atMs")
        .all(sel.roomId, sel.fromMs, sel.toMs) as typeof rows;
    }
    const ins = raw.prepare("INSERT OR IGNORE INTO Sample (caseId, channel, atMs, value, source, probeOff) VALUES (?, ?, ?, ?, 'monitor', 0)");
    const del = raw.prepare('DELETE FROM Hl7InboxSample WHERE id = ?');
    let stored = 0;
    for (const r of rows) {
      stored += ins.run(caseId, r.channel, r.atMs, r.value).changes;
      del.run(r.id);
    }
    const mids = 'messageIds' in sel ? sel.messageIds : [...new Set(rows.map((r) => r.messageId))];
    const left = raw.prepare('SELECT COUNT(*) AS n FROM Hl7InboxSample WHERE messageId = ?');
    const mark = raw.prepare("UPDATE Hl7Message SET status = 'attached', caseId = ? WHERE id = ? AND status = 'unmatched'");
    let messages = 0;
    for (const mid of mids) {
      if ((left.get(mid) as { n: number }).n === 0) messages += mark.run(caseId, mid).changes;
    }
    appendAuditRaw(raw, {
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
  return run.immediate();
}
