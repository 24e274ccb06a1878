import { z } from 'zod';
import { authorizeApi } from '@/lib/server/access';
import { errorResponse } from '@/lib/server/http';
import { sql } from '@/lib/db/client';
import { lastSampleId, samplesAfter } from '@/lib/server/liveBus';

const Query = z.object({ after: z.coerce.number({ message: 'must be a sample id' }).int().min(0).optional() });
const POLL_MS = 1000;
const PING_MS = 15_000;

/**
 * Server-sent events of a case's new samples: `event: samples`, `id: <last sample id>`,
 * `data: {"samples":[{id,channel,atMs,value,source}]}`. The server polls the database for new
 * sample ids every second (so samples written by the MLLP process or another app instance
 * arrive within ~1 s); `after` or Last-Event-ID resumes, otherwise the stream starts at the
 * newest sample.
 */
export async function GET(req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('GET /api/v1/cases/[id]/live');
  if (user instanceof Response) return user;
  try {
    const { id } = await ctx.params;
    const q = Query.parse(Object.fromEntries(new URL(req.url).searchParams));
    const port = sql();
    if (!(await port.get('SELECT 1 AS "one" FROM "Case" WHERE "id" = ?', [id]))) return Response.json({ error: `case ${id} not found` }, { status: 404 });
    const lastEvent = Number(req.headers.get('last-event-id'));
    let after = q.after ?? (Number.isInteger(lastEvent) && lastEvent > 0 ? lastEvent : await lastSampleId(port, id));
    const enc = new TextEncoder();
    let timer: NodeJS.Timeout | undefined;
    let lastSent = Date.now();
    let closed = false;
    const stream = new ReadableStream<Uint8Array>({
      start(controller) {
        const close = () => {
          if (closed) return;
          closed = true;
          clearTimeout(timer);
          try {
            controller.close();
          } catch {
            /* already closed */
          }
        };
        controller.enqueue(enc.encode(`retry: 2000\nevent: ready\nid: ${after}\ndata: ${JSON.stringify({ after })}\n\n`));
        const tick = async () => {
          try {
            const rows = await samplesAfter(port, id, after);
            if (closed) return;
            if (rows.length > 0) {
              after = rows[rows.length - 1].id;
              controller.enqueue(enc.encode(`event: samples\nid: ${after}\ndata: ${JSON.stringify({ samples: rows })}\n\n`));
              lastSent = Date.now();
            } else if (Date.now() - lastSent > PING_MS) {
              controller.enqueue(enc.encode(': ping\n\n'));
              lastSent = Date.now();
            }
            timer = setTimeout(() => void tick(), rows.length >= 2000 ? 0 : POLL_MS);
          } catch {
            close();
          }
        };
        timer = setTimeout(() => void tick(), POLL_MS);
        req.signal.addEventListener('abort', close);
      },
      cancel() {
        closed = true;
        clearTimeout(timer);
      },
    });
    return new Response(stream, { headers: { 'content-type': 'text/event-stream; charset=utf-8', 'cache-control': 'no-store, no-transform', connection: 'keep-alive', 'x-accel-buffering': 'no' } });
  } catch (e) {
    return errorResponse(e);
  }
}
