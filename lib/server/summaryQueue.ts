import { db } from '@/lib/db/client';
import { refreshSummary } from '@/lib/db/summaries';
import { now } from './clock';

/**
 * Recomputes a case's stored summary shortly after its data changed, off the request path, and
 * once for a burst of entries. This is only a head start: every reader (the case sheet, signing,
 * the review) refreshes a stale summary itself, keyed by the input hash, so nothing depends on
 * this timer having run — a second app instance is never wrong, only a little slower.
 */
const pending = new Map<string, ReturnType<typeof setTimeout>>();
const DELAY_MS = 1500;

export function scheduleSummary(caseId: string): void {
  if (pending.has(caseId)) return;
  pending.set(
    caseId,
    setTimeout(() => {
      pending.delete(caseId);
      refreshSummary(db(), caseId, now()).catch(() => {});
    }, DELAY_MS),
  );
}
