import { authorizeApi } from '@/lib/server/access';
import { checkOrigin, errorResponse, HttpError } from '@/lib/server/http';
import { NotFoundError, ConflictError } from '@/lib/db/cases';
import { CsvRejectedError, DuplicateImportError, importMonitorCsv } from '@/lib/db/sampleImport';
import { readCsvUpload, UploadError } from '@/lib/ingest/monitorCsv';
import { db } from '@/lib/db/client';
import { scheduleSummary } from '@/lib/server/summaryQueue';
import { now } from '@/lib/server/clock';
import { requestOrigin } from '@/lib/server/session';

/**
 * Imports a monitor trend CSV into a case, all or nothing.
 * Body: multipart/form-data (`file`, `mapping` as JSON text) or JSON `{ text, fileName?, mapping }`.
 * 201 with counts; 409 for a file already imported into the case or a signed case; 422 with the
 * problems by row and column; 413 above 20 MB.
 */
export async function POST(req: Request, ctx: { params: Promise<{ id: string }> }) {
  const user = await authorizeApi('POST /api/v1/cases/[id]/imports');
  if (user instanceof Response) return user;
  try {
    checkOrigin(req);
    const { id } = await ctx.params;
    const upload = await readCsvUpload(req);
    if (!upload.mapping) throw new HttpError(422, 'mapping: is required; preview the file and send the mapping it shows');
    const t = now();
    const r = await importMonitorCsv(db(), { caseId: id, fileName: upload.fileName, bytes: upload.bytes, text: upload.text, mapping: upload.mapping }, { id: user.id, role: user.role, origin: await requestOrigin() }, t);
    // New samples change the analysis: recompute the stored summary soon (readers refresh it too).
    scheduleSummary(id);
    return Response.json({ ok: true, ...r }, { status: 201 });
  } catch (e) {
    if (e instanceof UploadError) return errorResponse(new HttpError(e.status, e.message));
    if (e instanceof CsvRejectedError) return Response.json({ ok: false, error: e.message, errors: e.errors, errorCount: e.errorCount }, { status: 422 });
    if (e instanceof DuplicateImportError) return Response.json({ ok: false, error: e.message, importId: e.importId }, { status: 409 });
    if (e instanceof NotFoundError) return errorResponse(new HttpError(404, e.message));
    if (e instanceof ConflictError) return errorResponse(new HttpError(409, e.message));
    return errorResponse(e);
  }
}
