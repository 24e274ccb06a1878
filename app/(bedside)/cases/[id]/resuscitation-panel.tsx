'use client';
import { useState } from 'react';
import type { ResuscitationAnalysis } from '@/lib/rules/resuscitation';
import { PLATEAU_RESUSCITATION_V1 } from '@/lib/rules/resuscitation';
import type { Submit } from './shared';
import { clock } from './shared';

const mmss = (s: number) => `${String(Math.floor(s / 60)).padStart(2, '0')}:${String(Math.floor(s % 60)).padStart(2, '0')}`;
const BAND_TEXT = { good: `above ${PLATEAU_RESUSCITATION_V1.targets.goodMmHg}`, minimum: `${PLATEAU_RESUSCITATION_V1.targets.minimumMmHg}–${PLATEAU_RESUSCITATION_V1.targets.goodMmHg}`, below_minimum: `below ${PLATEAU_RESUSCITATION_V1.targets.minimumMmHg}`, no_data: 'no EtCO2' } as const;

/**
 * The resuscitation view: a running clock of compression time, one-tap entries, per-minute EtCO2
 * against the usual targets, and the fatigue and possible-return-of-circulation prompts.
 */
export function ResuscitationPanel({ r, submit, disabled, startMs, timeZone, epinephrineId, etco2Unit }: { r: ResuscitationAnalysis; submit: Submit; disabled: boolean; startMs: number; timeZone: string; epinephrineId: string | null; etco2Unit: 'mmHg' | 'kPa' }) {
  const [note, setNote] = useState('');
  const paused = !r.active && r.periods[r.periods.length - 1]?.endedBy === 'paused';
  const ev = (kind: string, extra: Record<string, unknown> = {}) => submit({ type: 'event', kind, ...extra });
  const show = (mmHg: number | null) => (mmHg === null ? '–' : etco2Unit === 'kPa' ? (mmHg / 7.50062).toFixed(1) : String(mmHg));
  return (
    <div className="resus" data-testid="resus-panel">
      <div className="resus-clock" aria-live="off">
        <span className="label">{r.active ? 'Compressions' : paused ? 'Compressions paused' : 'Compressions ended'}</span>
        <span className="big-number" data-testid="compression-clock">{mmss(r.compressionS)}</span>
      </div>
      {r.possibleRoscFlags.length > 0 && (
        <p className="warn-line" role="alert" data-testid="rosc-flag">
          Abrupt, sustained rise of EtCO2 at {clock(startMs + r.possibleRoscFlags[r.possibleRoscFlags.length - 1].t * 1000, timeZone, true)}: check for a pulse. This does not show that circulation has returned.
        </p>
      )}
      {r.fatigueFlags.length > 0 && (
        <p className="warn-line" role="alert" data-testid="fatigue-flag">
          EtCO2 has fallen over consecutive minutes of compressions (to {show(r.fatigueFlags[r.fatigueFlags.length - 1].toMmHg)} {etco2Unit}): the compressor may need changing.
        </p>
      )}
      <div className="iv-grid">
        {r.active ? (
          <button type="button" onClick={() => ev('compressions_paused')} disabled={disabled}>Pause compressions</button>
        ) : (
          <button type="button" className="primary" onClick={() => ev('compressions_resumed')} disabled={disabled}>Resume compressions</button>
        )}
        <button type="button" onClick={() => ev('rhythm_check')} disabled={disabled}>Rhythm check</button>
        <button type="button" className="iv-rescued" onClick={() => ev('shock')} disabled={disabled} data-testid="resus-shock">Shock delivered</button>
        <button type="button" onClick={() => epinephrineId && submit({ type: 'dose', drugId: epinephrineId, amount: 1, unit: 'mg', route: 'IV' })} disabled={disabled || !epinephrineId} data-testid="resus-epinephrine">
          Epinephrine 1 mg IV
        </button>
        <button type="button" onClick={() => ev('airway_placed')} disabled={disabled}>Airway placed</button>
        <button type="button" className="primary" onClick={() => ev('rosc')} disabled={disabled} data-testid="resus-rosc">Return of circulation</button>
        <button type="button" onClick={() => ev('compressions_stopped')} disabled={disabled}>Stop compressions</button>
      </div>
      <label htmlFor="team-note">Team note</label>
      <div className="row">
        <input id="team-note" value={note} onChange={(e) => setNote(e.target.value)} maxLength={500} onKeyDown={(e) => e.key === 'Enter' && note.trim() && (ev('team_note', { note: note.trim() }), setNote(''))} />
        <button type="button" onClick={() => { if (note.trim()) { ev('team_note', { note: note.trim() }); setNote(''); } }} disabled={disabled}>Add</button>
      </div>
      <h3>EtCO2 per minute of compressions</h3>
      <p className="small muted">Targets: at least {PLATEAU_RESUSCITATION_V1.targets.minimumMmHg} mmHg, ideally above {PLATEAU_RESUSCITATION_V1.targets.goodMmHg} mmHg (common practice in resuscitation guidelines).</p>
      <ul className="minutes plain" data-testid="resus-minutes">
        {r.minutes.map((m) => (
          <li key={m.minute} className={`band-${m.band}`}>
            min {m.minute}: <strong>{show(m.medianMmHg)}</strong> {m.medianMmHg !== null && etco2Unit} <span className="muted small">({BAND_TEXT[m.band]})</span>
          </li>
        ))}
      </ul>
      <h3>Timeline</h3>
      <ul className="plain" data-testid="resus-timeline">
        {r.timeline.map((x, i) => (
          <li key={i}>
            {clock(startMs + x.t * 1000, timeZone, true)} · {x.label}
            {x.note ? ` — ${x.note}` : ''}
          </li>
        ))}
      </ul>
    </div>
  );
}
