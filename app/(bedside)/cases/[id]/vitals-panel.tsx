'use client';
import { useState } from 'react';
import type { Submit } from './shared';

const FIELDS = [
  { key: 'sbp', label: 'BP systolic', unit: 'mmHg' },
  { key: 'dbp', label: 'BP diastolic', unit: 'mmHg' },
  { key: 'hr', label: 'Heart rate', unit: '/min' },
  { key: 'spo2', label: 'SpO2', unit: '%' },
  { key: 'rr', label: 'Resp. rate', unit: '/min' },
  { key: 'etco2', label: 'EtCO2', unit: 'mmHg' },
] as const;

/** MOAA/S (Chernik 1990): 5 responds readily to name … 0 no response to trapezius squeeze. */
const MOAAS = ['0 · no response to squeeze', '1 · responds to squeeze only', '2 · to mild prodding', '3 · to loud or repeated name', '4 · lethargic to normal voice', '5 · responds readily'];

/** Manual readings: BP, HR, SpO2, RR, EtCO2 and a sedation score. */
export function VitalsPanel({ submit, disabled, overdueS }: { submit: Submit; disabled: boolean; overdueS: number | null }) {
  const [vals, setVals] = useState<Record<string, string>>({});
  const [score, setScore] = useState<number | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [flash, setFlash] = useState<string | null>(null);
  const save = async () => {
    const body: Record<string, number | null> = {};
    for (const f of FIELDS) {
      const s = vals[f.key]?.trim();
      if (!s) continue;
      const n = Number(s);
      if (!Number.isFinite(n)) {
        setError(`${f.label}: must be a number`);
        return;
      }
      body[f.key] = n;
    }
    if (score !== null) body.sedationScore = score;
    if (Object.keys(body).length === 0) {
      setError('Enter at least one reading.');
      return;
    }
    if (body.sbp != null && body.dbp != null && body.sbp <= body.dbp) {
      setError('BP: systolic must be above diastolic.');
      return;
    }
    setError(null);
    await submit({ type: 'vital', ...body });
    setVals({});
    setScore(null);
    setFlash('Readings recorded');
    setTimeout(() => setFlash(null), 2500);
  };
  return (
    <div data-testid="vitals-panel">
      {overdueS !== null && (
        <p className="warn-line" role="status" data-testid="vitals-reminder">
          Last manual BP/HR is more than 5 minutes old ({Math.floor(overdueS / 60) + 5} min): record a set of readings (common practice in sedation guidelines).
        </p>
      )}
      <div className="vitals-grid">
        {FIELDS.map((f) => (
          <div key={f.key}>
            <label htmlFor={`v-${f.key}`}>
              {f.label} <span className="muted small">{f.unit}</span>
            </label>
            <input id={`v-${f.key}`} inputMode="decimal" value={vals[f.key] ?? ''} onChange={(e) => setVals({ ...vals, [f.key]: e.target.value })} onKeyDown={(e) => e.key === 'Enter' && save()} />
          </div>
        ))}
      </div>
      <fieldset className="moaas">
        <legend>Sedation score (MOAA/S)</legend>
        {MOAAS.map((label, i) => (
          <button key={i} type="button" className={score === i ? 'primary' : undefined} aria-pressed={score === i} onClick={() => setScore(score === i ? null : i)}>
            {label}
          </button>
        ))}
      </fieldset>
      {error && <p className="error" role="alert">{error}</p>}
      <button type="button" className="primary big" onClick={save} disabled={disabled} data-testid="record-vitals">
        Record readings
      </button>
      {flash && <p className="ok" role="status">{flash}</p>}
    </div>
  );
}
