import { db, sql } from '@/lib/db/client';
import { Hl7Store, checkApiToken } from '@/lib/db/hl7Store';
import { handleHl7Text } from '@/lib/server/mllpServer';
import { appDebouncer } from '@/lib/server/liveBus';
import { now } from '@/lib/server/clock';

/**
 * HL7 v2 over HTTP for interface engines: POST the message as text (text/plain or
 * application/hl7-v2), `Authorization: Bearer <API token>`; the answer is the ACK as text.
 * Public in the session sense (PUBLIC_ROUTES): this handler checks the API token itself against
 * ApiToken hashes (scope hl7, not revoked). AA/AE → 200 (the ACK carries the outcome, as MLLP
 * does); AR → 400 with the ACK; no or bad token → 401.
 */
export async function POST(req: Request) {
  const q = sql();
  const auth = req.headers.get('authorization') ?? '';
  const m = /^Bearer\s+(\S+)$/i.exec(auth);
  const tokenId = m ? await checkApiToken(q, m[1], now()) : null;
  if (!tokenId) return new Response('authorization: send a valid API token as "Authorization: Bearer <token>"\n', { status: 401, headers: { 'content-type': 'text/plain; charset=utf-8', 'www-authenticate': 'Bearer' } });
  const type = req.headers.get('content-type') ?? '';
  if (!/^(text\/plain|application\/hl7-v2|x-application\/hl7-v2\+er7)/i.test(type)) return new Response('body: send the HL7 message as text/plain or application/hl7-v2\n', { status: 415, headers: { 'content-type': 'text/plain; charset=utf-8' } });
  const text = await req.text();
  if (text.length > 1_000_000) return new Response('body: larger than 1 MB\n', { status: 413, headers: { 'content-type': 'text/plain; charset=utf-8' } });
  const debouncer = appDebouncer(db);
  const r = await handleHl7Text(new Hl7Store(q), text, { kind: 'http', tokenId }, { now, onStored: (s) => s.caseId && s.stored > 0 && debouncer.touch(s.caseId) });
  return new Response(r.ack, { status: r.code === 'AR' ? 400 : 200, headers: { 'content-type': 'application/hl7-v2; charset=utf-8', 'cache-control': 'no-store' } });
}
