'use client';
import { useEffect, useMemo, useState } from 'react';
import type { CaseSheetData } from '@/lib/db/caseSheet';
import { doseCaution } from '@/lib/domain/doseTotals';
import { drugTotals } from '@/lib/note/drugTotals';
import { formatDoseAmount, formatPerKg } from '@/lib/note/format';
import type { DoseUnit, DrugClass } from '@/lib/domain/drug';
import type { Submit } from './shared';

type Drug = CaseSheetData['drugs'][number];

/** One tap for the drug, a keypad with the last amount offered, unit and route defaulted. */
export function DosePanel({ sheet, doses, submit, disabled }: { sheet: CaseSheetData; doses: { drug: string; drugId: string | null; amount: number; unit: string; voided: unknown }[]; submit: Submit; disabled: boolean }) {
  const [drugId, setDrugId] = useState<string | null>(null);
  const [amount, setAmount] = useState('');
  const [route, setRoute] = useState('IV');
  const [flash, setFlash] = useState<string | null>(null);
  const drug: Drug | undefined = sheet.drugs.find((d) => d.id === drugId);

  const lastAmount = (d: Drug) => {
    const last = [...doses].reverse().find((x) => x.drugId === d.id && !x.voided);
    return last ? String(last.amount) : d.usualDose != null ? String(d.usualDose) : '';
  };
  const pick = (d: Drug) => {
    setDrugId(d.id);
    setAmount(lastAmount(d));
    setRoute(d.defaultRoute);
  };

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (disabled || (e.target as HTMLElement)?.closest('input, textarea, select')) return;
      const n = Number(e.key);
      if (Number.isInteger(n) && n >= 1 && n <= 9 && !drug && sheet.drugs[n - 1]) pick(sheet.drugs[n - 1]);
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  });

  const value = Number(amount);
  const valid = amount !== '' && Number.isFinite(value) && value > 0;
  const caution = drug && valid && doseCaution(value, drug);
  // The same totals the signed note will print (lib/note): voided doses left out.
  const totals = useMemo(() => {
    const drugs = Object.fromEntries(sheet.drugs.map((d) => [d.name, { label: d.name.charAt(0).toUpperCase() + d.name.slice(1), drugClass: d.drugClass as DrugClass }]));
    const live = doses.filter((d) => !d.voided).map((d, i) => ({ t: i, drug: d.drug, amount: d.amount, unit: d.unit as DoseUnit, route: 'IV' }));
    return drugTotals(live, sheet.case.weightKg, { drugs });
  }, [doses, sheet.case.weightKg, sheet.drugs]);
  const key = (k: string) => setAmount((a) => (k === '⌫' ? a.slice(0, -1) : k === '.' && a.includes('.') ? a : (a + k).replace(/^0(\d)/, '$1').slice(0, 8)));

  const record = async () => {
    if (!drug || !valid) return;
    await submit({ type: 'dose', drugId: drug.id, amount: value, unit: drug.defaultUnit, route });
    setFlash(`${drug.name} ${value} ${drug.defaultUnit} recorded`);
    setDrugId(null);
    setTimeout(() => setFlash(null), 2500);
  };

  return (
    <div className="dose-panel" data-testid="dose-panel">
      <div className="drug-grid" role="group" aria-label="Drug">
        {sheet.drugs.map((d, i) => (
          <button key={d.id} type="button" className={d.id === drugId ? 'primary' : undefined} onClick={() => pick(d)} disabled={disabled} aria-pressed={d.id === drugId} aria-keyshortcuts={i < 9 ? String(i + 1) : undefined}>
            <span className="drug-name">{d.name}</span>
            <span className="muted small">{d.defaultUnit}{i < 9 ? ` · ${i + 1}` : ''}</span>
          </button>
        ))}
      </div>
      {drug && (
        <div className="keypad-wrap">
          <label htmlFor="dose-amount">
            {drug.name} amount ({drug.defaultUnit}){drug.concentration ? ` · ${drug.concentration}` : ''}
          </label>
          <div className="amount-row">
            <input id="dose-amount" inputMode="decimal" value={amount} onChange={(e) => setAmount(e.target.value.replace(/[^0-9.]/g, ''))} onKeyDown={(e) => e.key === 'Enter' && record()} aria-describedby={caution ? 'dose-caution' : undefined} autoFocus />
            <span className="unit">{drug.defaultUnit}</span>
            <select aria-label="Route" value={route} onChange={(e) => setRoute(e.target.value)}>
              {['IV', 'IM', 'IN', 'PO', 'SC'].map((r) => (
                <option key={r}>{r}</option>
              ))}
            </select>
          </div>
          <div className="keypad" role="group" aria-label="Keypad">
            {['7', '8', '9', '4', '5', '6', '1', '2', '3', '0', '.', '⌫'].map((k) => (
              <button key={k} type="button" onClick={() => key(k)} aria-label={k === '⌫' ? 'Delete last digit' : k}>
                {k}
              </button>
            ))}
          </div>
          {caution && (
            <p id="dose-caution" className="warn-line" role="status">
              {value} {drug.defaultUnit} is far above this unit&apos;s usual single dose of {drug.name} (above {drug.cautionAbove} {drug.defaultUnit}). Check before recording; Plateau does not block it.
            </p>
          )}
          <div className="row">
            <button type="button" className="primary big" onClick={record} disabled={!valid || disabled} data-testid="record-dose">
              Record {valid ? `${value} ${drug.defaultUnit}` : ''} {drug.name}
            </button>
            <button type="button" onClick={() => setDrugId(null)}>Cancel</button>
          </div>
        </div>
      )}
      {flash && <p className="ok" role="status">{flash}</p>}
      <h3>Totals</h3>
      <table data-testid="dose-totals">
        <thead>
          <tr><th>Drug</th><th>Total</th><th>Per kg</th><th>Doses</th></tr>
        </thead>
        <tbody>
          {totals.map((t) => (
            <tr key={`${t.drug}-${t.unit}`}>
              <td>{t.label}</td>
              <td>{formatDoseAmount(t.total, t.unit)}</td>
              <td>{t.perKg === null ? <span className="muted">{sheet.case.weightKg ? '–' : 'no weight'}</span> : formatPerKg(t.perKg.value, t.perKg.unit)}</td>
              <td>{t.doseCount}</td>
            </tr>
          ))}
          {totals.length === 0 && (
            <tr><td colSpan={4} className="muted">No doses yet.</td></tr>
          )}
        </tbody>
      </table>
    </div>
  );
}
