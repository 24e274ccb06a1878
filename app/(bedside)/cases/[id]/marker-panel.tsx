'use client';
import type { Submit } from './shared';
import { clock } from './shared';

export const MARKERS = [
  { kind: 'sedation_start', label: 'Sedation start' },
  { kind: 'procedure_start', label: 'Procedure start' },
  { kind: 'procedure_end', label: 'Procedure end' },
  { kind: 'recovery_start', label: 'Recovery start' },
  { kind: 'discharge', label: 'Discharge' },
] as const;

/** The case's time markers; each shows when it was recorded. */
export function MarkerPanel({ events, submit, timeZone, disabled }: { events: { kind: string; at: string; voided: unknown; waiting: boolean }[]; submit: Submit; timeZone: string; disabled: boolean }) {
  return (
    <div className="marker-grid" data-testid="marker-panel">
      {MARKERS.map((m) => {
        const done = events.find((e) => e.kind === m.kind && !e.voided);
        return (
          <button key={m.kind} type="button" className={done ? 'done' : 'primary'} onClick={() => submit({ type: 'event', kind: m.kind })} disabled={disabled || !!done} data-testid={`marker-${m.kind}`}>
            <span>{m.label}</span>
            <span className="small">{done ? `${clock(done.at, timeZone, true)}${done.waiting ? ' · waiting' : ''}` : 'tap to record now'}</span>
          </button>
        );
      })}
    </div>
  );
}
