/**
 * The HL7 v2 receivers' shared core and the MLLP listener.
 *
 * handleHl7Text: parse → authenticate/route/store in one transaction → ACK. A message that fails
 * to parse or to authenticate writes nothing and is answered AE/AR with an ERR segment naming the
 * segment and field. AA only after commit. The store's write transaction waits for the database's
 * write lock asynchronously (lib/db/sqlite.ts, lib/db/postgres.ts), so while another process (the
 * app, the summary worker) holds it, other connections are still served.
 *
 * startMllpServer: TCP listener; a connection from an address outside the allow list is closed
 * before any byte is read. Messages on one connection are handled in order (MLLP is
 * request/response), each answered on the same socket.
 */
import net from 'node:net';
import { randomUUID } from 'node:crypto';
import { buildAck, parseHl7, Hl7ParseError, type AckError, type Hl7Message } from '@/lib/ingest/hl7';
import { MllpDecoder, mllpFrame } from '@/lib/ingest/mllp';
import { Hl7Store, UnknownDeviceError, type Hl7Sender, type StoreResult } from '@/lib/db/hl7Store';
import type { Sql } from '@/lib/db/sql';

export interface HandleOptions {
  now?: () => Date;
  defaultZoneOffsetMinutes?: number;
  onStored?: (r: StoreResult, m: Hl7Message) => void;
}

export interface HandleResult {
  ack: string;
  code: 'AA' | 'AE' | 'AR';
  result?: StoreResult;
  error?: string;
}

/** Best-effort MSH fields of a message that failed to parse, so the NACK can name them. */
function roughHeader(text: string): { controlId: string; sendingApp: string; sendingFacility: string; version: string } {
  const first = text.split(/\r|\n/)[0] ?? '';
  const sep = first.startsWith('MSH') && first.length > 3 ? first[3] : '|';
  const f = first.split(sep);
  const c = (s: string | undefined) => (s ?? '').split('^')[0].slice(0, 199);
  return { controlId: c(f[9]), sendingApp: c(f[2]), sendingFacility: c(f[3]), version: c(f[11]) };
}

/**
 * Where a message's first NUL character sits, or null. HL7 text has no use for one (control
 * characters are escaped), and PostgreSQL cannot store one in a text column, so a message with a
 * NUL is refused on either database, naming the segment and field, instead of failing in storage
 * ("send again", forever). The segment ids are valid here: the message parsed.
 */
function nulError(text: string, fieldSep: string): AckError | null {
  if (!text.includes('\0')) return null;
  const seen = new Map<string, number>();
  for (const line of text.replace(/^\uFEFF/, '').split(/\r\n|\r|\n/)) {
    if (line.length === 0) continue;
    const id = line.slice(0, 3);
    const occurrence = (seen.get(id) ?? 0) + 1;
    seen.set(id, occurrence);
    const at = line.indexOf('\0');
    if (at < 0) continue;
    const k = line.slice(0, at).split(fieldSep).length - 1;
    // MSH-1 is the field separator itself, so MSH's fields count one further.
    const field = id === 'MSH' ? k + 1 : k === 0 ? null : k;
    const where = `${id}${occurrence > 1 || id === 'OBX' ? `[${occurrence}]` : ''}${field === null ? '' : `-${field}`}`;
    return { segment: id, occurrence, field, code: 102, text: `${where}: contains a NUL character` };
  }
  return null;
}

