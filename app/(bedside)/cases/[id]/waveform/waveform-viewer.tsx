'use client';
import { useCallback, useEffect, useRef, useState } from 'react';
import { WaveformStrip, type StripBreath, type StripFinding } from './waveform-strip';

interface Finding extends StripFinding {
  kind: string;
  label: string;
  description: string;
  durationS: number;
  breaths: number[];
  confidence: number;
  measure: { name: string; value: number; threshold: number; unit: string };
}
interface Breath extends StripBreath {
  inspMin: number | null;
  rrPerMin: number | null;
  riseTimeS: number;
  plateauSlope: number;
  alphaDeg: number;
  notchDepth: number;
  expTimeS: number;
  inspTimeS: number | null;
}
interface WindowData {
  coverage: { startS: number; endS: number; rateHz: number }[];
  window: { fromS: number; toS: number };
  points: { t: number[]; v: (number | null)[] };
  downsampled: boolean;
  breaths: Breath[];
  findings: Finding[];
  gaps: { startS: number; endS: number }[];
  breathCount: number;
}

const SPANS = [600, 120, 30, 10];

export function WaveformViewer(props: { caseId: string; caseStartMs: number; timeZone: string; at: number | null; episodes: { rule: string; start: number; end: number }[]; canImport: boolean }) {
  const { caseId, caseStartMs, timeZone } = props;
  const [win, setWin] = useState<{ from: number; to: number } | null>(props.at !== null ? { from: props.at - 30, to: props.at + 30 } : null);
  const [data, setData] = useState<WindowData | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [reload, setReload] = useState(0);
  const boxRef = useRef<HTMLDivElement>(null);

  useEffect(() => {
    const q = new URLSearchParams({ points: '3000' });
    if (win) {
      q.set('from', String(win.from));
      q.set('to', String(win.to));
    }
    let live = true;
    fetch(`/api/v1/cases/${caseId}/waveform?${q}`, { cache: 'no-store' })
      .then(async (r) => {
        const j = await r.json();
        if (!live) return;
        if (!r.ok) setError(j.error ?? `error ${r.status}`);
        else {
          setError(null);
          setData(j);
        }
      })
      .catch(() => live && setError('the waveform could not be loaded; check the connection'));
    return () => {
      live = false;
    };
  }, [caseId, win, reload]);

  const from = data?.window.fromS ?? 0;
  const to = data?.window.toS ?? 0;
  const span = to - from;
  const show = useCallback((a: number, b: number) => setWin({ from: a, to: b }), []);
  const zoom = (f: number, centre = (from + to) / 2) => {
    const s = Math.max(4, Math.min(6 * 3600, span * f));
    show(centre - s / 2, centre + s / 2);
  };
  const clock = (s: number) => new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', second: '2-digit', hourCycle: 'h23' }).format(new Date(caseStartMs + s * 1000));
  const mmss = (s: number) => `${s < 0 ? '−' : ''}${Math.floor(Math.abs(s) / 60)}:${String(Math.floor(Math.abs(s) % 60)).padStart(2, '0')}`;

  const hasWave = (data?.coverage.length ?? 0) > 0;
  return (
    <div>
      {error && <p className="error">{error}</p>}
      {data && !hasWave && <p className="muted">No CO2 waveform has been imported for this case yet.</p>}
      {hasWave && data && (
        <section className="panel" ref={boxRef}>
          <div style={{ display: 'flex', flexWrap: 'wrap', gap: 8, alignItems: 'center' }}>
            <button onClick={() => show(from - span * 0.75, to - span * 0.75)} aria-label="earlier">←</button>
            <button onClick={() => zoom(2)} aria-label="zoom out">−</button>
            <button onClick={() => zoom(0.5)} aria-label="zoom in">+</button>
            <button onClick={() => show(from + span * 0.75, to + span * 0.75)} aria-label="later">→</button>
            {SPANS.map((s) => (
              <button key={s} onClick={() => zoom(s / Math.max(span, 1e-3))}>{s >= 60 ? `${s / 60} min` : `${s} s`}</button>
            ))}
            <span className="muted">
              {clock(from)}–{clock(to)} (case {mmss(from)}–{mmss(to)}) · {data.breaths.length} breaths shown of {data.breathCount}
              {data.downsampled ? ' · downsampled' : ''}
            </span>
          </div>
          <WaveformStrip
            t={data.points.t}
            v={data.points.v}
            from={from}
            to={to}
            breaths={data.breaths}
            findings={data.findings}
            gaps={data.gaps}
            onPick={(s) => zoom(0.25, s)}
          />
          <p className="muted" style={{ fontSize: '0.85rem' }}>
            Green: start of expiration; orange: end of the plateau (end-tidal value shown when zoomed in). Shaded: shape findings. Click the strip to zoom in there.
          </p>
          {span <= 90 && data.breaths.length > 0 && (
            <table>
              <thead>
                <tr>
                  <th>Time</th><th>EtCO2</th><th>Inspired</th><th>RR</th><th>Exp / insp (s)</th><th>Rise (s)</th><th>Phase III (mmHg/s)</th><th>Angle</th><th>Notch</th>
                </tr>
              </thead>
              <tbody>
                {data.breaths.map((b) => (
                  <tr key={b.i}>
                    <td>{clock(b.expStartS)}</td>
                    <td>{b.etco2.toFixed(1)}</td>
                    <td>{b.inspMin === null ? '—' : b.inspMin.toFixed(1)}</td>
                    <td>{b.rrPerMin === null ? '—' : b.rrPerMin.toFixed(1)}</td>
                    <td>{b.expTimeS.toFixed(2)} / {b.inspTimeS === null ? '—' : b.inspTimeS.toFixed(2)}</td>
                    <td>{b.riseTimeS.toFixed(2)}</td>
                    <td>{b.plateauSlope.toFixed(1)}</td>
                    <td>{b.alphaDeg.toFixed(0)}°</td>
                    <td>{b.notchDepth.toFixed(1)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </section>
      )}
      {hasWave && data && (
        <section className="panel" style={{ marginTop: 12 }}>
          <h2>Shape findings</h2>
          {data.findings.length === 0 && <p className="muted">No shape findings in this waveform.</p>}
          <ul style={{ listStyle: 'none', padding: 0 }}>
            {data.findings.map((f, k) => (
              <li key={k} style={{ marginBottom: 12 }} data-finding={f.kind}>
                <strong>{f.label}</strong> · {clock(f.startS)} for {Math.round(f.durationS)} s · {f.breaths.length} breath{f.breaths.length === 1 ? '' : 's'} · confidence {Math.round(f.confidence * 100)} % · {f.measure.name} {f.measure.value.toFixed(2)} {f.measure.unit} (threshold {f.measure.threshold}){' '}
                <button onClick={() => show(f.startS - 10, f.endS + 10)}>Show</button>
                <div className="muted">{f.description}</div>
              </li>
            ))}
          </ul>
          {props.episodes.length > 0 && (
            <>
              <h2>Episodes</h2>
              <ul style={{ listStyle: 'none', padding: 0 }}>
                {props.episodes.map((e, k) => (
                  <li key={k}>
                    {e.rule} · {clock(e.start)}–{clock(e.end)} <button onClick={() => show(e.start - 30, e.end + 30)}>Show</button>
                  </li>
                ))}
              </ul>
            </>
          )}
        </section>
      )}
      {props.canImport && <ImportForm caseId={caseId} onDone={() => setReload((x) => x + 1)} />}
    </div>
  );
}

function ImportForm({ caseId, onDone }: { caseId: string; onDone: () => void }) {
  const [msg, setMsg] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  async function submit(ev: React.FormEvent<HTMLFormElement>) {
    ev.preventDefault();
    const f = new FormData(ev.currentTarget);
    const file = f.get('file');
    if (!(file instanceof File) || file.size === 0) return setMsg('Choose a CSV file.');
    setBusy(true);
    try {
      const r = await fetch(`/api/v1/cases/${caseId}/waveform`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ text: await file.text(), fileName: file.name, rateHz: Number(f.get('rateHz')), unit: f.get('unit'), clockOffsetS: Number(f.get('clockOffsetS') || 0) }),
      });
      const j = await r.json();
      setMsg(r.ok ? `Imported ${j.samples} samples: ${j.breaths} breaths, ${j.findings} findings.` : j.error);
      if (r.ok) onDone();
    } catch {
      setMsg('The file could not be sent; nothing was saved.');
    } finally {
      setBusy(false);
    }
  }
  return (
    <section className="panel" style={{ marginTop: 12 }}>
      <h2>Import a CO2 waveform</h2>
      <form onSubmit={submit}>
        <label htmlFor="wf-file">CSV: time (s) or sample index, and CO2</label>
        <input id="wf-file" name="file" type="file" accept=".csv,text/csv,text/plain" />
        <label htmlFor="wf-rate">Sampling rate (Hz, 20–300)</label>
        <input id="wf-rate" name="rateHz" type="number" min={20} max={300} defaultValue={100} />
        <label htmlFor="wf-unit">Unit</label>
        <select id="wf-unit" name="unit" defaultValue="mmHg">
          <option>mmHg</option>
          <option>kPa</option>
        </select>
        <label htmlFor="wf-offset">File time 0 is this many seconds after the case start</label>
        <input id="wf-offset" name="clockOffsetS" type="number" step="any" defaultValue={0} />
        <p>
          <button className="primary" disabled={busy}>Import</button>
        </p>
        {msg && <p>{msg}</p>}
      </form>
    </section>
  );
}
