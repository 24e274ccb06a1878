'use client';
import { useState } from 'react';
import { CHANNELS, CHANNEL_SPECS, type Channel } from '@/lib/domain/channel';
import { TIME_FORMATS, TIME_FORMAT_LABEL, type MonitorCsvMapping } from '@/lib/ingest/monitorCsv';
import { TrendChart } from './trend-chart';
import { clock } from './shared';

interface PreviewSeries {
  channel: Channel;
  unit: string;
  column: string;
  fileUnit: string;
  samples: number;
  firstAt: number;
  lastAt: number;
  min: number;
  max: number;
  points: { t: number[]; v: number[] };
}
interface PreviewOk {
  ok: true;
  inspection: { columns: string[]; rowCount: number };
  mapping: MonitorCsvMapping;
  rows: number;
  samples: number;
  firstAt: number;
  lastAt: number;
  series: PreviewSeries[];
  warnings: string[];
}
interface Problem {
  row: number;
  column: string | null;
  message: string;
}
interface PreviewBad {
  ok: false;
  error: string;
  inspection?: { columns: string[] };
  mapping?: MonitorCsvMapping;
  errors?: Problem[];
  errorCount?: number;
}

/**
 * Monitor trend import: choose the file, check the mapping (column → channel and unit, time
 * format, zone, clock alignment) against a preview chart, then import all or nothing.
 */