export async function handleHl7Text(store: Hl7Store, text: string, sender: Hl7Sender, opts: HandleOptions = {}): Promise<HandleResult> {
  const now = (opts.now ?? (() => new Date()))();
  const ackId = randomUUID().replace(/-/g, '').slice(0, 20);
  let m: Hl7Message;
  try {
    m = parseHl7(text, { defaultZoneOffsetMinutes: opts.defaultZoneOffsetMinutes });
  } catch (e) {
    const h = roughHeader(text);
    const input = { ...h, at: now, ackControlId: ackId };
    if (e instanceof Hl7ParseError) {
      const err: AckError = { segment: e.segment.startsWith('segment') ? 'MSH' : e.segment, occurrence: e.occurrence, field: e.field, code: e.code, text: e.message };
      if (e.segment.startsWith('segment')) err.segment = e.segment.replace(/^segment (\d+)$/, 'SEG$1').slice(0, 8);
      return { ack: buildAck(e.ack, input, err), code: e.ack, error: e.message };
    }
    return { ack: buildAck('AR', input, { segment: 'MSH', occurrence: 1, field: null, code: 207, text: 'message could not be read' }), code: 'AR', error: 'unreadable' };
  }
  const input = { controlId: m.header.controlId, sendingApp: m.header.sendingApp, sendingFacility: m.header.sendingFacility, version: m.header.version, at: now, ackControlId: ackId };
  const nul = nulError(text, m.header.delimiters.field);
  if (nul) {
    const code = nul.segment === 'MSH' ? 'AR' : 'AE';
    return { ack: buildAck(code, input, nul), code, error: nul.text };
  }
  let r: StoreResult;
  try {
    r = await store.store(m, text, sender, now);
  } catch (e) {
    if (e instanceof UnknownDeviceError) {
      const field = e.message.startsWith('MSH-8') ? 8 : 4;
      return { ack: buildAck('AR', input, { segment: 'MSH', occurrence: 1, field, code: 204, text: e.message }), code: 'AR', error: e.message };
    }
    console.error('hl7 store failed:', e instanceof Error ? e.message : e);
    return { ack: buildAck('AE', input, { segment: 'MSH', occurrence: 1, field: null, code: 207, text: 'storage failed; nothing was saved, send again' }), code: 'AE', error: 'storage failed' };
  }
  // Committed: whatever the follow-up does, the answer is AA.
  try {
    opts.onStored?.(r, m);
  } catch (e) {
    console.error('hl7 onStored failed:', e instanceof Error ? e.message : e);
  }
  const note = r.status === 'duplicate' ? `duplicate of ${r.duplicateOf}; stored once` : r.status === 'unmatched' ? `no case in progress for ${m.location ?? 'this device'}; ${r.stored} samples kept in the unmatched inbox` : `${r.stored} samples stored`;
  return { ack: buildAck('AA', input, undefined, note), code: 'AA', result: r };
}

export interface MllpServerOptions extends HandleOptions {
  port: number;
  host?: string;
  /** Allowed source addresses (IPv4-mapped IPv6 is normalised). */
  allow: readonly string[];
  maxBytes?: number;
  log?: (line: string) => void;
}

export interface MllpServer {
  server: net.Server;
  port: number;
  close(): Promise<void>;
}

export function normaliseAddress(a: string | undefined): string {
  if (!a) return '';
  return a.startsWith('::ffff:') ? a.slice(7) : a;
}

/** Starts the listener, storing through the Sql port `q`. */
export async function startMllpServer(q: Sql, opts: MllpServerOptions): Promise<MllpServer> {
  const store = new Hl7Store(q);
  const allow = new Set(opts.allow.map(normaliseAddress));
  const log = opts.log ?? (() => undefined);
  const sockets = new Set<net.Socket>();
  const server = net.createServer((sock) => {
    const addr = normaliseAddress(sock.remoteAddress);
    if (!allow.has(addr)) {
      log(`refused connection from ${addr} (not in PLATEAU_MLLP_ALLOW)`);
      sock.destroy();
      return;
    }
    sockets.add(sock);
    sock.setNoDelay(true);
    const decoder = new MllpDecoder({ maxBytes: opts.maxBytes });
    // Messages on one connection are answered in order: a chain of promises per socket.
    let chain: Promise<void> = Promise.resolve();
    sock.on('data', (chunk) => {
      for (const ev of decoder.push(chunk)) {
        chain = chain.then(async () => {
          if (ev.kind === 'oversize') {
            sock.write(mllpFrame(buildAck('AR', { controlId: '', at: new Date(), ackControlId: randomUUID().slice(0, 20) }, { segment: 'MSH', occurrence: 1, field: null, code: 207, text: `message larger than the limit (${ev.bytes} bytes)` })));
            return;
          }
          const r = await handleHl7Text(store, ev.text, { kind: 'mllp', address: addr }, opts);
          if (r.code !== 'AA') log(`${addr}: ${r.code} ${r.error}`);
          if (!sock.destroyed) sock.write(mllpFrame(r.ack));
        }).catch((e: unknown) => log(`${addr}: ${e instanceof Error ? e.message : String(e)}`));
      }
    });
    sock.on('error', () => undefined);
    sock.on('close', () => sockets.delete(sock));
  });
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port, opts.host ?? '127.0.0.1', () => resolve());
  });
  const a = server.address();
  const port = a && typeof a === 'object' ? a.port : opts.port;
  return {
    server,
    port,
    close: () =>
      new Promise<void>((resolve) => {
        for (const s of sockets) s.destroy();
        server.close(() => resolve());
      }),
  };
}
