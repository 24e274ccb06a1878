import { z } from 'zod';
import { authorizeApi } from '@/lib/server/access';
import { checkOrigin, errorResponse, HttpError } from '@/lib/server/http';
import { NotFoundError, ConflictError } from '@/lib/db/cases';
import { DuplicateWaveformError, importWaveformCsv, waveformWindow } from '@/lib/db/waveform';
import { WaveformError } from '@/lib/capnogram';
import { db } from '@/lib/db/client';
import { now } from '@/lib/server/clock';
import { requestOrigin } from '@/lib/server/session';

/** Largest accepted body: about 6 h of 100 Hz CSV. */
const MAX_BYTES = 40_000_000;

const Body = z.object({
  text: z.string().min(1, 'is empty'),
  fileName: z.string().min(1).max(200).default('waveform.csv'),
  rateHz: z.number().min(20, 'must be at least 20 Hz').max(300, 'must be at most 300 Hz'),
  unit: z.enum(['mmHg', 'kPa']),
  clockOffsetS: z.number().finite().default(0),
});

const Query = z.object({
  from: z.coerce.number().finite().optional(),
  to: z.coerce.number().finite().optional(),
  points: z.coerce.number().int().min(100).max(20000).optional(),
});

/**
 * A window of the case's raw CO2 waveform: samples (min/max-downsampled when wide), the breaths
 * in it with their measurements, and the case's shape findings, analysed on the fly.
 * `?from&to` in seconds from the case start (default: the first 2 minutes), `points` the most samples.
 */
export async function GET(req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('GET /api/v1/cases/[id]/waveform');
  if (user instanceof Response) return user;
  try {
    const { id } = await ctx.params;
    const q = Query.parse(Object.fromEntries(new URL(req.url).searchParams));
    if (q.from !== undefined && q.to !== undefined && q.to <= q.from) throw new HttpError(422, 'to: must be after from');
    const w = await waveformWindow(db(), id, { fromS: q.from, toS: q.to, maxPoints: q.points });
    if (!w) return Response.json({ error: `case ${id} not found` }, { status: 404 });
    return Response.json(w, { headers: { 'cache-control': 'no-store' } });
  } catch (e) {
    return errorResponse(e);
  }
}

/**
 * Imports a raw CO2 CSV (time or sample index + value, or values only) at a stated rate into the
 * case, aligned to the case clock by `clockOffsetS`. Body: JSON `{ text, fileName, rateHz, unit,
 * clockOffsetS }`. 201 with counts; 409 for the same file again, an overlap or a signed case;
 * 422 naming the field for an unreadable file or a wrong rate; 413 above 40 MB.
 */
export async function POST(req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('POST /api/v1/cases/[id]/waveform');
  if (user instanceof Response) return user;
  try {
    checkOrigin(req);
    const { id } = await ctx.params;
    if (!(req.headers.get('content-type') ?? '').includes('application/json')) throw new HttpError(415, 'body: send JSON with content-type application/json');
    if (Number(req.headers.get('content-length') ?? 0) > MAX_BYTES) throw new HttpError(413, 'body: larger than 40 MB');
    const raw = await req.text();
    if (raw.length > MAX_BYTES) throw new HttpError(413, 'body: larger than 40 MB');
    let json: unknown;
    try {
      json = JSON.parse(raw);
    } catch {
      throw new HttpError(400, 'body: not valid JSON');
    }
    const body = Body.parse(json);
    const r = await importWaveformCsv(db(), { caseId: id, ...body }, { id: user.id, role: user.role, origin: await requestOrigin() }, now());
    return Response.json({ ok: true, ...r }, { status: 201 });
  } catch (e) {
    if (e instanceof WaveformError) return Response.json({ ok: false, error: e.message, field: e.field }, { status: 422 });
    if (e instanceof DuplicateWaveformError) return Response.json({ ok: false, error: e.message, importId: e.importId }, { status: 409 });
    if (e instanceof NotFoundError) return errorResponse(new HttpError(404, e.message));
    if (e instanceof ConflictError) return errorResponse(new HttpError(409, e.message));
    return errorResponse(e);
  }
}
