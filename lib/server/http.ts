import { ZodError, type z } from 'zod';
import { zodMessage } from '@/lib/_shared/zodMessage';
import { nulCharacterAt } from '@/lib/_shared/nulCharacter';

/** An error a handler maps to a status with a message the user can act on. */
export class HttpError extends Error {
  constructor(public status: number, message: string) {
    super(message);
  }
}

/** Parses a JSON request body with a zod schema; a bad body becomes a 400/422 naming the field. */
export async function parseJson<T extends z.ZodType>(req: Request, schema: T): Promise<z.infer<T>> {
  const type = req.headers.get('content-type') ?? '';
  if (!type.includes('application/json')) throw new HttpError(415, 'body: send JSON with content-type application/json');
  let body: unknown;
  try {
    const text = await req.text();
    if (text.length > 1_000_000) throw new HttpError(413, 'body: larger than 1 MB');
    body = JSON.parse(text);
  } catch (e) {
    if (e instanceof HttpError) throw e;
    throw new HttpError(400, 'body: not valid JSON');
  }
  const nul = nulCharacterAt(body);
  if (nul) throw new HttpError(422, `${nul}: contains a NUL character (U+0000), which cannot be stored`);
  return schema.parse(body);
}

/** Maps thrown errors to JSON responses: ZodError → 422, HttpError → its status, else 500. */
export function errorResponse(e: unknown): Response {
  if (e instanceof ZodError) return Response.json({ error: zodMessage(e) }, { status: 422 });
  if (e instanceof HttpError) return Response.json({ error: e.message }, { status: e.status });
  // A NUL in a query parameter reaches PostgreSQL, which refuses it (SQLite would not): the
  // request was at fault, not the server, and nothing was written.
  if (e instanceof Error && /invalid byte sequence for encoding "UTF8": 0x00|\u0000 cannot be converted/.test(e.message)) {
    return Response.json({ error: 'a value contains a NUL character (U+0000), which cannot be stored or searched for' }, { status: 422 });
  }
  console.error('unhandled error', e instanceof Error ? e.message : 'unknown');
  return Response.json({ error: 'internal error; nothing was saved' }, { status: 500 });
}

/** Rejects a mutation whose Origin header names another site (CSRF defence beside SameSite). */
export function checkOrigin(req: Request): void {
  const origin = req.headers.get('origin');
  if (!origin) return;
  const host = req.headers.get('x-forwarded-host') ?? req.headers.get('host');
  let originHost: string;
  try {
    originHost = new URL(origin).host;
  } catch {
    throw new HttpError(403, 'origin: not a valid origin');
  }
  if (originHost !== host) throw new HttpError(403, 'origin: requests from another site are refused');
}
