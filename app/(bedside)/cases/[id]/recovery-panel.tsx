'use client';
import { useState } from 'react';
import { ALDRETE_DISCHARGE_MIN, ALDRETE_ITEMS, ALDRETE_SPECS, aldreteTotal, meetsDischarge, type AldreteItems } from '@/lib/domain/aldrete';
import type { Submit } from './shared';
import { clock } from './shared';

/** Modified Aldrete score (Aldrete 1995): five items 0–2; discharge criterion ≥ 9. */
export function RecoveryPanel({ scores, submit, timeZone, disabled }: { scores: { id: string; at: string; total: number; voided: unknown; waiting: boolean }[]; submit: Submit; timeZone: string; disabled: boolean }) {
  const [items, setItems] = useState<Partial<AldreteItems>>({});
  const complete = ALDRETE_ITEMS.every((k) => items[k] !== undefined);
  const total = complete ? aldreteTotal(items as AldreteItems) : null;
  const save = async () => {
    if (!complete) return;
    await submit({ type: 'recovery', ...(items as AldreteItems) });
    setItems({});
  };
  return (
    <div data-testid="recovery-panel">
      {ALDRETE_ITEMS.map((k) => (
        <fieldset key={k} className="aldrete-item">
          <legend>{ALDRETE_SPECS[k].label}</legend>
          {ALDRETE_SPECS[k].levels.map((text, level) => (
            <button key={level} type="button" className={items[k] === level ? 'primary' : undefined} aria-pressed={items[k] === level} onClick={() => setItems({ ...items, [k]: level })} data-testid={`aldrete-${k}-${level}`}>
              <strong>{level}</strong> {text}
            </button>
          ))}
        </fieldset>
      ))}
      <p>
        Total: <strong data-testid="aldrete-total">{total ?? '–'}</strong> / 10{' '}
        {total !== null && (meetsDischarge(total) ? <span className="ok">meets the discharge criterion (≥ {ALDRETE_DISCHARGE_MIN})</span> : <span className="warn-text">below the discharge criterion (≥ {ALDRETE_DISCHARGE_MIN})</span>)}
      </p>
      <button type="button" className="primary big" disabled={!complete || disabled} onClick={save} data-testid="record-aldrete">
        Record score
      </button>
      <h3>Scores</h3>
      <ul className="plain">
        {scores.filter((s) => !s.voided).map((s) => (
          <li key={s.id}>
            {clock(s.at, timeZone)} · {s.total}/10 {s.waiting && <span className="muted">(waiting)</span>}
          </li>
        ))}
        {scores.length === 0 && <li className="muted">None yet.</li>}
      </ul>
    </div>
  );
}
