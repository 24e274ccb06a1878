'use client';
import { useState } from 'react';
import type { CaseSheetData } from '@/lib/db/caseSheet';
import { ASA_CLASSES, ASA_MEANING, DEPTHS, DEPTH_LABEL } from '@/lib/domain/caseFacts';

type Facts = CaseSheetData['case'];
const FIELDS = ['weightKg', 'heightCm', 'asaClass', 'asaEmergency', 'airwayClass', 'allergies', 'plannedDepth', 'reachedDepth', 'baselineSpo2', 'oxygenDelivery'] as const;
type Field = (typeof FIELDS)[number];

/**
 * Edit case facts. The form remembers what each field was when it opened; the server refuses a
 * field someone else changed meanwhile, by name, and nothing is overwritten silently.
 */
export function FactsPanel({ facts, onSaved, disabled }: { facts: Facts; onSaved: () => void; disabled: boolean }) {
  const seen = Object.fromEntries(FIELDS.map((f) => [f, facts[f]])) as Record<Field, unknown>;
  const [seenAtOpen, setSeen] = useState(seen);
  const [draft, setDraft] = useState<Record<Field, unknown>>(seen);
  const [error, setError] = useState<string | null>(null);
  const [saved, setSaved] = useState(false);
  const set = (f: Field, v: unknown) => {
    setSaved(false);
    setDraft({ ...draft, [f]: v });
  };
  const num = (s: string) => (s.trim() === '' ? null : Number(s));
  const save = async () => {
    const changes = Object.fromEntries(FIELDS.filter((f) => draft[f] !== seenAtOpen[f]).map((f) => [f, { from: seenAtOpen[f], to: draft[f] }]));
    if (Object.keys(changes).length === 0) return setError('Nothing changed.');
    const r = await fetch(`/api/v1/cases/${encodeURIComponent(facts.id)}`, { method: 'PATCH', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ changes }) });
    if (!r.ok) {
      setError(((await r.json().catch(() => ({}))) as { error?: string }).error ?? `not saved (${r.status})`);
      return;
    }
    setError(null);
    setSaved(true);
    setSeen(draft);
    onSaved();
  };
  const reload = () => {
    setSeen(seen);
    setDraft(seen);
    setError(null);
  };
  return (
    <div data-testid="facts-panel">
      <div className="vitals-grid">
        <div><label htmlFor="f-wt">Weight (kg)</label><input id="f-wt" inputMode="decimal" value={(draft.weightKg as number | null) ?? ''} onChange={(e) => set('weightKg', num(e.target.value))} /></div>
        <div><label htmlFor="f-ht">Height (cm)</label><input id="f-ht" inputMode="decimal" value={(draft.heightCm as number | null) ?? ''} onChange={(e) => set('heightCm', num(e.target.value))} /></div>
        <div>
          <label htmlFor="f-asa">ASA class</label>
          <select id="f-asa" value={(draft.asaClass as string | null) ?? ''} onChange={(e) => set('asaClass', e.target.value || null)}>
            <option value="">not recorded</option>
            {ASA_CLASSES.map((c) => <option key={c} value={c} title={ASA_MEANING[c]}>{c} — {ASA_MEANING[c]}</option>)}
          </select>
        </div>
        <div>
          <label htmlFor="f-asae">Emergency (E)</label>
          <select id="f-asae" value={draft.asaEmergency ? 'yes' : 'no'} onChange={(e) => set('asaEmergency', e.target.value === 'yes')}>
            <option value="no">no</option>
            <option value="yes">yes</option>
          </select>
        </div>
        <div>
          <label htmlFor="f-air">Airway (Mallampati)</label>
          <select id="f-air" value={(draft.airwayClass as string | null) ?? ''} onChange={(e) => set('airwayClass', e.target.value || null)}>
            <option value="">not recorded</option>
            {['I', 'II', 'III', 'IV'].map((c) => <option key={c}>{c}</option>)}
          </select>
        </div>
        <div><label htmlFor="f-spo2">Baseline SpO2 (%)</label><input id="f-spo2" inputMode="decimal" value={(draft.baselineSpo2 as number | null) ?? ''} onChange={(e) => set('baselineSpo2', num(e.target.value))} /></div>
        <div>
          <label htmlFor="f-plan">Planned depth</label>
          <select id="f-plan" value={draft.plannedDepth as string} onChange={(e) => set('plannedDepth', e.target.value)}>
            {DEPTHS.map((d) => <option key={d} value={d}>{DEPTH_LABEL[d]}</option>)}
          </select>
        </div>
        <div>
          <label htmlFor="f-reach">Depth reached</label>
          <select id="f-reach" value={(draft.reachedDepth as string | null) ?? ''} onChange={(e) => set('reachedDepth', e.target.value || null)}>
            <option value="">not recorded</option>
            {DEPTHS.map((d) => <option key={d} value={d}>{DEPTH_LABEL[d]}</option>)}
          </select>
        </div>
      </div>
      <label htmlFor="f-o2">Oxygen delivery</label>
      <input id="f-o2" value={(draft.oxygenDelivery as string | null) ?? ''} onChange={(e) => set('oxygenDelivery', e.target.value || null)} />
      <label htmlFor="f-all">Allergies</label>
      <input id="f-all" value={(draft.allergies as string | null) ?? ''} onChange={(e) => set('allergies', e.target.value || null)} />
      {error && (
        <p className="error" role="alert">
          {error} {/changed by someone else/.test(error) && <button type="button" onClick={reload}>Load their values</button>}
        </p>
      )}
      {saved && <p className="ok" role="status">Saved.</p>}
      <button type="button" className="primary big" onClick={save} disabled={disabled} data-testid="save-facts">Save facts</button>
    </div>
  );
}
