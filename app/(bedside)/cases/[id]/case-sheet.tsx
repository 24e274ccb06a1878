'use client';
import { useEffect, useMemo, useState } from 'react';
import type { CaseSheetData } from '@/lib/db/caseSheet';
import { INTERVENTION_LABEL, type InterventionKind } from '@/lib/domain/intervention';
import { DEPTH_LABEL, DEPTH_MEANING, PROCEDURE_LABEL, STATUS_LABEL, bmi, type Depth } from '@/lib/domain/caseFacts';
import { vitalsOverdue } from '@/lib/domain/doseTotals';
import { useCaseSheet } from './use-case-sheet';
import { TrendChart, type ChartMarker } from './trend-chart';
import { EpisodePanel } from './episode-panel';
import { DosePanel } from './dose-panel';
import { VitalsPanel } from './vitals-panel';
import { InterventionPanel } from './intervention-panel';
import { MarkerPanel, MARKERS } from './marker-panel';
import { RecoveryPanel } from './recovery-panel';
import { HistoryPanel } from './history-panel';
import { ImportPanel } from './import-panel';
import { FactsPanel } from './facts-panel';
import { ResuscitationPanel } from './resuscitation-panel';
import { GasPanel } from './gas-panel';
import { analyzeResuscitation, PLATEAU_RESUSCITATION_V1 } from '@/lib/rules/resuscitation';
import { co2Gaps } from '@/lib/rules/co2Gap';
import type { CaseRecord } from '@/lib/domain/caseRecord';
import { clock, mergeWaiting, pendingVoids, secs, type ViewEntry } from './shared';

const TABS = [
  { id: 'doses', label: 'Doses', key: 'd' },
  { id: 'vitals', label: 'Readings', key: 'v' },
  { id: 'interventions', label: 'Interventions', key: 'i' },
  { id: 'markers', label: 'Times', key: 't' },
  { id: 'recovery', label: 'Recovery', key: 'r' },
  { id: 'history', label: 'History', key: 'h' },
  { id: 'import', label: 'Import', key: 'u' },
  { id: 'facts', label: 'Facts', key: 'f' },
  { id: 'gas', label: 'Blood gas', key: 'g' },
] as const;
type Tab = (typeof TABS)[number]['id'];

const CURRENT = [
  { ch: 'etco2', label: 'EtCO2', cls: 'ch-etco2' },
  { ch: 'rr', label: 'RR', cls: 'ch-rr' },
  { ch: 'spo2', label: 'SpO2', cls: 'ch-spo2' },
  { ch: 'hr', label: 'HR', cls: 'ch-hr' },
] as const;

