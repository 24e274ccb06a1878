'use client';
/**
 * The bedside outbox: every entry is written to IndexedDB first, then sent; it leaves the
 * outbox only when the server confirms (2xx). The server is idempotent on the entry id, so a
 * retry after a lost answer is stored once. Entries the server refuses (4xx) stay visible with
 * the server's message until the nurse dismisses them.
 */
import { openDB, type IDBPDatabase } from 'idb';

export interface OutboxItem {
  id: string;
  caseId: string;
  body: Record<string, unknown> & { type: string; id: string; at: string };
  queuedAt: number;
  tries: number;
  refused: string | null;
}

const DB = 'plateau-outbox';
const STORE = 'entries';
let dbp: Promise<IDBPDatabase> | null = null;
let memory: Map<string, OutboxItem> | null = null; // used when IndexedDB is unavailable

function database(): Promise<IDBPDatabase> | null {
  if (typeof indexedDB === 'undefined') return null;
  dbp ??= openDB(DB, 1, { upgrade: (d) => d.createObjectStore(STORE, { keyPath: 'id' }) });
  return dbp;
}

export async function putItem(item: OutboxItem): Promise<void> {
  const d = database();
  if (!d) {
    (memory ??= new Map()).set(item.id, item);
    return;
  }
  await (await d).put(STORE, item);
}

export async function deleteItem(id: string): Promise<void> {
  const d = database();
  if (!d) {
    memory?.delete(id);
    return;
  }
  await (await d).delete(STORE, id);
}

export async function itemsFor(caseId: string): Promise<OutboxItem[]> {
  const d = database();
  const all = d ? ((await (await d).getAll(STORE)) as OutboxItem[]) : [...(memory?.values() ?? [])];
  return all.filter((i) => i.caseId === caseId).sort((a, b) => a.queuedAt - b.queuedAt);
}

/** A v4 UUID, also outside secure contexts (plain http on a ward network). */
export function newId(): string {
  if (typeof crypto !== 'undefined' && typeof crypto.randomUUID === 'function') return crypto.randomUUID();
  const b = new Uint8Array(16);
  crypto.getRandomValues(b);
  b[6] = (b[6] & 0x0f) | 0x40;
  b[8] = (b[8] & 0x3f) | 0x80;
  const h = [...b].map((x) => x.toString(16).padStart(2, '0')).join('');
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`;
}

export type SendResult = 'sent' | 'refused' | 'retry';

/** Sends one item; removes it on success, marks it refused on a 4xx, keeps it otherwise. */
export async function sendItem(item: OutboxItem): Promise<SendResult> {
  let res: Response;
  try {
    res = await fetch(`/api/v1/cases/${encodeURIComponent(item.caseId)}/entries`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify(item.body),
    });
  } catch {
    await putItem({ ...item, tries: item.tries + 1 });
    return 'retry';
  }
  if (res.ok) {
    await deleteItem(item.id);
    return 'sent';
  }
  if (res.status >= 400 && res.status < 500 && ![401, 408, 425, 429].includes(res.status)) {
    let message = `refused (${res.status})`;
    try {
      message = ((await res.json()) as { error?: string }).error ?? message;
    } catch {
      /* keep the status */
    }
    await putItem({ ...item, tries: item.tries + 1, refused: message });
    return 'refused';
  }
  await putItem({ ...item, tries: item.tries + 1 });
  return 'retry';
}
