'use client';
import { useCallback, useEffect, useRef, useState } from 'react';
import type { CaseSheetData } from '@/lib/db/caseSheet';
import { itemsFor, newId, putItem, sendItem, type OutboxItem } from './outbox';

const POLL_MS = 2500;

/**
 * Keeps the case sheet live: polls the server (other nurses' entries and new monitor samples),
 * and owns the outbox of this device's unsent entries.
 */
export function useCaseSheet(initial: CaseSheetData) {
  const caseId = initial.case.id;
  const [sheet, setSheet] = useState(initial);
  const samples = useRef(initial.samples.channels);
  const lastSampleId = useRef(initial.samples.lastId);
  const [sampleRev, setSampleRev] = useState(0);
  const [outbox, setOutbox] = useState<OutboxItem[]>([]);
  const [online, setOnline] = useState(true);
  const [clockSkewMs, setSkew] = useState(0);
  const sending = useRef(false);

  const refresh = useCallback(async () => {
    try {
      const r = await fetch(`/api/v1/cases/${encodeURIComponent(caseId)}/sheet?after=${lastSampleId.current}`, { cache: 'no-store' });
      if (r.status === 401) {
        window.location.href = '/sign-in';
        return;
      }
      if (!r.ok) return;
      const next = (await r.json()) as CaseSheetData;
      setSkew(new Date(next.serverNow).getTime() - Date.now());
      const add = next.samples.channels;
      if (Object.keys(add).length) {
        const merged = { ...samples.current };
        for (const [ch, s] of Object.entries(add)) {
          const cur = merged[ch] ?? { t: [], v: [] };
          const pairs = cur.t.map((t, i) => [t, cur.v[i]] as const).concat(s.t.map((t, i) => [t, s.v[i]] as const));
          pairs.sort((a, b) => a[0] - b[0]);
          merged[ch] = { t: pairs.map((p) => p[0]), v: pairs.map((p) => p[1]) };
        }
        samples.current = merged;
        setSampleRev((x) => x + 1);
      }
      lastSampleId.current = Math.max(lastSampleId.current, next.samples.lastId);
      setSheet(next);
    } catch {
      /* offline: the outbox keeps entries; the next poll catches up */
    }
  }, [caseId]);

  const flush = useCallback(async () => {
    if (sending.current) return;
    sending.current = true;
    try {
      const items = await itemsFor(caseId);
      let anySent = false;
      let reachable = true;
      for (const item of items) {
        if (item.refused) continue;
        const r = await sendItem(item);
        if (r === 'sent') anySent = true;
        if (r === 'retry') {
          reachable = false;
          break; // keep order: try again later from this one
        }
      }
      setOnline(reachable && navigator.onLine !== false);
      // Refresh first, so a sent entry is in the server's list before it leaves the waiting list.
      if (anySent) await refresh();
      setOutbox(await itemsFor(caseId));
    } finally {
      sending.current = false;
    }
  }, [caseId, refresh]);

  useEffect(() => {
    itemsFor(caseId).then(setOutbox);
    flush();
    const poll = setInterval(() => {
      refresh();
      flush();
    }, POLL_MS);
    const wake = () => flush();
    window.addEventListener('online', wake);
    return () => {
      clearInterval(poll);
      window.removeEventListener('online', wake);
    };
  }, [caseId, refresh, flush]);

  /** Queues an entry (stored on the device first), then tries to send it. */
  const submit = useCallback(
    async (body: Record<string, unknown> & { type: string; at?: string }) => {
      const id = newId();
      const item: OutboxItem = { id, caseId, body: { ...body, id, at: body.at ?? new Date(Date.now() + clockSkewMs).toISOString() } as OutboxItem['body'], queuedAt: Date.now(), tries: 0, refused: null };
      await putItem(item);
      setOutbox(await itemsFor(caseId));
      void flush();
      return id;
    },
    [caseId, flush, clockSkewMs],
  );

  const dismiss = useCallback(
    async (id: string) => {
      const { deleteItem } = await import('./outbox');
      await deleteItem(id);
      setOutbox(await itemsFor(caseId));
    },
    [caseId],
  );

  return { sheet, samples: samples.current, sampleRev, outbox, online, submit, dismiss, refresh, clockSkewMs };
}
