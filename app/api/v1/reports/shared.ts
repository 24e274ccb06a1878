/** Small helpers shared by the report and indicator route handlers (no business rules). */
import { errorResponse, HttpError } from '@/lib/server/http';
import { requestOrigin, type SessionUser } from '@/lib/server/session';
import { ReportConflictError, ReportInputError, ReportNotFoundError, type ExportFile, type ReportActor } from '@/lib/db/indicatorReports';

export async function reportActor(user: SessionUser): Promise<ReportActor> {
  return { id: user.id, role: user.role, displayName: user.displayName, origin: await requestOrigin() };
}

/** Maps the report errors to 422 / 404 / 409, the rest as usual. */
export function reportErrorResponse(e: unknown): Response {
  if (e instanceof ReportInputError) return errorResponse(new HttpError(422, e.message));
  if (e instanceof ReportNotFoundError) return errorResponse(new HttpError(404, e.message));
  if (e instanceof ReportConflictError) return errorResponse(new HttpError(409, e.message));
  return errorResponse(e);
}

/** A download: attachment with its file name, never cached. */
export function fileResponse(file: ExportFile): Response {
  return new Response(Buffer.from(file.body), {
    headers: { 'content-type': file.contentType, 'content-disposition': `attachment; filename="${file.filename}"`, 'cache-control': 'no-store' },
  });
}
