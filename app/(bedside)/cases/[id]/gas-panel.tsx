'use client';
import { useState } from 'react';
import type { Co2GapResult } from '@/lib/rules/co2Gap';
import { CO2_GAP_USUAL_MAX_MMHG } from '@/lib/rules/co2Gap';
import type { Submit } from './shared';
import { clock } from './shared';

/** Blood gases and the PaCO2 − EtCO2 gap (paired with the EtCO2 of the minute around each gas). */
export function GasPanel({ gaps, submit, disabled, startMs, timeZone }: { gaps: Co2GapResult[]; submit: Submit; disabled: boolean; startMs: number; timeZone: string }) {
  const [v, setV] = useState({ paco2: '', unit: 'mmHg', ph: '', pao2: '', fio2: '', sampleType: 'arterial' });
  const [error, setError] = useState<string | null>(null);
  const num = (s: string) => (s.trim() === '' ? null : Number(s));
  const save = async () => {
    const paco2 = num(v.paco2);
    if (paco2 === null || !Number.isFinite(paco2)) return setError('PaCO2: enter a number');
    setError(null);
    await submit({ type: 'blood_gas', paco2, unit: v.unit, ph: num(v.ph), pao2: num(v.pao2), fio2: num(v.fio2), sampleType: v.sampleType });
    setV({ ...v, paco2: '', ph: '', pao2: '', fio2: '' });
  };
  return (
    <div data-testid="gas-panel">
      <div className="vitals-grid">
        <div><label htmlFor="g-paco2">PaCO2</label><input id="g-paco2" inputMode="decimal" value={v.paco2} onChange={(e) => setV({ ...v, paco2: e.target.value })} /></div>
        <div>
          <label htmlFor="g-unit">Unit</label>
          <select id="g-unit" value={v.unit} onChange={(e) => setV({ ...v, unit: e.target.value })}><option>mmHg</option><option>kPa</option></select>
        </div>
        <div><label htmlFor="g-ph">pH</label><input id="g-ph" inputMode="decimal" value={v.ph} onChange={(e) => setV({ ...v, ph: e.target.value })} /></div>
        <div><label htmlFor="g-pao2">PaO2 (mmHg)</label><input id="g-pao2" inputMode="decimal" value={v.pao2} onChange={(e) => setV({ ...v, pao2: e.target.value })} /></div>
        <div><label htmlFor="g-fio2">FiO2 (0.21–1)</label><input id="g-fio2" inputMode="decimal" value={v.fio2} onChange={(e) => setV({ ...v, fio2: e.target.value })} /></div>
        <div>
          <label htmlFor="g-type">Sample</label>
          <select id="g-type" value={v.sampleType} onChange={(e) => setV({ ...v, sampleType: e.target.value })}><option>arterial</option><option>venous</option><option>capillary</option></select>
        </div>
      </div>
      {error && <p className="error" role="alert">{error}</p>}
      <button type="button" className="primary big" onClick={save} disabled={disabled} data-testid="record-gas">Record blood gas (now)</button>
      <h3>PaCO2 − EtCO2 gap</h3>
      <p className="small muted">Usually a few mmHg (Plateau marks more than {CO2_GAP_USUAL_MAX_MMHG} mmHg as wide). A widening gap points to more dead space or less pulmonary perfusion (common practice). EtCO2 is the median of the minute around the gas.</p>
      <table data-testid="gas-table">
        <thead><tr><th>Time</th><th>PaCO2</th><th>EtCO2</th><th>Gap</th><th>Change</th></tr></thead>
        <tbody>
          {gaps.map((g, i) => (
            <tr key={g.id ?? i} className={g.status === 'wide' || g.status === 'negative' ? 'warn-text' : undefined} title={g.message}>
              <td>{clock(startMs + g.t * 1000, timeZone)}</td>
              <td>{g.paco2MmHg} mmHg</td>
              <td>{g.etco2MmHg === null ? 'none nearby' : `${g.etco2MmHg} mmHg`}</td>
              <td>{g.gapMmHg === null ? '–' : `${g.gapMmHg} mmHg`}</td>
              <td>{g.changeMmHg === null ? '' : `${g.changeMmHg > 0 ? '+' : ''}${g.changeMmHg}`}</td>
            </tr>
          ))}
          {gaps.length === 0 && <tr><td colSpan={5} className="muted">No blood gas yet.</td></tr>}
        </tbody>
      </table>
      {gaps.map((g, i) => <p key={i} className="small">{clock(startMs + g.t * 1000, timeZone)}: {g.message}</p>)}
    </div>
  );
}
