/**
 * The HL7 v2 receivers' shared core and the MLLP listener.
 *
 * handleHl7Text: parse → authenticate/route/store in one transaction → ACK. A message that fails
 * to parse or to authenticate writes nothing and is answered AE/AR with an ERR segment naming the
 * segment and field. AA only after commit.
 *
 * startMllpServer: TCP listener; a connection from an address outside the allow list is closed
 * before any byte is read. Messages on one connection are handled in order (MLLP is
 * request/response), each answered on the same socket.
 */
import net from 'node:net';
import { randomUUID } from 'node:crypto';
import type Database from 'better-sqlite3';
import { buildAck, parseHl7, Hl7ParseError, type AckError, type Hl7Message } from '@/lib/ingest/hl7';
import { MllpDecoder, mllpFrame } from '@/lib/ingest/mllp';
import { Hl7Store, UnknownDeviceError, type Hl7Sender, type StoreResult } from '@/lib/db/hl7Store';

export interface HandleOptions {
  now?: () => Date;
  /** Called instead of answering when the database was busy (the caller retries). */
  onBusy?: () => void;
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

export function handleHl7Text(store: Hl7Store, text: string, sender: Hl7Sender, opts: HandleOptions = {}): HandleResult {
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
  try {
    const r = store.store(m, text, sender, now);
    opts.onStored?.(r, m);
    const note = r.status === 'duplicate' ? `duplicate of ${r.duplicateOf}; stored once` : r.status === 'unmatched' ? `no case in progress for ${m.location ?? 'this device'}; ${r.stored} samples kept in the unmatched inbox` : `${r.stored} samples stored`;
    return { ack: buildAck('AA', input, undefined, note), code: 'AA', result: r };
  } catch (e) {
    if (e instanceof UnknownDeviceError) {
      const field = e.message.startsWith('MSH-8') ? 8 : 4;
      return { ack: buildAck('AR', input, { segment: 'MSH', occurrence: 1, field, code: 204, text: e.message }), code: 'AR', error: e.message };
    }
    if (opts.onBusy && isBusy(e)) {
      opts.onBusy();
      return { ack: '', code: 'AE', error: 'busy' };
    }
    console.error('hl7 store failed:', e instanceof Error ? e.message : e);
    return { ack: buildAck('AE', input, { segment: 'MSH', occurrence: 1, field: null, code: 207, text: 'storage failed; nothing was saved, send again' }), code: 'AE', error: 'storage failed' };
  }
}

function isBusy(e: unknown): boolean {
  const code = (e as { code?: string } | null)?.code ?? '';
  return code === 'SQLITE_BUSY' || code.startsWith('SQLITE_BUSY_');
}

/**
 * handleHl7Text for a listener whose handle has busy_timeout = 0: when another process (the app,
 * the summary worker) holds the write lock, retry every millisecond without blocking the event
 * loop, instead of SQLite's busy handler, which sleeps the whole thread in steps of up to 100 ms.
 */
export async function handleHl7TextRetrying(store: Hl7Store, text: string, sender: Hl7Sender, opts: HandleOptions & { maxWaitMs?: number } = {}): Promise<HandleResult> {
  const deadline = Date.now() + (opts.maxWaitMs ?? 10_000);
  for (;;) {
    let busy = false;
    const r = handleHl7Text(store, text, sender, { ...opts, onBusy: () => (busy = true) } as HandleOptions);
    if (!busy) return r;
    if (Date.now() > deadline) return handleHl7Text(store, text, sender, { ...opts, onBusy: undefined });
    await new Promise((res) => setTimeout(res, 1));
  }
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

/** Starts the listener. Sets busy_timeout = 0 on `raw`: waits for the write lock are retried asynchronously. */
export async function startMllpServer(raw: Database.Database, opts: MllpServerOptions): Promise<MllpServer> {
  raw.pragma('busy_timeout = 0');
  const store = new Hl7Store(raw);
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
          const r = await handleHl7TextRetrying(store, ev.text, { kind: 'mllp', address: addr }, opts);
          if (r.code !== 'AA') log(`${addr}: ${r.code} ${r.error}`);
          if (!sock.destroyed) sock.write(mllpFrame(r.ack));
        });
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
