'use client';
import { useState } from 'react';

/** Choose the rule set the unit's screens and reports use; every case's summary is recomputed. */
export function RuleSetForm({ options, active }: { options: { id: string; version: number; description: string }[]; active: { id: string; version: number } }) {
  const [value, setValue] = useState(`${active.id}@${active.version}`);
  const [state, setState] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const save = async () => {
    const [ruleSetId, version] = value.split('@');
    setBusy(true);
    setState('Recomputing every case’s analysis… this can take a minute.');
    const r = await fetch('/api/v1/admin/rule-set', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ ruleSetId, version: Number(version) }) });
    const j = (await r.json().catch(() => ({}))) as { recomputed?: number; error?: string };
    setBusy(false);
    setState(r.ok ? `Now using ${ruleSetId} v${version}; ${j.recomputed} cases brought up to date.` : (j.error ?? `not saved (${r.status})`));
  };
  return (
    <div className="panel" style={{ maxWidth: 640 }}>
      <h2>Rule set in use</h2>
      <label htmlFor="rs">Rule set</label>
      <select id="rs" value={value} onChange={(e) => setValue(e.target.value)}>
        {options.map((o) => (
          <option key={`${o.id}@${o.version}`} value={`${o.id}@${o.version}`}>{o.id} v{o.version} — {o.description}</option>
        ))}
      </select>
      <p className="small muted">Signed notes keep the rule set they were signed with; the review and indicators use the one chosen here.</p>
      <button className="primary" type="button" onClick={save} disabled={busy}>Use this rule set</button>
      {state && <p role="status">{state}</p>}
    </div>
  );
}