export function CaseSheet({ initial, canWrite }: { initial: CaseSheetData; canWrite: boolean }) {
  const { sheet, samples, sampleRev, outbox, online, submit, dismiss, clockSkewMs, refresh } = useCaseSheet(initial);
  const [tab, setTab] = useState<Tab>('doses');
  const [nowMs, setNow] = useState(() => Date.now());
  const [showDepth, setShowDepth] = useState(false);
  const [tabsOverride, setTabsOverride] = useState(false);
  const tz = sheet.case.unit.timeZone;
  const startMs = new Date(sheet.case.startAt).getTime();
  const signed = sheet.case.status === 'signed';
  const disabled = !canWrite || signed;

  useEffect(() => {
    const t = setInterval(() => setNow(Date.now() + clockSkewMs), 1000);
    return () => clearInterval(t);
  }, [clockSkewMs]);

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (e.ctrlKey || e.metaKey || e.altKey || (e.target as HTMLElement)?.closest('input, textarea, select')) return;
      const t = TABS.find((x) => x.key === e.key.toLowerCase());
      if (t) {
        setTab(t.id);
        e.preventDefault();
      }
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, []);

  const voidWaiting = pendingVoids(outbox);
  const doses = mergeWaiting(sheet.doses, outbox, 'dose', (b) => {
    const d = sheet.drugs.find((x) => x.id === b.drugId);
    return { id: b.id, at: b.at, by: null, createdAt: b.at, voided: null, replacesId: null, drugId: String(b.drugId), drug: d?.name ?? String(b.drugId), amount: Number(b.amount), unit: String(b.unit), route: String(b.route) };
  });
  const interventions = mergeWaiting(sheet.interventions, outbox, 'intervention', (b) => ({ id: b.id, at: b.at, by: null, createdAt: b.at, voided: null, replacesId: null, kind: String(b.kind), note: (b.note as string) ?? null }));
  const events = mergeWaiting(sheet.events, outbox, 'event', (b) => ({ id: b.id, at: b.at, by: null, createdAt: b.at, voided: null, replacesId: null, kind: String(b.kind), note: (b.note as string) ?? null }));
  const vitals = mergeWaiting(sheet.vitals, outbox, 'vital', (b) => ({ id: b.id, at: b.at, by: null, createdAt: b.at, voided: null, replacesId: null, sbp: (b.sbp as number) ?? null, dbp: (b.dbp as number) ?? null, hr: (b.hr as number) ?? null, spo2: (b.spo2 as number) ?? null, rr: (b.rr as number) ?? null, etco2: (b.etco2 as number) ?? null, sedationScore: (b.sedationScore as number) ?? null }));
  const recovery = mergeWaiting(sheet.recovery, outbox, 'recovery', (b) => ({ id: b.id, at: b.at, by: null, createdAt: b.at, voided: null, replacesId: null, activity: Number(b.activity), respiration: Number(b.respiration), circulation: Number(b.circulation), consciousness: Number(b.consciousness), oxygenation: Number(b.oxygenation), total: ['activity', 'respiration', 'circulation', 'consciousness', 'oxygenation'].reduce((s, k) => s + Number(b[k]), 0) }));

  const view: ViewEntry[] = [
    ...doses.map((d) => ({ id: d.id, type: 'dose' as const, atMs: Date.parse(d.at), text: `${d.drug} ${d.amount} ${d.unit} ${d.route}`, by: d.by, waiting: d.waiting, voided: d.voided, voidWaiting: voidWaiting.has(d.id), raw: d })),
    ...interventions.map((i) => ({ id: i.id, type: 'intervention' as const, atMs: Date.parse(i.at), text: `${INTERVENTION_LABEL[i.kind as InterventionKind] ?? i.kind}${i.note ? ` — ${i.note}` : ''}`, by: i.by, waiting: i.waiting, voided: i.voided, voidWaiting: voidWaiting.has(i.id), raw: i })),
    ...events.map((e) => ({ id: e.id, type: 'event' as const, atMs: Date.parse(e.at), text: MARKERS.find((m) => m.kind === e.kind)?.label ?? e.kind, by: e.by, waiting: e.waiting, voided: e.voided, voidWaiting: voidWaiting.has(e.id), raw: e })),
    ...vitals.map((v) => ({ id: v.id, type: 'vital' as const, atMs: Date.parse(v.at), text: vitalText(v), by: v.by, waiting: v.waiting, voided: v.voided, voidWaiting: voidWaiting.has(v.id), raw: v })),
    ...recovery.map((r) => ({ id: r.id, type: 'recovery' as const, atMs: Date.parse(r.at), text: `Aldrete ${r.total}/10`, by: r.by, waiting: r.waiting, voided: r.voided, voidWaiting: voidWaiting.has(r.id), raw: r })),
  ];

  const markers: ChartMarker[] = useMemo(
    () => [
      ...doses.filter((d) => !d.voided).map((d) => ({ t: secs(sheet, d.at), label: `${d.drug} ${d.amount}`, kind: 'dose' as const })),
      ...interventions.filter((i) => !i.voided).map((i) => ({ t: secs(sheet, i.at), label: INTERVENTION_LABEL[i.kind as InterventionKind] ?? i.kind, kind: 'intervention' as const })),
      ...events.filter((e) => !e.voided).map((e) => ({ t: secs(sheet, e.at), label: MARKERS.find((m) => m.kind === e.kind)?.label ?? e.kind, kind: 'event' as const })),
    ],
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [sheet, outbox],
  );

  const nowS = (nowMs - startMs) / 1000;
  // The resuscitation view and the CO2 gap are computed here from what the sheet shows.
  const co2 = samples.etco2 ?? { t: [], v: [] };
  const live = <T extends { voided: unknown }>(xs: T[]) => xs.filter((x) => !x.voided);
  const miniRecord: CaseRecord = {
    case: { start: sheet.case.startAt, etco2Unit: 'mmHg' },
    series: [{ channel: 'etco2', unit: 'mmHg', source: 'monitor', t: co2.t, v: co2.v }],
    doses: live(doses).map((d) => ({ t: secs(sheet, d.at), drug: d.drug, amount: d.amount, unit: d.unit as 'mg', route: d.route })),
    interventions: live(interventions).map((i) => ({ t: secs(sheet, i.at), kind: i.kind as never, ...(i.note ? { note: i.note } : {}) })),
    events: live(events).map((e) => ({ t: secs(sheet, e.at), kind: e.kind as never, ...(e.note ? { note: e.note } : {}) })),
  };
  const resus = analyzeResuscitation(miniRecord, PLATEAU_RESUSCITATION_V1, { nowS });
  const resusOpen = !!resus && (resus.active || resus.periods[resus.periods.length - 1]?.endedBy === 'paused');
  const [showTabs, setShowTabs] = [tabsOverride, setTabsOverride];
  const gases = sheet.bloodGases.filter((g) => !g.voided);
  const gaps = co2Gaps(miniRecord, gases.map((g) => ({ id: g.id, t: secs(sheet, g.at), paco2MmHg: g.paco2, sampleType: g.sampleType as 'arterial' })));
  const sedStart = events.find((e) => e.kind === 'sedation_start' && !e.voided);
  const sedEnd = events.find((e) => (e.kind === 'recovery_start' || e.kind === 'sedation_end') && !e.voided);
  const lastBp = [...vitals].filter((v) => !v.voided && (v.sbp !== null || v.hr !== null)).sort((a, b) => Date.parse(b.at) - Date.parse(a.at))[0];
  const overdue = vitalsOverdue({ nowS, lastReadingS: lastBp ? secs(sheet, lastBp.at) : null, sedationStartS: sedStart ? secs(sheet, sedStart.at) : null, sedationEndS: sedEnd ? secs(sheet, sedEnd.at) : null, depth: sheet.case.plannedDepth, intervalMin: sheet.case.unit.vitalsReminderMin });

  const waiting = outbox.filter((o) => !o.refused).length;
  const refused = outbox.filter((o) => o.refused);
  const p = sheet.case.patient;
  const baseline = sheet.analysis?.baseline;
  void sampleRev;

  return (
    <div className="sheet">
      <header className="sheet-head panel">
        <div>
          <h1>
            {p.familyName.toUpperCase()}, {p.givenName} <span className="muted">{p.mrn}</span>
          </h1>
          <p className="muted">
            {PROCEDURE_LABEL[sheet.case.procedureType] ?? sheet.case.procedureType} · {sheet.case.room ?? 'no room'} · {sheet.case.proceduralist ?? 'proceduralist not set'} · ASA {sheet.case.asaClass ?? '?'}
            {sheet.case.asaEmergency ? 'E' : ''} · {sheet.case.weightKg ? `${sheet.case.weightKg} kg` : 'no weight'}
            {bmi(sheet.case.weightKg, sheet.case.heightCm) ? ` · BMI ${bmi(sheet.case.weightKg, sheet.case.heightCm)}` : ''} ·{' '}
            <button type="button" className="linklike" onClick={() => setShowDepth(!showDepth)} aria-expanded={showDepth}>
              {DEPTH_LABEL[sheet.case.plannedDepth] ?? sheet.case.plannedDepth}
            </button>
            {sheet.case.allergies ? ` · allergies: ${sheet.case.allergies}` : ''}
          </p>
          {showDepth && <p className="small">{DEPTH_MEANING[sheet.case.plannedDepth as Depth]}</p>}
        </div>
        <div className="sheet-state">
          <span className={`status status-${sheet.case.status}`} data-testid="case-status">{STATUS_LABEL[sheet.case.status] ?? sheet.case.status}</span>
          <a className="button" href={`/cases/${sheet.case.id}/note`} data-testid="open-note">{signed ? 'Case note' : 'Case note · sign'}</a>
          <a className="button" href={`/cases/${sheet.case.id}/waveform`} data-testid="open-waveform">{sheet.waveformImports ? 'CO2 waveform' : 'CO2 waveform · import'}</a>
          <span className={waiting ? 'save-state waiting' : 'save-state saved'} role="status" aria-live="polite" data-testid="save-state">
            {waiting ? `${waiting} ${waiting === 1 ? 'entry waits' : 'entries wait'} to be saved${online ? '' : ' (offline)'}` : 'All saved'}
          </span>
        </div>
      </header>
      {signed && <p className="warn-line">The note is signed: entries are frozen. Corrections are made by amending the note.</p>}
      {!canWrite && <p className="muted">Read-only for your role.</p>}
      {refused.length > 0 && (
        <div className="panel refused" role="alert">
          <strong>Not saved — the server refused {refused.length === 1 ? 'this entry' : 'these entries'}:</strong>
          <ul>
            {refused.map((r) => (
              <li key={r.id}>
                {String(r.body.type)} at {new Date(r.body.at).toLocaleTimeString('en-GB', { timeZone: tz })}: {r.refused}{' '}
                <button type="button" onClick={() => dismiss(r.id)}>Dismiss</button>
              </li>
            ))}
          </ul>
        </div>
      )}
      <div className="sheet-grid">
        <div className="sheet-main">
          <div className="current" aria-label="Current values">
            {CURRENT.map((c) => {
              const s = samples[c.ch];
              const i = s ? s.t.length - 1 : -1;
              const fresh = i >= 0 && nowS - s!.t[i] < 30;
              const raw = i >= 0 ? s!.v[i] : null;
              const val = raw === null ? null : c.ch === 'etco2' && sheet.case.etco2Unit === 'kPa' ? Math.round((raw / 7.50062) * 10) / 10 : raw;
              const base = c.ch === 'etco2' ? baseline?.etco2 : c.ch === 'spo2' ? baseline?.spo2 : c.ch === 'rr' ? baseline?.rr : null;
              return (
                <div key={c.ch} className={`current-value ${c.cls}`} data-testid={`current-${c.ch}`}>
                  <span className="label">{c.label}</span>
                  <span className={fresh ? 'big-number' : 'big-number stale'}>{val ?? '–'}</span>
                  <span className="muted small">
                    {c.ch === 'etco2' ? sheet.case.etco2Unit : c.ch === 'spo2' ? '%' : '/min'}
                    {base != null ? ` · baseline ${base}` : ''}
                    {i >= 0 && !fresh ? (nowS - s!.t[i] < 3600 ? ` · last ${Math.round((nowS - s!.t[i]) / 60)} min ago` : ` · last at ${clock(startMs + s!.t[i] * 1000, tz)}`) : ''}
                  </span>
                </div>
              );
            })}
          </div>
          <div className="panel">
            <TrendChart
              series={samples}
              episodes={sheet.analysis?.episodes ?? []}
              markers={markers}
              startMs={startMs}
              timeZone={tz}
              etco2Unit={sheet.case.etco2Unit}
              bands={resus ? [{ fromMmHg: PLATEAU_RESUSCITATION_V1.targets.minimumMmHg, toMmHg: PLATEAU_RESUSCITATION_V1.targets.goodMmHg, colour: 'rgba(232,180,107,0.12)' }, { fromMmHg: PLATEAU_RESUSCITATION_V1.targets.goodMmHg, toMmHg: 60, colour: 'rgba(143,207,143,0.08)' }] : []}
            />
          </div>
          <EpisodePanel analysis={sheet.analysis} startMs={startMs} timeZone={tz} waveformHref={sheet.waveformImports ? `/cases/${sheet.case.id}/waveform` : null} />
        </div>
        <aside className="sheet-side panel">
          {resusOpen && !showTabs ? (
            <>
              <ResuscitationPanel r={resus!} submit={submit} disabled={disabled} startMs={startMs} timeZone={tz} epinephrineId={sheet.drugs.find((d) => d.name === 'epinephrine')?.id ?? null} etco2Unit={sheet.case.etco2Unit} />
              <button type="button" className="block" onClick={() => setShowTabs(true)}>Show all entry panels</button>
            </>
          ) : (
          <>
          {resusOpen && <button type="button" className="warn-line block" onClick={() => setShowTabs(false)} data-testid="back-to-resus">Back to the resuscitation view</button>}
          <div className="tabs" role="tablist" aria-label="Entries">
            {TABS.map((t) => (
              <button key={t.id} role="tab" type="button" aria-selected={tab === t.id} className={tab === t.id ? 'tab active' : 'tab'} onClick={() => setTab(t.id)} aria-keyshortcuts={t.key} data-testid={`tab-${t.id}`}>
                {t.label} <span className="kbd">{t.key}</span>
              </button>
            ))}
          </div>
          <div role="tabpanel">
            {tab === 'doses' && <DosePanel sheet={sheet} doses={doses} submit={submit} disabled={disabled} />}
            {tab === 'vitals' && <VitalsPanel submit={submit} disabled={disabled} overdueS={overdue} />}
            {tab === 'interventions' && <InterventionPanel submit={submit} disabled={disabled} />}
            {tab === 'markers' && <MarkerPanel events={events} submit={submit} timeZone={tz} disabled={disabled} />}
            {tab === 'recovery' && <RecoveryPanel scores={recovery} submit={submit} timeZone={tz} disabled={disabled} />}
            {tab === 'history' && <HistoryPanel entries={view} submit={submit} timeZone={tz} disabled={disabled} nowMs={nowMs} />}
            {tab === 'gas' && <GasPanel gaps={gaps} submit={submit} disabled={disabled} startMs={startMs} timeZone={tz} />}
            {tab === 'facts' && <FactsPanel facts={sheet.case} onSaved={refresh} disabled={disabled} />}
            {tab === 'import' && <ImportPanel caseId={sheet.case.id} startMs={startMs} timeZone={tz} disabled={disabled} imports={sheet.imports} />}
          </div>
          {overdue !== null && tab !== 'vitals' && (
            <button type="button" className="warn-line block" onClick={() => setTab('vitals')} data-testid="vitals-reminder-side">
              BP/HR reading due — open Readings
            </button>
          )}
          </>
          )}
        </aside>
      </div>
    </div>
  );
}

function vitalText(v: { sbp: number | null; dbp: number | null; hr: number | null; spo2: number | null; rr: number | null; etco2: number | null; sedationScore: number | null }): string {
  const parts: string[] = [];
  if (v.sbp !== null || v.dbp !== null) parts.push(`BP ${v.sbp ?? '?'}/${v.dbp ?? '?'}`);
  if (v.hr !== null) parts.push(`HR ${v.hr}`);
  if (v.spo2 !== null) parts.push(`SpO2 ${v.spo2} %`);
  if (v.rr !== null) parts.push(`RR ${v.rr}`);
  if (v.etco2 !== null) parts.push(`EtCO2 ${v.etco2} mmHg`);
  if (v.sedationScore !== null) parts.push(`MOAA/S ${v.sedationScore}`);
  return parts.join(' · ');
}
