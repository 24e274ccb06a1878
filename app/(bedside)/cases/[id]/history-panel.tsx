'use client';
import { useState } from 'react';
import type { Submit, ViewEntry } from './shared';
import { clock } from './shared';
import { atClockTimeNear } from '@/lib/_shared/time';

/** Every entry with its history; any entry can be voided with a reason or re-timed. */
export function HistoryPanel({ entries, submit, timeZone, disabled, nowMs }: { entries: ViewEntry[]; submit: Submit; timeZone: string; disabled: boolean; nowMs: number }) {
  const [editing, setEditing] = useState<{ id: string; mode: 'void' | 'retime' } | null>(null);
  const [reason, setReason] = useState('');
  const [time, setTime] = useState('');
  const [error, setError] = useState<string | null>(null);
  const target = entries.find((e) => e.id === editing?.id);

  const doVoid = async () => {
    if (!target) return;
    if (reason.trim().length < 3) return setError('Say why (at least 3 characters).');
    await submit({ type: 'void', target: target.type, targetId: target.id, reason: reason.trim() });
    close();
  };
  const doRetime = async (newAtMs: number) => {
    if (!target || target.type === 'recovery') return;
    await submit({ type: 'retime', target: target.type, targetId: target.id, newAt: new Date(newAtMs).toISOString(), ...(reason.trim() ? { reason: reason.trim() } : {}) });
    close();
  };
  const retimeTyped = () => {
    const m = /^(\d{1,2}):(\d{2})(?::(\d{2}))?$/.exec(time.trim());
    if (!m || !target) return setError('Type the time as HH:MM or HH:MM:SS.');
    return doRetime(atClockTimeNear(target.atMs, Number(m[1]), Number(m[2]), Number(m[3] ?? 0), timeZone));
  };
  const close = () => {
    setEditing(null);
    setReason('');
    setTime('');
    setError(null);
  };

  return (
    <div data-testid="history-panel">
      <ul className="history">
        {[...entries].sort((a, b) => b.atMs - a.atMs).map((e) => (
          <li key={e.id} className={e.voided ? 'voided-row' : undefined} data-testid="history-row">
            <span className="time">{clock(e.atMs, timeZone, true)}</span>
            <span className={e.voided ? 'voided' : undefined}>{e.text}</span>
            <span className="muted small">
              {e.by ?? 'this device'}
              {e.waiting && ' · waiting to save'}
              {e.voidWaiting && ' · correction waiting'}
              {e.voided && ` · voided by ${e.voided.by ?? '?'}: ${e.voided.reason}`}
            </span>
            {!e.voided && !e.waiting && !e.voidWaiting && (
              <span className="row">
                <button type="button" onClick={() => setEditing({ id: e.id, mode: 'void' })} disabled={disabled} aria-label={`Void ${e.text}`}>Void</button>
                {e.type !== 'recovery' && (
                  <button type="button" onClick={() => setEditing({ id: e.id, mode: 'retime' })} disabled={disabled} aria-label={`Re-time ${e.text}`}>Re-time</button>
                )}
              </span>
            )}
            {editing?.id === e.id && (
              <div className="edit-box" role="group" aria-label={editing.mode === 'void' ? 'Void this entry' : 'Re-time this entry'}>
                {editing.mode === 'void' ? (
                  <>
                    <label htmlFor="void-reason">Why is it wrong?</label>
                    <input id="void-reason" value={reason} onChange={(ev) => setReason(ev.target.value)} onKeyDown={(ev) => ev.key === 'Enter' && doVoid()} placeholder="e.g. wrong drug entered" autoFocus />
                    <div className="row">
                      <button type="button" className="primary" onClick={doVoid} data-testid="confirm-void">Void entry</button>
                      <button type="button" onClick={close}>Cancel</button>
                    </div>
                  </>
                ) : (
                  <>
                    <p className="small">It happened earlier: pick how long ago, or type the time.</p>
                    <div className="row">
                      {[1, 2, 5, 10].map((m) => (
                        <button key={m} type="button" onClick={() => doRetime(nowMs - m * 60_000)}>{m} min ago</button>
                      ))}
                    </div>
                    <label htmlFor="retime-at">Time (HH:MM:SS)</label>
                    <input id="retime-at" value={time} onChange={(ev) => setTime(ev.target.value)} placeholder="09:41:30" />
                    <label htmlFor="retime-reason">Reason (optional)</label>
                    <input id="retime-reason" value={reason} onChange={(ev) => setReason(ev.target.value)} />
                    <div className="row">
                      <button type="button" className="primary" onClick={retimeTyped}>Set time</button>
                      <button type="button" onClick={close}>Cancel</button>
                    </div>
                  </>
                )}
                {error && <p className="error" role="alert">{error}</p>}
              </div>
            )}
          </li>
        ))}
        {entries.length === 0 && <li className="muted">Nothing recorded yet.</li>}
      </ul>
    </div>
  );
}
