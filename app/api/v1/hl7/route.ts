import { databaseFile, openRawDatabase } from '@/lib/db/sqlite';
import { db } from '@/lib/db/client';
import { Hl7Store, checkApiToken } from '@/lib/db/hl7Store';
import { handleHl7Text } from '@/lib/server/mllpServer';
import { appDebouncer, liveRaw } from '@/lib/server/liveBus';
import { now } from '@/lib/server/clock';

/**
 * HL7 v2 over HTTP for interface engines: POST the message as text (text/plain or
 * application/hl7-v2), `Authorization: Bearer <API token>`; the answer is the ACK as text.
 * Public in the session sense (PUBLIC_ROUTES): this handler checks the API token itself against
 * ApiToken hashes (scope hl7, not revoked). AA/AE → 200 (the ACK carries the outcome, as MLLP
 * does); AR → 400 with the ACK; no or bad token → 401.
 */
const stores = new WeakMap<object, Hl7Store>();

export async function POST(req: Request) {
  const raw = liveRaw(databaseFile(), openRawDatabase);
  const auth = req.headers.get('authorization') ?? '';
  const m = /^Bearer\s+(\S+)$/i.exec(auth);
  const tokenId = m ? checkApiToken(raw, m[1], now()) : null;
  if (!tokenId) return new Response('authorization: send a valid API token as "Authorization: Bearer <token>"\n', { status: 401, headers: { 'content-type': 'text/plain; charset=utf-8', 'www-authenticate': 'Bearer' } });
  const type = req.headers.get('content-type') ?? '';
  if (!/^(text\/plain|application\/hl7-v2|x-application\/hl7-v2\+er7)/i.test(type)) return new Response('body: send the HL7 message as text/plain or application/hl7-v2\n', { status: 415, headers: { 'content-type': 'text/plain; charset=utf-8' } });
  const text = await req.text();
  if (text.length > 1_000_000) return new Response('body: larger than 1 MB\n', { status: 413, headers: { 'content-type': 'text/plain; charset=utf-8' } });
  let store = stores.get(raw);
  if (!store) {
    store = new Hl7Store(raw);
    stores.set(raw, store);
  }
  const debouncer = appDebouncer(db);
  const r = handleHl7Text(store, text, { kind: 'http', tokenId }, { now, onStored: (s) => s.caseId && s.stored > 0 && debouncer.touch(s.caseId) });
  return new Response(r.ack, { status: r.code === 'AR' ? 400 : 200, headers: { 'content-type': 'application/hl7-v2; charset=utf-8', 'cache-control': 'no-store' } });
}
