import { authorizeApi } from '@/lib/server/access';
import { checkOrigin, errorResponse, HttpError } from '@/lib/server/http';
import { NotFoundError } from '@/lib/db/cases';
import { previewMonitorCsv } from '@/lib/db/sampleImport';
import { problemSummary, readCsvUpload, UploadError } from '@/lib/ingest/monitorCsv';
import { db } from '@/lib/db/client';

/**
 * Reads a monitor trend CSV for a case and writes nothing: the inspection (delimiter, columns,
 * first rows, suggested mapping) and, with the mapping sent or the suggested one, a summary of
 * each series thinned for a chart (200) — or the problems by row and column (422).
 * Body: multipart/form-data (`file`, optional `mapping` as JSON text) or JSON `{ text, mapping? }`.
 */
export async function POST(req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('POST /api/v1/cases/[id]/imports/preview');
  if (user instanceof Response) return user;
  try {
    checkOrigin(req);
    const { id } = await ctx.params;
    const upload = await readCsvUpload(req);
    const r = await previewMonitorCsv(db(), { caseId: id, text: upload.text, mapping: upload.mapping });
    if (!r.ok) return Response.json({ ...r, fileName: upload.fileName, error: problemSummary(r.errors ?? [], r.errorCount) }, { status: 422 });
    return Response.json({ ...r, fileName: upload.fileName }, { status: 200 });
  } catch (e) {
    if (e instanceof UploadError) return errorResponse(new HttpError(e.status, e.message));
    if (e instanceof NotFoundError) return errorResponse(new HttpError(404, e.message));
    return errorResponse(e);
  }
}
