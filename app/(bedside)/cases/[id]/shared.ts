'use client';
import type { CaseSheetData } from '@/lib/db/caseSheet';
import type { OutboxItem } from './outbox';

export type Submit = (body: Record<string, unknown> & { type: string; at?: string }) => Promise<string>;

export interface ViewEntry {
  id: string;
  type: 'dose' | 'intervention' | 'event' | 'vital' | 'recovery';
  atMs: number;
  text: string;
  by: string | null;
  waiting: boolean;
  voided: { reason: string; by: string | null } | null;
  voidWaiting: boolean;
  raw: unknown;
}

/** Seconds from the case clock. */
export function secs(sheet: CaseSheetData, iso: string): number {
  return (new Date(iso).getTime() - new Date(sheet.case.startAt).getTime()) / 1000;
}

export function clock(iso: string | number, timeZone: string, seconds = false): string {
  return new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', second: seconds ? '2-digit' : undefined, hourCycle: 'h23' }).format(new Date(iso));
}

/** Server entries plus this device's waiting ones, so a tap shows at once. */
export function mergeWaiting<T extends { id: string }>(server: T[], outbox: OutboxItem[], type: string, make: (b: OutboxItem['body']) => T): (T & { waiting: boolean })[] {
  const known = new Set(server.map((s) => s.id));
  const waiting = outbox.filter((o) => o.body.type === type && !known.has(o.id) && !o.refused).map((o) => ({ ...make(o.body), waiting: true }));
  return [...server.map((s) => ({ ...s, waiting: false })), ...waiting];
}

export function pendingVoids(outbox: OutboxItem[]): Set<string> {
  return new Set(outbox.filter((o) => (o.body.type === 'void' || o.body.type === 'retime') && !o.refused).map((o) => String(o.body.targetId)));
}