export function ImportPanel({ caseId, startMs, timeZone, disabled, imports }: { caseId: string; startMs: number; timeZone: string; disabled: boolean; imports: { id: string; fileName: string; samples: number; createdAt: string }[] }) {
  const [file, setFile] = useState<{ name: string; text: string } | null>(null);
  const [mapping, setMapping] = useState<MonitorCsvMapping | null>(null);
  const [columns, setColumns] = useState<string[]>([]);
  const [preview, setPreview] = useState<PreviewOk | null>(null);
  const [problems, setProblems] = useState<PreviewBad | null>(null);
  const [busy, setBusy] = useState(false);
  const [done, setDone] = useState<string | null>(null);

  const post = async (path: string, body: unknown) => {
    const r = await fetch(`/api/v1/cases/${encodeURIComponent(caseId)}/${path}`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(body) });
    return { status: r.status, json: (await r.json().catch(() => ({ ok: false, error: `server answered ${r.status}` }))) as PreviewOk | PreviewBad };
  };

  const runPreview = async (f: { name: string; text: string }, m: MonitorCsvMapping | null) => {
    setBusy(true);
    setDone(null);
    try {
      const { json } = await post('imports/preview', { text: f.text, fileName: f.name, ...(m ? { mapping: m } : {}) });
      if (json.ok) {
        setPreview(json);
        setProblems(null);
        setMapping(json.mapping);
        setColumns(json.inspection.columns);
      } else {
        setPreview(null);
        setProblems(json);
        if (json.mapping) setMapping(json.mapping);
        if (json.inspection?.columns) setColumns(json.inspection.columns);
      }
    } finally {
      setBusy(false);
    }
  };

  const choose = async (ev: React.ChangeEvent<HTMLInputElement>) => {
    const f = ev.target.files?.[0];
    if (!f) return;
    const text = await f.text();
    const picked = { name: f.name, text };
    setFile(picked);
    setMapping(null);
    await runPreview(picked, null);
  };

  const doImport = async () => {
    if (!file || !mapping) return;
    setBusy(true);
    try {
      const { status, json } = await post('imports', { text: file.text, fileName: file.name, mapping });
      if (status === 201 && 'samples' in json) {
        setDone(`Imported ${json.samples.toLocaleString('en-GB')} samples from ${file.name}.`);
        setFile(null);
        setPreview(null);
        setMapping(null);
      } else {
        setProblems(json as PreviewBad);
      }
    } finally {
      setBusy(false);
    }
  };

  const setChannel = (column: string, channel: string) => {
    if (!mapping) return;
    const others = mapping.channels.filter((c) => c.column !== column && c.channel !== channel);
    const next = channel ? [...others, { column, channel: channel as Channel, unit: CHANNEL_SPECS[channel as Channel].units[0] }] : others;
    setMapping({ ...mapping, channels: next });
  };
  const setUnit = (column: string, unit: string) => mapping && setMapping({ ...mapping, channels: mapping.channels.map((c) => (c.column === column ? { ...c, unit } : c)) });

  const chartSeries = Object.fromEntries((preview?.series ?? []).map((s) => [s.channel, { t: s.points.t, v: s.points.v }]));

  return (
    <div data-testid="import-panel">
      <p className="small muted">Upload a trend CSV exported from the monitor: a time column and any of EtCO2, RR, SpO2, HR. Nothing is saved until you press Import.</p>
      <label htmlFor="csv-file">Monitor CSV file</label>
      <input id="csv-file" type="file" accept=".csv,text/csv,text/plain" onChange={choose} disabled={disabled || busy} data-testid="csv-file" />
      {mapping && (
        <div className="mapping" data-testid="csv-mapping">
          <h3>Mapping</h3>
          <div className="vitals-grid">
            <div>
              <label htmlFor="map-time">Time column</label>
              <select id="map-time" value={mapping.timeColumn} onChange={(e) => setMapping({ ...mapping, timeColumn: e.target.value })}>
                {columns.map((c) => <option key={c}>{c}</option>)}
              </select>
            </div>
            <div>
              <label htmlFor="map-format">Time format</label>
              <select id="map-format" value={mapping.timeFormat} onChange={(e) => setMapping({ ...mapping, timeFormat: e.target.value as MonitorCsvMapping['timeFormat'] })}>
                {TIME_FORMATS.map((f) => <option key={f} value={f}>{TIME_FORMAT_LABEL[f]}</option>)}
              </select>
            </div>
            {(mapping.timeFormat === 'iso_local' || mapping.timeFormat === 'clock') && (
              <div>
                <label htmlFor="map-zone">Time zone</label>
                <input id="map-zone" value={mapping.timeZone ?? timeZone} onChange={(e) => setMapping({ ...mapping, timeZone: e.target.value })} />
              </div>
            )}
            {mapping.timeFormat === 'clock' && (
              <div>
                <label htmlFor="map-date">Date of the times</label>
                <input id="map-date" type="date" value={mapping.date ?? ''} onChange={(e) => setMapping({ ...mapping, date: e.target.value || undefined })} />
              </div>
            )}
            <div>
              <label htmlFor="map-offset">Clock alignment (seconds added)</label>
              <input id="map-offset" inputMode="numeric" value={mapping.clockOffsetS ?? 0} onChange={(e) => setMapping({ ...mapping, clockOffsetS: Number(e.target.value) || 0 })} />
            </div>
          </div>
          {mapping.timeFormat === 'seconds' && <p className="small muted">Times in seconds count from the case clock ({clock(startMs, timeZone, true)}) plus the alignment.</p>}
          <table>
            <thead>
              <tr><th>Column</th><th>Channel</th><th>Unit in the file</th></tr>
            </thead>
            <tbody>
              {columns.filter((c) => c !== mapping.timeColumn && c !== mapping.dateColumn).map((c) => {
                const m = mapping.channels.find((x) => x.column === c);
                return (
                  <tr key={c}>
                    <td>{c}</td>
                    <td>
                      <select aria-label={`Channel of ${c}`} value={m?.channel ?? ''} onChange={(e) => setChannel(c, e.target.value)}>
                        <option value="">not imported</option>
                        {CHANNELS.map((ch) => <option key={ch} value={ch}>{CHANNEL_SPECS[ch].label}</option>)}
                      </select>
                    </td>
                    <td>
                      {m && (
                        <select aria-label={`Unit of ${c}`} value={m.unit} onChange={(e) => setUnit(c, e.target.value)}>
                          {CHANNEL_SPECS[m.channel].units.map((u) => <option key={u}>{u}</option>)}
                        </select>
                      )}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
          <div className="row">
            <button type="button" onClick={() => file && runPreview(file, mapping)} disabled={busy}>Update preview</button>
          </div>
        </div>
      )}
      {problems && (
        <div className="panel refused" role="alert" data-testid="csv-errors">
          <strong>{problems.error}</strong>
          {problems.errors && problems.errors.length > 0 && (
            <ul>
              {problems.errors.map((p, i) => (
                <li key={i}>
                  row {p.row}
                  {p.column ? `, column “${p.column}”` : ''}: {p.message}
                </li>
              ))}
            </ul>
          )}
          {problems.errorCount && problems.errors && problems.errorCount > problems.errors.length ? <p className="small">and {problems.errorCount - problems.errors.length} more</p> : null}
        </div>
      )}
      {preview && (
        <div data-testid="csv-preview">
          <p>
            {preview.rows.toLocaleString('en-GB')} rows, {preview.samples.toLocaleString('en-GB')} samples, {clock(startMs + preview.firstAt * 1000, timeZone, true)}–{clock(startMs + preview.lastAt * 1000, timeZone, true)}
          </p>
          {preview.warnings.map((w, i) => <p key={i} className="warn-line">{w}</p>)}
          <TrendChart series={chartSeries} episodes={[]} markers={[]} startMs={startMs} timeZone={timeZone} etco2Unit="mmHg" height={200} testId="csv-preview-chart" />
          <button type="button" className="primary big" onClick={doImport} disabled={busy || disabled} data-testid="csv-import">
            Import {preview.samples.toLocaleString('en-GB')} samples
          </button>
        </div>
      )}
      {done && <p className="ok" role="status" data-testid="csv-done">{done}</p>}
      {imports.length > 0 && (
        <>
          <h3>Imported files</h3>
          <ul className="plain">
            {imports.map((i) => <li key={i.id}>{clock(i.createdAt, timeZone)} · {i.fileName} · {i.samples.toLocaleString('en-GB')} samples</li>)}
          </ul>
        </>
      )}
    </div>
  );
}
