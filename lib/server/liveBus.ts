/**
 * Live feed helpers shared by the MLLP listener and the app: a per-case debounced summary refresh
 * (the episode panel reads CaseSummary), and the DB poll behind the SSE stream. No in-memory
 * state carries samples: the stream reads new Sample ids from the database, so a second app
 * instance sees what the listener wrote. (On PostgreSQL sample ids are taken inside the write
 * lock, so they commit in increasing order and a poll by id never skips one.)
 */
import type { Sql } from '@/lib/db/sql';
import type { PrismaClient } from '@/lib/db/generated/client';
import { refreshSummary } from '@/lib/db/summaries';

/** Refreshes a case's summary at most once per `intervalMs` (trailing: the last samples count). */
export class SummaryDebouncer {
  private timers = new Map<string, NodeJS.Timeout>();
  private running = new Set<string>();

  constructor(
    private readonly client: () => PrismaClient,
    private readonly intervalMs = 3000,
    private readonly now: () => Date = () => new Date(),
  ) {}

  touch(caseId: string): void {
    if (this.timers.has(caseId)) return;
    const t = setTimeout(() => {
      this.timers.delete(caseId);
      if (this.running.has(caseId)) return this.touch(caseId);
      this.running.add(caseId);
      refreshSummary(this.client(), caseId, this.now())
        .catch((e: unknown) => console.error(`summary refresh for ${caseId} failed:`, e instanceof Error ? e.message : e))
        .finally(() => this.running.delete(caseId));
    }, this.intervalMs);
    t.unref?.();
    this.timers.set(caseId, t);
  }

  /** Runs pending refreshes now (shutdown). */
  async flush(): Promise<void> {
    const ids = [...this.timers.keys()];
    for (const t of this.timers.values()) clearTimeout(t);
    this.timers.clear();
    for (const id of ids) await refreshSummary(this.client(), id, this.now()).catch(() => undefined);
  }
}

export interface LiveSampleRow {
  id: number;
  channel: string;
  atMs: number;
  value: number;
  source: string;
}

/** Monitor and manual samples of a case after sample id `after`, oldest first. */
export async function samplesAfter(q: Sql, caseId: string, after: number, limit = 2000): Promise<LiveSampleRow[]> {
  const rows = await q.all<LiveSampleRow>('SELECT "id", "channel", "atMs", "value", "source" FROM "Sample" WHERE "caseId" = ? AND "id" > ? ORDER BY "id" LIMIT ?', [caseId, after, limit]);
  return rows.map((r) => ({ id: Number(r.id), channel: r.channel, atMs: Number(r.atMs), value: Number(r.value), source: r.source }));
}

/** The highest sample id of a case (where a new stream starts when the client names none). */
export async function lastSampleId(q: Sql, caseId: string): Promise<number> {
  const r = await q.get<{ id: number | string | null }>('SELECT COALESCE(MAX("id"), 0) AS "id" FROM "Sample" WHERE "caseId" = ?', [caseId]);
  return Number(r?.id ?? 0);
}

const globalForLive = globalThis as unknown as { plateauAppDebouncer?: SummaryDebouncer };

/** The app process's summary debouncer (HTTP ingest and inbox attach): one per process. */
export function appDebouncer(client: () => PrismaClient): SummaryDebouncer {
  globalForLive.plateauAppDebouncer ??= new SummaryDebouncer(client);
  return globalForLive.plateauAppDebouncer;
}
