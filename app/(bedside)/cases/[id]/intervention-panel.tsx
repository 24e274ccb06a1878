'use client';
import { useState } from 'react';
import { INTERVENTION_KINDS, INTERVENTION_LABEL, INTERVENTION_LEVEL, LEVELS } from '@/lib/domain/intervention';
import { LEVEL_LABEL } from '@/lib/domain/ruleLabel';
import type { Submit } from './shared';

/** Large buttons, time-stamped on tap; an optional note goes with the next tap. */
export function InterventionPanel({ submit, disabled }: { submit: Submit; disabled: boolean }) {
  const [note, setNote] = useState('');
  const [flash, setFlash] = useState<string | null>(null);
  const tap = async (kind: string) => {
    await submit({ type: 'intervention', kind, ...(note.trim() ? { note: note.trim() } : {}) });
    setFlash(`${INTERVENTION_LABEL[kind as keyof typeof INTERVENTION_LABEL]} recorded`);
    setNote('');
    setTimeout(() => setFlash(null), 2500);
  };
  return (
    <div data-testid="intervention-panel">
      <label htmlFor="iv-note">Note for the next intervention (optional)</label>
      <input id="iv-note" value={note} maxLength={500} onChange={(e) => setNote(e.target.value)} placeholder="e.g. with 4 L/min O2" />
      {LEVELS.filter((l) => l !== 'observed').map((level) => (
        <div key={level}>
          <h3 className="muted small">{LEVEL_LABEL[level]}</h3>
          <div className="iv-grid">
            {INTERVENTION_KINDS.filter((k) => INTERVENTION_LEVEL[k] === level).map((k) => (
              <button key={k} type="button" className={`iv iv-${level}`} onClick={() => tap(k)} disabled={disabled}>
                {INTERVENTION_LABEL[k]}
              </button>
            ))}
          </div>
        </div>
      ))}
      {flash && <p className="ok" role="status">{flash}</p>}
    </div>
  );
}
